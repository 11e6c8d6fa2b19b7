package reduce

import (
	"math"
	"sort"
)

// Modulus of elasticity (ASTM E111): the least-squares slope of stress on
// strain over an elastic window chosen automatically.
//
// The window is searched, not fixed, because a fixed 10-40 % of the proof
// strength (common practice) fails both ways: on stiff high-strength steel
// the first tenth is the grips seating (the "toe"), and on annealed copper
// or aluminium the proportional limit lies below 40 % of Rp0.2. The search
// follows the idea of an objective, data-quality-driven choice (ASTM E3076
// describes one): every window between two stress levels on the first
// loading, levels at 1 % steps of the highest stress before the maximum,
// is fitted in O(1) from moment sums taken at the levels. Bent windows are
// dropped: a quadratic fitted to the window must not change its slope by
// more than bendRel across it unless that bend is lost in the noise (this
// keeps long stretches of plastic flow out, whose many points would
// otherwise win). Of the rest, the window with the lowest coefficient of variation of the slope V1 sets the noise
// floor. V1 falls with more points and rises with curvature; the widest
// window whose V1 stays within widenFactor of that floor is the fit: the
// longest straight stretch, with the toe and the knee (which bend the
// line) left out. Half the spread of E over those acceptable windows is
// kept as the fit-range part of E's uncertainty.

const (
	levelSteps = 100 // levels at 1 % .. 99 % of the top stress
	// minSpan is the narrowest window in levels (5 % of the top stress),
	// so a lucky handful of points cannot win on noise.
	minSpan      = 5
	minFitPoints = 5
)

// widenFactor: among windows whose V1 is within this factor of the best,
// the widest wins (checked on the published reference curves: the
// best-V1 window alone can sit on a short straight stretch between
// extensometer artefacts).
var widenFactor = 3.0

// A window is bent, and no candidate, when the slope of a quadratic fitted
// to it changes by more than bendRel across it and the quadratic term is
// significant against the noise (F above bendF, about t = 3).
const (
	bendRel = 0.01
	// unusableR2: below this r^2 the best window is no line and E is not
	// reported at all (ASTM E111 asks far better of a modulus fit; a noisy
	// annealed copper record at 200 Hz still fits to about 0.98).
	unusableR2 = 0.95
	bendF      = 9
)

type window struct {
	lo, hi int // level numbers
	l      line
}

// fitElastic finds the elastic window on the first loading, up to the
// maximum force or the extensometer's removal, and shifts w.strain so the
// fitted line passes through the origin (toe and preload compensation).
func (w *work) fitElastic() {
	if w.first < 0 {
		w.flag(FlagNoElasticFit)
		return
	}
	limit := w.iFm
	if w.iRemoved >= 0 && w.iRemoved < limit {
		limit = w.iRemoved
	}
	top := math.Inf(-1)
	for i := w.first; i <= limit; i++ {
		if s := w.stress[i]; s > top {
			top = s
		}
	}
	if !(top > 0) {
		w.flag(FlagNoElasticFit)
		return
	}
	// Moment sums at the first crossing of each level, one pass.
	var at [levelSteps + 1]sums
	var idx [levelSteps + 1]int
	var xs [levelSteps + 1]float64
	reached := 0
	var acc sums
	x0 := w.strain[w.first]
	for i := w.first; i <= limit && reached <= levelSteps; i++ {
		s, e := w.stress[i], w.strain[i]
		for reached <= levelSteps && s >= top*float64(reached)/levelSteps {
			at[reached], idx[reached], xs[reached] = acc, i, e-x0
			reached++
		}
		if finite(s) && finite(e) {
			acc.add(e-x0, s)
		}
	}
	var cands []window
	best := -1
	for lo := 1; lo < reached; lo++ {
		for hi := lo + minSpan; hi < reached; hi++ {
			l, ok := at[hi].minus(at[lo]).fit()
			if !ok || l.points < minFitPoints || !(l.slope > 0) {
				continue
			}
			rel, f, ok := at[hi].minus(at[lo]).bend(xs[lo], xs[hi])
			if !ok || (f > bendF && rel > bendRel) {
				continue
			}
			cands = append(cands, window{lo, hi, l})
			if best < 0 || l.v1Pct < cands[best].l.v1Pct {
				best = len(cands) - 1
			}
		}
	}
	if best < 0 {
		w.flag(FlagNoElasticFit)
		return
	}
	bestV1 := best
	{
		lim := widenFactor * cands[best].l.v1Pct
		for k, c := range cands {
			if c.l.v1Pct <= lim && (c.hi-c.lo > cands[best].hi-cands[best].lo || (c.hi-c.lo == cands[best].hi-cands[best].lo && c.l.v1Pct < cands[best].l.v1Pct)) {
				best = k
			}
		}
	}
	b := cands[best]
	// Fit-range spread: E over the near-best windows.
	es := []float64{b.l.slope}
	for _, c := range cands {
		if c.l.v1Pct <= widenFactor*cands[bestV1].l.v1Pct {
			es = append(es, c.l.slope)
		}
	}
	sort.Float64s(es)
	w.eSpreadMPa = (es[len(es)-1] - es[0]) / 2

	l := b.l
	if l.r2 < unusableR2 {
		// Not a line at all (a dead-weight record's holds and creep, a
		// slipping grip): no E rather than a number that means nothing.
		w.flag(FlagPoorElasticFit)
		w.flag(FlagNoElasticFit)
		return
	}
	// Intercept on the unshifted strain axis, then zero the strain there.
	zero := x0 - l.intercept/l.slope
	for i := range w.strain {
		w.strain[i] -= zero
	}
	l.intercept = 0
	w.fit, w.fitOK = l, true
	w.fitFromMPa = top * float64(b.lo) / levelSteps
	w.fitToMPa = top * float64(b.hi) / levelSteps
	if l.points < w.opt.MinElasticPoints {
		w.flag(FlagFewElasticPoints)
	}
	if l.r2 < w.opt.MinR2 || l.v1Pct > w.opt.MaxV1Pct {
		w.flag(FlagPoorElasticFit)
	}
}
