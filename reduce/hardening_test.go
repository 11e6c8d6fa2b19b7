package reduce_test

import (
	"math"
	"testing"

	"framed/reduce"
)

// Hollomon hardening with the Considere maximum: Rm, Agt and Ag follow
// from the Considere criterion (d sigma / d eps = sigma at Fm; for a
// Hollomon material eps_p = n (1 - sigma/E)), n and K are the law's own,
// Rp0.2 is the plateau stress, and A is the engineering strain at fracture
// less the elastic recovery, all exact by construction.
func TestHollomonConsidere(t *testing.T) {
	const eMPa, kMPa, n = 205000.0, 700.0, 0.22
	stress, sY := hollomon(eMPa, kMPa, n, 0.01)
	rm, agt, ag := considere(eMPa, kMPa, n)
	for _, noisy := range []bool{false, true} {
		s := synthSpec{s0MM2: 78.54, leMM: 50, samples: 30000, eMax: 0.40, stress: stress, seed: 3, breakDrop: true}
		tol := map[string]float64{"Rm": 1e-4, "Rp0.2": 1e-3, "n": 1e-3, "K": 1e-3}
		tolPP := map[string]float64{"Agt": 0.01, "Ag": 0.01, "A": 0.01, "At": 0.01}
		if noisy {
			// A 100 kN load cell read to 1 N with 3 N noise, extensometer
			// to 0.1 um with 0.3 um noise (common practice).
			s.forceSDN, s.forceStepN, s.extSDMM, s.extStepMM = 3, 1, 0.0003, 0.0001
			tol = map[string]float64{"Rm": 1e-3, "Rp0.2": 5e-3, "n": 0.01, "K": 0.01}
			tolPP = map[string]float64{"Agt": 0.5, "Ag": 0.5, "A": 0.05, "At": 0.05}
		}
		c := s.curve()
		res, err := reduce.Reduce(c, reduce.Specimen{S0MM2: 78.54, L0MM: 50}, reduce.Detected{}, reduce.Options{})
		if err != nil {
			t.Fatal(err)
		}
		last := s.eMax
		want := map[string]float64{"Rm": rm, "Rp0.2": sY, "n": n, "K": kMPa}
		wantPct := map[string]float64{"Agt": 100 * agt, "Ag": 100 * ag, "At": 100 * last, "A": 100 * (last - stress(last)/eMPa)}
		for sym, v := range want {
			q, ok := quantity(res, sym)
			if !ok {
				t.Errorf("noisy=%v: %s missing (flags %v)", noisy, sym, res.Flags)
				continue
			}
			if d := math.Abs(q.Value/v - 1); !(d <= tol[sym]) {
				t.Errorf("noisy=%v: %s = %.5g, want %.5g (rel. off %.2g, tol %.2g; %s)", noisy, sym, q.Value, v, d, tol[sym], q.Method)
			}
		}
		for sym, v := range wantPct {
			q, ok := quantity(res, sym)
			if !ok {
				t.Errorf("noisy=%v: %s missing (flags %v)", noisy, sym, res.Flags)
				continue
			}
			if d := math.Abs(q.Value - v); !(d <= tolPP[sym]) {
				t.Errorf("noisy=%v: %s = %.4f %%, want %.4f (off %.3f pp, tol %.3g; %s)", noisy, sym, q.Value, v, d, tolPP[sym], q.Method)
			}
			if q.U != nil && math.Abs(q.Value-v) > *q.U+1e-9 {
				t.Errorf("noisy=%v: %s = %.4f +- %.4f does not cover the exact %.4f", noisy, sym, q.Value, *q.U, v)
			}
		}
		if _, ok := quantity(res, "ReH"); ok {
			t.Errorf("noisy=%v: a flat plateau reported a yield point", noisy)
		}
	}
}
