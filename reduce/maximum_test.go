package reduce_test

import (
	"math"
	"testing"

	"framed/reduce"
)

// A single glitch on a flat top must not move Ag: the Hollomon curve's
// maximum is where Considere puts it (see TestHollomonConsidere); a spike
// of 0.3 % of Fm, 5 % strain past the true maximum, is set down and Ag
// stays at the Considere value. Fm, the largest reading, does take the
// spike (ISO 6892-1 defines Fm as the largest force), which is why the
// spike is kept small here.
func TestAgIgnoresSpikeOnFlatTop(t *testing.T) {
	const eMPa, kMPa, n = 205000.0, 700.0, 0.22
	stress, _ := hollomon(eMPa, kMPa, n, 0.01)
	_, agt, ag := considere(eMPa, kMPa, n)
	s := synthSpec{s0MM2: 78.54, leMM: 50, samples: 30000, eMax: 0.40, stress: stress, seed: 3,
		forceSDN: 3, forceStepN: 1, extSDMM: 0.0003, extStepMM: 0.0001}
	c := s.curve()
	// The spike: one reading 0.3 % above the curve at Agt + 5 %.
	spikeAt := -1
	for i, x := range c.ExtensionMM {
		if x/50 >= agt+0.05 {
			spikeAt = i
			break
		}
	}
	fm := 0.0
	for _, f := range c.ForceN {
		fm = math.Max(fm, f)
	}
	c.ForceN[spikeAt] = fm * 1.003
	res, err := reduce.Reduce(c, reduce.Specimen{S0MM2: 78.54, L0MM: 50}, reduce.Detected{}, reduce.Options{})
	if err != nil {
		t.Fatal(err)
	}
	q, _ := quantity(res, "Ag")
	if math.Abs(q.Value-100*ag) > 0.5 {
		t.Errorf("Ag %.3f %% with a spike 5 %% past the maximum, Considere %.3f %%", q.Value, 100*ag)
	}
}
