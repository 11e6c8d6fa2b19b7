package reduce

import (
	"math"
	"sort"
)

// stressNoiseMPa estimates the standard deviation of the stress noise from
// second differences over [w.first, w.iBreak]: for a smooth curve sampled
// finely they hold only noise, with variance 6 sigma^2. The median absolute
// value (divided by 0.6745 for a normal distribution) ignores the few large
// second differences at real corners. At most maxNoiseSamples differences
// are looked at, evenly spread, to keep long records cheap.
func (w *work) stressNoiseMPa() float64 {
	const maxNoiseSamples = 20000
	if w.first < 0 {
		return 0
	}
	span := w.iBreak - w.first
	step := 1
	if span > maxNoiseSamples {
		step = span / maxNoiseSamples
	}
	d := make([]float64, 0, min(span, maxNoiseSamples)+1)
	for i := w.first + 1; i < w.iBreak; i += step {
		a, b, c := w.stress[i-1], w.stress[i], w.stress[i+1]
		if v := a - 2*b + c; finite(v) {
			d = append(d, math.Abs(v))
		}
	}
	if len(d) == 0 {
		return 0
	}
	sort.Float64s(d)
	return d[len(d)/2] / 0.6745 / math.Sqrt(6)
}
