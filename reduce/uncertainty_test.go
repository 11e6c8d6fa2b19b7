package reduce_test

import (
	"math"
	"testing"

	"framed/reduce"
)

// The expanded uncertainty of Rm follows the GUM law of propagation
// (JCGM 100:2008, eq. 10, k = 2) for Rm = F / (pi d^2 / 4): relative
// u(Rm)^2 = u(F)^2 + (2 u(d) / d)^2, where u(F) is the class bound taken
// as rectangular (bound / sqrt 3) or a calibration's own value.
func TestRmUncertaintyGUM(t *testing.T) {
	stress, _ := hollomon(205000, 700, 0.22, 0.01)
	c := synthSpec{s0MM2: math.Pi * 25 / 4, leMM: 50, samples: 3000, eMax: 0.3, stress: stress}.curve()
	sp := reduce.Specimen{Shape: reduce.ShapeRound, D0MM: 5, L0MM: 50, DuMM: 3}
	cases := []struct {
		opt    reduce.Options
		relUF  float64
		uDimMM float64
	}{
		{reduce.Options{}, 0.01 / math.Sqrt(3), 0.005}, // defaults: class 1, 0.005 mm
		{reduce.Options{ForceClassPct: 0.5, DimensionUMM: 0.002}, 0.005 / math.Sqrt(3), 0.002},
		{reduce.Options{ForceRelUPct: 0.1}, 0.001, 0.005}, // from a calibration
	}
	for _, tc := range cases {
		res, err := reduce.Reduce(c, sp, reduce.Detected{}, tc.opt)
		if err != nil {
			t.Fatal(err)
		}
		rm, _ := quantity(res, "Rm")
		want := 2 * rm.Value * math.Hypot(tc.relUF, 2*tc.uDimMM/5)
		if rm.U == nil || math.Abs(*rm.U/want-1) > 1e-9 {
			t.Errorf("%+v: U(Rm) %v, GUM %v", tc.opt, rm.U, want)
		}
		// Z from du: 100 (S0 - Su) / S0 with Su = pi du^2 / 4.
		z, ok := quantity(res, "Z")
		if !ok || math.Abs(z.Value-100*(1-9.0/25)) > 1e-9 {
			t.Errorf("Z %v, want 64", z.Value)
		}
	}
	// Flat specimen: Su = au bu.
	res, err := reduce.Reduce(c, reduce.Specimen{S0MM2: math.Pi * 25 / 4, L0MM: 50, AuMM: 2, BuMM: 4}, reduce.Detected{}, reduce.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if z, ok := quantity(res, "Z"); !ok || math.Abs(z.Value-100*(1-8/(math.Pi*25/4))) > 1e-9 {
		t.Errorf("Z from au bu: %v", z.Value)
	}
}
