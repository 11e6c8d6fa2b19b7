package reduce_test

import (
	"math"
	"testing"

	"framed/reduce"
)

// The true curve of a Hollomon material must give back its law:
// true stress = K (true strain - true stress / E)^n (the law itself), at
// every sample up to Fm, and stop at Fm (valid only up to there).
func TestTrueCurveHollomon(t *testing.T) {
	const eMPa, kMPa, n = 205000.0, 700.0, 0.22
	stress, _ := hollomon(eMPa, kMPa, n, 0.01)
	c := synthSpec{s0MM2: 50, leMM: 50, samples: 5000, eMax: 0.3, stress: stress}.curve()
	ss, err := reduce.ComputeStressStrain(c, reduce.Specimen{S0MM2: 50, L0MM: 50}, reduce.Detected{}, reduce.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(ss.TrueStressMPa) != ss.FmIndex+1 {
		t.Fatalf("true curve has %d points, Fm at %d", len(ss.TrueStressMPa), ss.FmIndex)
	}
	checked := 0
	for i := range ss.TrueStressMPa {
		ep := ss.TrueStrainPct[i]/100 - ss.TrueStressMPa[i]/eMPa
		if ep < 0.02 {
			continue
		}
		want := kMPa * math.Pow(ep, n)
		// The strain axis is zeroed on the fitted elastic line, which is
		// 0.3 % shallower than E (see TestExtensometerRemoved); allow 0.1 %.
		if math.Abs(ss.TrueStressMPa[i]/want-1) > 1e-3 {
			t.Fatalf("sample %d: true stress %.3f, Hollomon %.3f", i, ss.TrueStressMPa[i], want)
		}
		checked++
	}
	if checked < 100 {
		t.Fatalf("only %d samples checked", checked)
	}
}
