package reduce

import "math"

// Maximum force and the extensions at it (ISO 6892-1 Fm, Rm, Ag, Agt).
//
// Fm is the largest force read. The extension at Fm is taken at the
// maximum of the force after isolated spikes are set down to the median of
// their three-sample neighbourhood: a single reading more than five noise
// deviations above both neighbours is an electrical or mechanical glitch,
// and on a flat top such a glitch would otherwise move Ag by percents. The
// flatness of the top is reported, not hidden: the strain width of the
// samples within two noise deviations (x sqrt 2), or topBandFrac of Fm if
// larger, of the top goes into Ag's uncertainty: the true top may be at any
// of them, so the farthest one from the sample taken bounds a rectangular
// spread,
// and a width over 1 % strain sets the flat-maximum flag.

// topBandFrac: readings within 0.1 % of Fm are taken as equal to it. That
// is a fifth of the relative resolution a class 1 force channel may have
// (ISO 7500-1, 0.5 %, from memory), so the band is if anything narrow.
const topBandFrac = 0.001

type topFit struct {
	i         int     // sample taken as the maximum
	agtFrac   float64 // total strain there
	widthFrac float64 // strain width of the samples within noise of the top
	reachFrac float64 // farthest such sample from the one taken
	spikes    int     // isolated spikes set down near the top
}

// despiked is stress[i], set down to the neighbourhood median when it is an
// isolated spike.
func (w *work) despiked(i int, limit float64) (float64, bool) {
	b := w.stress[i]
	if i <= w.first || i >= w.iBreak {
		return b, false
	}
	a, c := w.stress[i-1], w.stress[i+1]
	if !finite(a) || !finite(c) {
		return b, false
	}
	if b-a > limit && b-c > limit {
		return math.Max(a, c), true
	}
	return b, false
}

func (w *work) top() topFit {
	t := topFit{i: w.iFm, agtFrac: w.strain[w.iFm]}
	limit := 5 * w.noiseMPa
	best := math.Inf(-1)
	for i := w.first; i <= w.iBreak; i++ {
		if !(w.stress[i] > best) {
			continue // despiking only sets a value down: it cannot win
		}
		s, _ := w.despiked(i, limit)
		if finite(s) && finite(w.strain[i]) && s > best {
			best, t.i = s, i
		}
	}
	if best == math.Inf(-1) {
		return t
	}
	t.agtFrac = w.strain[t.i]
	band := math.Max(2*math.Sqrt2*w.noiseMPa, topBandFrac*best)
	emin, emax := t.agtFrac, t.agtFrac
	for i := t.i; i >= w.first; i-- {
		s, _ := w.despiked(i, limit)
		if s < best-band {
			break
		}
		if x := w.strain[i]; finite(x) {
			emin = math.Min(emin, x)
		}
	}
	for i := t.i; i <= w.iBreak; i++ {
		s, _ := w.despiked(i, limit)
		if s < best-band {
			break
		}
		if x := w.strain[i]; finite(x) {
			emax = math.Max(emax, x)
		}
	}
	t.widthFrac = emax - emin
	t.reachFrac = math.Max(emax-t.agtFrac, t.agtFrac-emin)
	return t
}
