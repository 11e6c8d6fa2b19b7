package detect

import (
	"math"
	"slices"
)

// noiseRing is how many recent second differences the idle noise floor is
// taken from.
const noiseRing = 128

// noiseEst estimates the force noise at idle from the median absolute
// second difference of the readings. Second differences cancel a slow
// ramp (a test beginning gently); the median ignores the few large ones
// at the corners of a ramp or at a knock on the frame. For white noise of
// standard deviation σ a second difference has standard deviation σ√6,
// and its median absolute value is 0.6745 times that.
type noiseEst struct {
	ring    [noiseRing]float64
	scratch [noiseRing]float64
	n, at   int
	sigmaN  float64
}

func (e *noiseEst) reset() { *e = noiseEst{} }

func (e *noiseEst) add(d2 float64) {
	e.ring[e.at] = math.Abs(d2)
	e.at = (e.at + 1) % noiseRing
	e.n++
	// Recompute at every reading while the ring fills, then every
	// 32nd: the estimate moves slowly and the sort is not free.
	if e.n <= noiseRing || e.n%32 == 0 {
		m := min(e.n, noiseRing)
		s := e.scratch[:m]
		copy(s, e.ring[:m])
		slices.Sort(s)
		med := s[m/2]
		if m%2 == 0 {
			med = (s[m/2-1] + s[m/2]) / 2
		}
		e.sigmaN = med / 0.6745 / math.Sqrt(6)
	}
}

// count is how many second differences the estimate rests on.
func (e *noiseEst) count() int { return min(e.n, noiseRing) }
