package reduce

import (
	"math"
	"sort"
)

// Discontinuous yielding (ISO 6892-1): ReH, ReL and Ae.
//
// ReH is the highest stress before the first marked force drop. A drop is
// marked when the stress falls below the running maximum by more than
// the larger of 0.5 % of that maximum and five times the stress noise,
// before plastic strain reaches 2 % and before the maximum force (beyond
// that a fall is necking, not yielding), from a peak above the elastic fit
// window (below it a dip is the grips seating), while the specimen goes on
// extending (a fall with an elastic spring-back is an unload).
//
// The yield range runs from ReH until uniform work hardening starts: the
// stress rises clear (by the same margin) above the highest stress seen in
// the range after the first dip. ReL is the lowest stress in that range,
// ignoring the initial transient: the first dip straight after ReH is
// skipped (ISO 6892:1998 cl. 4.9.2) unless it is the only minimum. Ae is
// the plastic strain from ReH to the start of uniform hardening.

// transientFrac bounds the initial transient's length in strain (common
// practice: it is over within a fraction of a percent).
const transientFrac = 0.002

type yieldPoint struct {
	ok            bool
	iH            int
	reH, reL      float64
	iL            int
	aeFrac        float64
	endIndex      int // start of uniform work hardening
	transientOnly bool
}

func (w *work) yieldPoint() yieldPoint {
	var y yieldPoint
	if !w.fitOK {
		return y
	}
	e := w.fit.slope
	peak, iPeak := math.Inf(-1), -1
	marked := func(s float64) float64 { return math.Max(0.005*s, 5*w.noiseMPa) }
	for i := w.first; i < w.iFm; i++ {
		s, x := w.stress[i], w.strain[i]
		if !finite(s) {
			continue
		}
		if finite(x) && x-s/e > 0.02 {
			break
		}
		if s > peak {
			peak, iPeak = s, i
			continue
		}
		if peak-s > marked(peak) && peak > w.fitToMPa {
			// In a yield drop the specimen goes on extending; when the
			// force is taken off it springs back by the drop over E. A
			// fall with the spring-back is an unload (a load-unload cycle,
			// weights lifted off), not yielding.
			if xp := w.strain[iPeak]; finite(x) && finite(xp) && xp-x > 0.5*(peak-s)/e {
				break
			}
			y.ok, y.iH, y.reH = true, iPeak, peak
			break
		}
	}
	if !y.ok {
		return y
	}
	// Walk the yield range: first dip, then the plateau, until the stress
	// rises clear above the plateau's top.
	m := marked(y.reH)
	i := y.iH + 1
	dipMin, iDip := math.Inf(1), -1
	for ; i < w.iFm; i++ { // the first dip: down to its bottom and back up by m
		s := w.stress[i]
		if !finite(s) {
			continue
		}
		if s < dipMin {
			dipMin, iDip = s, i
		}
		if s > dipMin+m {
			break
		}
	}
	// The transient lasts until the recovery tops out: the stress falls
	// back by m from its highest since the dip, or the strain has run
	// transientFrac past the dip's bottom.
	top := math.Inf(-1)
	for ; i < w.iFm; i++ {
		s, x := w.stress[i], w.strain[i]
		if !finite(s) {
			continue
		}
		if s > top {
			top = s
		}
		if s < top-m || (iDip >= 0 && finite(x) && x-w.strain[iDip] > transientFrac) {
			break
		}
	}
	// Coarse end of the yield range: the stress rises a clear band above
	// the lowest stress of the plateau so far (plateau serrations stay
	// inside the band), or clearly above ReH (slow hardening).
	band := math.Max(0.03*y.reH, 10*w.noiseMPa)
	low, iLow := math.Inf(1), -1
	end := -1
	for j := i; j < w.iFm; j++ {
		s := w.stress[j]
		if !finite(s) {
			continue
		}
		if iLow >= 0 && (s > low+band || s > y.reH+m) {
			end = j
			break
		}
		if s < low {
			low, iLow = s, j
		}
	}
	if end < 0 {
		end = w.iFm
	}
	// Plateau level: the median stress between the dip and the coarse end.
	// The rising tail into hardening is left out: the plateau ends at the
	// last sample within 2 m of its lowest stress.
	tail := end
	for tail > i+1 && !(w.stress[tail-1] <= low+2*m) {
		tail--
	}
	var plat []float64
	for j := i; j < tail; j++ {
		if finite(w.stress[j]) {
			plat = append(plat, w.stress[j])
		}
	}
	level := dipMin
	if len(plat) > 0 {
		sort.Float64s(plat)
		level = plat[len(plat)/2]
	}
	// Start of uniform hardening: the hardening line fitted over 0.5 %
	// strain from the coarse end, met with the plateau level.
	y.endIndex = end
	var hs sums
	if xe := w.strain[end]; finite(xe) {
		for j := end; j < w.iFm && j <= w.iBreak; j++ {
			x, s := w.strain[j], w.stress[j]
			if !finite(x) || !finite(s) {
				continue
			}
			if x-xe > 0.005 {
				break
			}
			hs.add(x-xe, s)
		}
		if l, ok := hs.fit(); ok && l.slope > 0 {
			xStar := xe + (level-l.intercept)/l.slope
			for j := end; j > i; j-- {
				if finite(w.strain[j]) && w.strain[j] <= xStar {
					y.endIndex = j
					break
				}
			}
		}
	}
	// ReL: the lowest stress after the initial transient up to uniform
	// hardening; the transient alone when nothing follows it.
	low, iLow = math.Inf(1), -1
	for j := i; j <= y.endIndex; j++ {
		if s := w.stress[j]; finite(s) && s < low {
			low, iLow = s, j
		}
	}
	if iLow < 0 || low >= y.reH {
		// Nothing below ReH after the transient: its dip is the only
		// minimum, and so ReL.
		y.reL, y.iL, y.transientOnly = dipMin, iDip, true
	} else {
		y.reL, y.iL = low, iLow
	}
	if xe, xh := w.strain[y.endIndex], w.strain[y.iH]; finite(xe) && finite(xh) {
		y.aeFrac = (xe - w.stress[y.endIndex]/e) - (xh - y.reH/e)
		if y.aeFrac < 0 {
			y.aeFrac = 0
		}
	} else {
		y.aeFrac = nan
	}
	return y
}
