package sim

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/stat"
)

// roSteel is a Ramberg-Osgood material used across the tests.
var roSteel = Material{
	Name: "test steel", Law: LawRO, EMPa: 200000, Rp02MPa: 350, M: 15,
	NeckPct: 12, FracturePct: 25, NeckDrop: 0.3,
}

// The Ramberg-Osgood proof-strength form e = s/E + 0.002 (s/Rp0.2)^m
// (Ramberg and Osgood, NACA TN 902, 1943) puts the 0.2 % offset
// line's crossing exactly at Rp0.2. Truth finds the crossing by
// bisection on the model, so this checks model and offset search both.
func TestRambergOsgoodProofStrengthExact(t *testing.T) {
	mats := []Material{roSteel}
	for _, sp := range DemoScript() {
		if sp.Material.law() == LawRO {
			mats = append(mats, sp.Material)
		}
	}
	for _, m := range mats {
		got := m.Truth().Rp02MPa
		if math.Abs(got-m.Rp02MPa) > 1e-6*m.Rp02MPa {
			t.Errorf("%s: Rp0.2 from the model %.9f MPa, want %v (exact by construction)", m.Name, got, m.Rp02MPa)
		}
		// The strain at Rp0.2 is Rp0.2/E + 0.002 (the same form).
		e := m.Rp02MPa/m.EMPa + 0.002
		if s := m.Stress(e); math.Abs(s-m.Rp02MPa) > 1e-6 {
			t.Errorf("%s: stress at e = Rp/E + 0.002 is %v, want %v", m.Name, s, m.Rp02MPa)
		}
	}
}

// Considere criterion (Considere 1885; common practice): for a
// Hollomon material sigma = K eps^n the engineering maximum falls at true
// strain n. With the elastic strain added the maximum moves by about
// sigma/E, so the tolerance is a few times Rm/E.
func TestConsidereHollomonMaximumAtTrueStrainN(t *testing.T) {
	for _, n := range []float64{0.1, 0.2, 0.35} {
		m := Material{Name: "hollomon", Law: LawHollomon, EMPa: 200000, KMPa: 600, N: n,
			FracturePct: 100 * (math.Exp(n+0.15) - 1), NeckDrop: 0.2}
		if err := m.Validate(); err != nil {
			t.Fatal(err)
		}
		tr := m.Truth()
		trueStrain := math.Log1p(tr.AgtPct / 100)
		tol := 3 * tr.RmMPa / m.EMPa
		if math.Abs(trueStrain-n) > tol {
			t.Errorf("n = %v: engineering maximum at true strain %.5f, want %v +- %.4f (Considere)", n, trueStrain, n, tol)
		}
		// And Rm is K n^n exp(-n) for rigid-plastic Hollomon
		// (s = sigma/(1+e) at eps = n), within the elastic shift.
		want := m.KMPa * math.Pow(n, n) * math.Exp(-n)
		if math.Abs(tr.RmMPa-want) > 0.01*want {
			t.Errorf("n = %v: Rm %.2f MPa, want K n^n e^-n = %.2f within 1 %%", n, tr.RmMPa, want)
		}
	}
}

// The demo materials' Truth lands near published handbook values:
// 6061-T6 Rm 310 MPa, A 12 % (Aluminum Association
// typical values); C11000 annealed Rm 224-230 MPa, elongation 50-56 %
// (Smithells 8th ed., Table 22.7); 1018 cold drawn Rm 440 MPa, 15 % in
// 50 mm (typical datasheet values).
func TestDemoTruthNearHandbook(t *testing.T) {
	want := map[string]struct{ rmLo, rmHi, aLo, aHi float64 }{
		"OWF-2611-AL01": {310 * 0.98, 310 * 1.02, 11, 13},
		"OWF-2611-CU02": {224, 230, 50, 56},
		"OWF-2611-ST03": {440 * 0.98, 440 * 1.02, 14, 16},
	}
	for _, sp := range DemoScript() {
		w, ok := want[sp.ID]
		if !ok {
			continue
		}
		tr := sp.Material.Truth()
		if tr.RmMPa < w.rmLo || tr.RmMPa > w.rmHi || tr.APct < w.aLo || tr.APct > w.aHi {
			t.Errorf("%s: Rm %.1f MPa, A %.1f %%; want Rm %v-%v, A %v-%v", sp.ID, tr.RmMPa, tr.APct, w.rmLo, w.rmHi, w.aLo, w.aHi)
		}
	}
}

// runSpecimen steps one specimen's physics at dtS and returns the true
// samples up to the end of its loading.
func runSpecimen(t *testing.T, sp Specimen, dtS float64) []sample {
	t.Helper()
	if err := sp.Validate(); err != nil {
		t.Fatal(err)
	}
	r := newRun(sp)
	var out []sample
	for range 5_000_000 {
		s, done := r.step(dtS)
		out = append(out, s)
		if done {
			return out
		}
	}
	t.Fatal("loading never ended")
	return nil
}

func rateSpecimen(m Material) Specimen {
	return Specimen{ID: "t", Shape: "round", D0MM: 10, L0MM: 50, LcMM: 60, Material: m,
		Loading: Loading{Mode: ModeRate, CrossheadMMPerMin: 5, StiffnessNPerMM: 30000}}
}

// The elastic slope of stress on strain is E: the least-squares slope
// (ASTM E111's method) between 10 % and 40 % of Rp0.2 of a noise-free
// run, which sees the load train's compliance only in the crosshead.
func TestElasticSlopeIsE(t *testing.T) {
	sp := rateSpecimen(roSteel)
	s0 := sp.CrossSectionMM2()
	var x, y []float64
	for _, s := range runSpecimen(t, sp, 0.01) {
		st := s.forceN / s0
		if st >= 0.1*roSteel.Rp02MPa && st <= 0.4*roSteel.Rp02MPa {
			x = append(x, s.extMM/sp.leMM())
			y = append(y, st)
		}
	}
	if len(x) < 20 {
		t.Fatalf("only %d points in the elastic window", len(x))
	}
	_, slope := stat.LinearRegression(x, y, nil, false)
	if math.Abs(slope-roSteel.EMPa) > 0.005*roSteel.EMPa {
		t.Errorf("elastic slope %.0f MPa, want E = %v within 0.5 %%", slope, roSteel.EMPa)
	}
	// Machine compliance: crosshead = e Lc + F/k, so in the elastic range
	// the crosshead runs ahead of the specimen by F/k.
	for _, s := range runSpecimen(t, sp, 0.01)[len(x)/2 : len(x)/2+1] {
		want := s.extMM/sp.leMM()*sp.lcMM() + s.forceN/sp.Loading.StiffnessNPerMM
		if math.Abs(s.crossMM-want) > 1e-3 {
			t.Errorf("crosshead %v mm, want e Lc + F/k = %v", s.crossMM, want)
		}
	}
}

// A rate-mode run reaches the model's Fm and breaks at its fracture strain.
func TestRateRunReachesFmAndBreaks(t *testing.T) {
	sp := rateSpecimen(roSteel)
	out := runSpecimen(t, sp, 0.01)
	fm := 0.0
	lastExt := 0.0
	for _, s := range out {
		fm = max(fm, s.forceN)
		if !math.IsNaN(s.extMM) {
			lastExt = s.extMM
		}
	}
	if want := sp.FmN(); math.Abs(fm-want) > 1e-3*want {
		t.Errorf("Fm %.1f N, want %.1f (Rm S0)", fm, want)
	}
	if end := out[len(out)-1]; end.forceN != 0 || !math.IsNaN(end.extMM) {
		t.Errorf("after the break force %v, ext %v; want 0 and no reading", end.forceN, end.extMM)
	}
	if want := roSteel.FracturePct / 100 * sp.leMM(); math.Abs(lastExt-want) > 0.01*want {
		t.Errorf("last extension %.3f mm, want about the fracture strain's %.3f", lastExt, want)
	}
}
