package sim

import (
	"math"
	"testing"
)

// steelWire is a stiff, strong wire whose first weights stay well inside
// the elastic range.
func steelWire(steps []WeightStep, zeta, frac float64) Specimen {
	return Specimen{
		ID: "wire", Shape: "round", D0MM: 1, L0MM: 200, LcMM: 250,
		Material: Material{Name: "spring steel wire", Law: LawRO, EMPa: 200000, Rp02MPa: 1500, M: 25,
			NeckPct: 3, FracturePct: 5, NeckDrop: 0.1},
		Loading: Loading{Mode: ModeDeadWeight, StiffnessNPerMM: 5000, SwingHz: 2, SwingZeta: zeta,
			SwingFraction: frac, Steps: steps},
	}
}

// A hanging weight let go at once swings as a damped oscillator: the
// deviation from m g decays as exp(-zeta w t) (textbook damped
// oscillator, common practice), so successive peaks one damped period
// Td = 2 pi / (w sqrt(1 - zeta^2)) apart shrink by exp(-zeta w Td). The
// settled force is m g with g = 9.80665 m/s2 (standard gravity, 3rd
// CGPM 1901).
func TestDeadWeightSwingDecaysAndSettlesAtMG(t *testing.T) {
	const zeta, fHz, massKG = 0.05, 2.0, 10.0
	sp := steelWire([]WeightStep{{MassKG: 1, HoldS: 5}, {MassKG: massKG, HoldS: 30}}, zeta, 1)
	const dt = 0.001
	out := runSpecimen(t, sp, dt)
	step := out[int(5/dt)+1:]
	mg := massKG * 9.80665
	// Peaks of the deviation above m g.
	var peaks []float64
	for i := 1; i+1 < len(step); i++ {
		d := step[i].forceN - mg
		if d > 0 && d >= step[i-1].forceN-mg && d > step[i+1].forceN-mg {
			peaks = append(peaks, d)
		}
	}
	if len(peaks) < 10 {
		t.Fatalf("only %d swing peaks", len(peaks))
	}
	w := 2 * math.Pi * fHz
	td := 2 * math.Pi / (w * math.Sqrt(1-zeta*zeta))
	want := math.Exp(-zeta * w * td)
	for i := 1; i < 8; i++ {
		if r := peaks[i] / peaks[i-1]; math.Abs(r-want) > 0.01 {
			t.Errorf("peak ratio %d: %.4f, want exp(-zeta w Td) = %.4f", i, r, want)
		}
	}
	// The first peak overshoots by about (m - m0) g exp(-zeta pi/sqrt(1-zeta^2)).
	d := (massKG - 1) * 9.80665
	if want := d * math.Exp(-zeta*math.Pi/math.Sqrt(1-zeta*zeta)); math.Abs(peaks[0]-want) > 0.02*want {
		t.Errorf("first overshoot %.3f N, want %.3f", peaks[0], want)
	}
	last := step[len(step)-1].forceN
	if math.Abs(last-mg) > 1e-3 {
		t.Errorf("settled force %.5f N, want m g = %.5f", last, mg)
	}
}

// Past the elastic limit a weight leaves a permanent set, and for the
// Ramberg-Osgood form the set is the plastic strain at the highest stress
// reached, 0.002 (s/Rp0.2)^m (NACA TN 902). A light weight leaves next to
// none. Above Rp0.2 the wire creeps; the last weight, above Fm, breaks it.
func TestDeadWeightSetCreepAndBreak(t *testing.T) {
	var cu Specimen
	for _, sp := range DemoScript() {
		if sp.Loading.Mode == ModeDeadWeight {
			cu = sp
		}
	}
	const dt = 0.002
	noCreep := cu
	noCreep.Material.CreepPct = 0
	out := runSpecimen(t, noCreep, dt)
	m := cu.Material
	// Step boundaries in samples.
	var ends []int
	tS := 0.0
	for _, st := range cu.Loading.Steps {
		tS += st.HoldS
		ends = append(ends, int(math.Round(tS/dt)))
	}
	// Read 0.1 s before each step's end, well clear of the change.
	extAt := func(i int) float64 { return out[i-50].extMM }
	// Steps: 0.5, 1.2, 0.5, 3, 0.5, 6, 0.5, 12, 16, 19 kg.
	base := extAt(ends[0])
	peak := func(from, to int) float64 {
		p := 0.0
		for _, s := range out[from:to] {
			p = max(p, s.forceN)
		}
		return p
	}
	setAfter := func(load, unload int) (got, want float64) {
		sPeak := peak(ends[load-1], ends[load]) / cu.CrossSectionMM2()
		want = 0.002 * math.Pow(sPeak/m.Rp02MPa, m.M) * cu.leMM()
		return extAt(ends[unload]) - base, want
	}
	got, want := setAfter(1, 2)
	if want > 0.01 || math.Abs(got-want) > 1e-3 {
		t.Errorf("set after 1.2 kg %.4f mm, want %.4f (none to speak of)", got, want)
	}
	got, want = setAfter(5, 6)
	if want < 0.05 || math.Abs(got-want) > 0.02*want {
		t.Errorf("set after 6 kg %.4f mm, want 0.002 (s/Rp)^m Le = %.4f", got, want)
	}
	// Creep under 12 kg (above Rp0.2): logarithmic in time, so late in
	// the hold, when the swing has died, the extension still grows by
	// C ln((tau+t2)/(tau+t1)) Le; without creep it stands still.
	i1, i2 := ends[7]-int(4/dt), ends[7]-50
	if still := out[i2].extMM - out[i1].extMM; math.Abs(still) > 2e-3 {
		t.Errorf("without creep the extension moved %.4f mm late in a hold", still)
	}
	// Weights lowered without a swing, so the settled load is the
	// highest and the creep is the full logarithmic law.
	gentle := cu
	gentle.Loading.SwingFraction = 0
	crept := runSpecimen(t, gentle, dt)
	t1, t2 := float64(i1-ends[6])*dt, float64(i2-ends[6])*dt
	want = m.CreepPct / 100 * math.Log((m.CreepTauS+t2)/(m.CreepTauS+t1)) * cu.leMM()
	if grow := crept[i2].extMM - crept[i1].extMM; math.Abs(grow-want) > 0.02*want {
		t.Errorf("creep under 12 kg %.4f mm in the last 4 s, want about C ln((tau+t2)/(tau+t1)) Le = %.4f", grow, want)
	}
	// The 19 kg weight breaks it.
	if len(out) >= ends[9] {
		t.Errorf("the wire held the last weight")
	}
	if l := out[len(out)-1]; l.forceN != 0 || !math.IsNaN(l.extMM) {
		t.Errorf("after the break force %v, ext %v", l.forceN, l.extMM)
	}
	if f := peak(0, len(out)); f > cu.FmN()*1.001 {
		t.Errorf("force %v above the wire's Fm %v", f, cu.FmN())
	}
}
