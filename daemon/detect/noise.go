package detect

import (
	"math"
	"slices"
)

// noiseRing is how many recent differences the idle noise floor is taken
// from.
const noiseRing = 512

// noiseEst estimates the force noise at idle from the first and second
// differences of the readings. Second differences cancel a slow ramp (a
// test beginning gently); first differences, taken about their median
// (the ramp's pace), keep the slower part of the noise that second
// differences miss when the noise is not white (an averaging converter).
// Of each, the absolute values are averaged without their largest
// twentieth, which ignores the corners and first readings of a ramp or a
// knock on the frame, and a mean
// rather than a median is not fooled by a coarse resolution. For white
// noise of standard deviation σ a first difference has standard deviation
// σ√2 and a second σ√6, and the mean of the smallest nineteen twentieths
// of the absolute values of a normal variable is 0.7169 times its
// standard deviation (half-normal distribution trimmed at its 95th
// percentile).
// The estimate is the larger of the two.
type noiseEst struct {
	d1, d2  [noiseRing]float64
	scratch [noiseRing]float64
	n, at   int
	sigmaN  float64
}

// trimmedHalfNormalMean is E[|Z| given |Z| < 1.9600] for a standard
// normal Z: sqrt(2/π)·(1 − exp(−1.96²/2)) / 0.95.
const trimmedHalfNormalMean = 0.7169

func (e *noiseEst) reset() { *e = noiseEst{} }

// add takes the first and second differences ending at a reading and
// reports whether the estimate was recomputed.
func (e *noiseEst) add(d1, d2 float64) bool {
	e.d1[e.at], e.d2[e.at] = d1, d2
	e.at = (e.at + 1) % noiseRing
	e.n++
	// Recompute often while the rings fill, then every 16384th reading:
	// the estimate moves slowly, it only matters at idle for the start
	// threshold's noise term, and the start of a test recomputes it
	// anyway (recompute); the sorts are not free.
	if (e.n <= 64 && e.n%4 == 1) || (e.n <= noiseRing && e.n%64 == 1) || e.n%16384 == 0 {
		e.recompute()
		return true
	}
	return false
}

// recompute takes the estimate from the differences kept.
func (e *noiseEst) recompute() {
	m := min(e.n, noiseRing)
	if m == 0 {
		return
	}
	s := e.scratch[:m]
	copy(s, e.d1[:m])
	slices.Sort(s)
	pace := s[m/2]
	for i := range s {
		s[i] = math.Abs(e.d1[i] - pace)
	}
	s1 := trimmedMeanAbs(s) / math.Sqrt2
	for i := range s {
		s[i] = math.Abs(e.d2[i])
	}
	s2 := trimmedMeanAbs(s) / math.Sqrt(6)
	e.sigmaN = math.Max(s1, s2)
}

// trimmedMeanAbs sorts s (absolute values) and returns the mean of its
// smallest nineteen twentieths scaled to a standard deviation.
func trimmedMeanAbs(s []float64) float64 {
	slices.Sort(s)
	keep := max(1, len(s)*19/20)
	sum := 0.0
	for _, v := range s[:keep] {
		sum += v
	}
	return sum / float64(keep) / trimmedHalfNormalMean
}

// count is how many differences the estimate rests on.
func (e *noiseEst) count() int { return min(e.n, noiseRing) }
