package reduce_test

import (
	"math"
	"testing"

	"framed/reduce"
)

// A frame with only a crosshead encoder: the crosshead reads the specimen's
// extension plus the load train's stretch, compliance x force. With the
// stored compliance the correction gives back the specimen's own curve;
// without it E is far too low. Either way E is flagged apparent. The
// curve is Ramberg-Osgood (NACA TN 902) so Rp0.2 is exact.
func TestCrossheadOnlyWithCompliance(t *testing.T) {
	const eMPa, rp, m, s0, l0 = 205000.0, 370.0, 19.6, 78.54, 50.0
	const complianceMMPerN = 2.5e-5 // 40 kN/mm load train, common for small frames
	stress := rambergOsgood(eMPa, rp, m)
	var c reduce.Curve
	n := 20000
	for i := 0; i < n; i++ {
		e := 0.03 * float64(i) / float64(n-1)
		f := stress(e) * s0
		c.TimeS = append(c.TimeS, float64(i)*0.01)
		c.ForceN = append(c.ForceN, f)
		c.CrossheadMM = append(c.CrossheadMM, e*l0+complianceMMPerN*f)
	}
	sp := reduce.Specimen{S0MM2: s0, L0MM: l0}
	corrected, err := reduce.Reduce(c, sp, reduce.Detected{}, reduce.Options{ComplianceMMPerN: complianceMMPerN})
	if err != nil {
		t.Fatal(err)
	}
	raw, err := reduce.Reduce(c, sp, reduce.Detected{}, reduce.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{reduce.FlagNoExtensometer, reduce.FlagModulusApparent} {
		if !hasFlag(corrected, f) || !hasFlag(raw, f) {
			t.Errorf("flag %s missing: %v / %v", f, corrected.Flags, raw.Flags)
		}
	}
	if !hasFlag(raw, reduce.FlagNoCompliance) || hasFlag(corrected, reduce.FlagNoCompliance) {
		t.Errorf("no-compliance-calibration flag wrong: %v / %v", raw.Flags, corrected.Flags)
	}
	if corrected.Fit == nil || !corrected.Fit.Apparent {
		t.Error("fit not marked apparent")
	}
	e, _ := quantity(corrected, "E")
	if math.Abs(e.Value*1000/eMPa-1) > 0.01 {
		t.Errorf("corrected E %.1f GPa, want %.1f", e.Value, eMPa/1000)
	}
	// Uncorrected: specimen in series with the load train,
	// 1/E' = 1/E + C S0 / L0.
	wantRaw := 1 / (1/eMPa + complianceMMPerN*s0/l0) / 1000
	eRaw, _ := quantity(raw, "E")
	if math.Abs(eRaw.Value/wantRaw-1) > 0.01 {
		t.Errorf("uncorrected E %.1f GPa, want the series stiffness %.1f", eRaw.Value, wantRaw)
	}
	rp02, _ := quantity(corrected, "Rp0.2")
	if math.Abs(rp02.Value/rp-1) > 0.002 {
		t.Errorf("corrected Rp0.2 %.1f, want %.1f", rp02.Value, rp)
	}
}

// Extensometer removed at 4 % strain (common practice on flat specimens):
// Rp0.2 and E come from before removal, Rm and the break from force,
// elongation after removal from the crosshead matched at the removal point.
// The crosshead here moves 1.25 x the gauge extension before the neck (a
// parallel length longer than Le) and 1 x after it (the neck inside Le).
func TestExtensometerRemoved(t *testing.T) {
	const eMPa, kMPa, n = 205000.0, 700.0, 0.22
	stress, sY := hollomon(eMPa, kMPa, n, 0.01)
	rm, agt, _ := considere(eMPa, kMPa, n)
	var c reduce.Curve
	samples := 30000
	eMax := 0.35
	xh := 0.0
	prevE := 0.0
	for i := 0; i < samples; i++ {
		e := eMax * float64(i) / float64(samples-1)
		k := 1.25
		if e > agt {
			k = 1
		}
		xh += k * (e - prevE) * 50
		prevE = e
		ext := e * 50
		if e > 0.04 {
			ext = math.NaN()
		}
		c.TimeS = append(c.TimeS, float64(i)*0.01)
		c.ForceN = append(c.ForceN, stress(e)*78.54)
		c.ExtensionMM = append(c.ExtensionMM, ext)
		c.CrossheadMM = append(c.CrossheadMM, xh)
	}
	res, err := reduce.Reduce(c, reduce.Specimen{S0MM2: 78.54, L0MM: 50}, reduce.Detected{}, reduce.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !hasFlag(res, reduce.FlagExtensometerRemoved) {
		t.Errorf("flags %v lack %s", res.Flags, reduce.FlagExtensometerRemoved)
	}
	check := func(sym string, want, tol float64) {
		t.Helper()
		q, ok := quantity(res, sym)
		if !ok || !(math.Abs(q.Value-want) <= tol) {
			t.Errorf("%s = %v (present %v), want %v +- %v (%s)", sym, q.Value, ok, want, tol, q.Method)
		}
	}
	// The synthetic elastic line is straight in true stress and strain;
	// in engineering terms its slope is E (1 - 3e), 0.3 % low at 0.1 %.
	check("E", eMPa/1000, 0.005*eMPa/1000)
	check("Rp0.2", sY, 0.001*sY)
	check("Rm", rm, 1e-4*rm)
	// Matched at removal, the uniform stretch rate is the extensometer's,
	// so Agt and At come back (At to within the sampling step).
	check("Agt", 100*agt, 0.05)
	check("At", 100*eMax, 0.05)
}
