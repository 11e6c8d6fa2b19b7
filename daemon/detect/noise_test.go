package detect

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestNoiseEstimate: on white Gaussian noise the estimate is the standard
// deviation (the estimator's constant is the trimmed mean of a
// half-normal distribution, textbook statistics); a ramp with a knock on
// it, quantised in counts, does not move it much.
func TestNoiseEstimate(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for _, tc := range []struct {
		name          string
		sigma, step   float64
		rampPerSample float64
		knock         bool
		smooth        bool // each reading averages two (an averaging converter)
	}{
		{"white", 1, 0, 0, false, false},
		{"ramp and knock", 1, 0, 0.5, true, false},
		{"counts", 1, 1, 0, false, false}, // resolution as large as the noise
		{"averaged", 1, 0, 0, false, true},
	} {
		var e noiseEst
		var f0, f1, prevZ float64
		for i := range 2000 {
			z := r.NormFloat64()
			n := z
			if tc.smooth {
				n = (z + prevZ) / math.Sqrt2 // still of standard deviation 1
			}
			prevZ = z
			f := tc.sigma*n + tc.rampPerSample*float64(i)
			if tc.knock && i%200 == 0 {
				f += 50
			}
			if tc.step > 0 {
				f = tc.step * math.Round(f/tc.step)
			}
			if i >= 2 {
				e.add(f-f1, f-2*f1+f0)
			}
			f0, f1 = f1, f
		}
		// With quantisation the readings' own scatter is
		// sqrt(σ² + step²/12) (uniform rounding error).
		want := math.Sqrt(tc.sigma*tc.sigma + tc.step*tc.step/12)
		// Averaged noise is under-read by differences, which see only
		// its faster part: first differences of noise with lag-one
		// correlation ρ have variance 2σ²(1−ρ); here ρ = 1/2, so they
		// read σ/√2 (textbook time-series algebra). A known limit.
		if tc.smooth {
			want /= math.Sqrt2
		}
		if math.Abs(e.sigmaN-want) > 0.15*want {
			t.Errorf("%s: estimate %.3f, want %.3f ± 15 %%", tc.name, e.sigmaN, want)
		}
	}
}
