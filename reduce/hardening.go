package reduce

import (
	"fmt"
	"math"
)

// Strain hardening exponent n and strength coefficient K (ASTM E646,
// ISO 10275): the least-squares line of ln(true stress) on ln(true plastic
// strain) over a stated engineering strain range, only up to the maximum
// force (true values are valid to Fm only) and never over the Lueders
// range. The range is Options.HardeningFromPct..ToPct, cut at Agt; if that
// leaves too little, it falls back to from the end of yielding (or 1 %
// plastic strain) to Agt, and says so in the method and the flags.

// maxHardeningPoints caps the points of the n/K regression.
const maxHardeningPoints = 20000

type hardening struct {
	ok           bool
	n, k         float64
	uN, uRelK    float64 // standard uncertainties (n absolute, K relative)
	fromPct      float64
	toPct        float64
	points       int
	fallbackUsed bool
}

func (w *work) hardening(agtFrac float64, yieldEnd int) hardening {
	var h hardening
	if !w.fitOK {
		return h
	}
	lo := w.opt.HardeningFromPct / 100
	hi := math.Min(w.opt.HardeningToPct/100, agtFrac)
	h = w.hardeningOver(lo, hi, yieldEnd)
	if h.ok && h.points >= 5 {
		return h
	}
	// Fallback: from where plastic flow is established to Agt.
	lo = 0.01 + w.strainAt(w.first)
	if yieldEnd > 0 && finite(w.strain[yieldEnd]) {
		lo = math.Max(lo, w.strain[yieldEnd])
	}
	g := w.hardeningOver(lo, agtFrac, yieldEnd)
	g.fallbackUsed = true
	return g
}

func (w *work) strainAt(i int) float64 {
	if i < 0 || !finite(w.strain[i]) {
		return 0
	}
	return math.Max(0, w.strain[i])
}

func (w *work) hardeningOver(lo, hi float64, yieldEnd int) hardening {
	h := hardening{fromPct: 100 * lo, toPct: 100 * hi}
	if !(hi > lo) {
		return h
	}
	e := w.fit.slope
	var s sums
	start := w.first
	if yieldEnd > start {
		start = yieldEnd
	}
	// The samples in range, thinned to at most maxHardeningPoints evenly
	// spread ones: two logarithms a sample dominate long records, and past
	// a few thousand points the line no longer changes.
	a, b := -1, -1
	for i := start; i <= w.iFm; i++ {
		if x := w.strain[i]; finite(x) && x >= lo && x <= hi {
			if a < 0 {
				a = i
			}
			b = i
		}
	}
	if a < 0 {
		return h
	}
	stride := max(1, (b-a+1)/maxHardeningPoints)
	for i := a; i <= b; i += stride {
		x, st := w.strain[i], w.stress[i]
		if !finite(x) || !finite(st) || x < lo || x > hi {
			continue
		}
		ts := st * (1 + x)
		tp := math.Log1p(x) - ts/e
		if !(tp > 0) || !(ts > 0) {
			continue
		}
		s.add(math.Log(tp), math.Log(ts))
	}
	l, ok := s.fit()
	if !ok {
		return h
	}
	h.ok, h.n, h.k, h.points = true, l.slope, math.Exp(l.intercept), l.points
	h.uN = l.seSlope
	// Standard error of the intercept: se_b sqrt(sum x^2 / n).
	h.uRelK = l.seSlope * math.Sqrt(s.sxx/s.n)
	return h
}

func (h hardening) method() string {
	m := fmt.Sprintf("ISO 10275 / ASTM E646 log-log regression of true stress on true plastic strain, engineering strain %.2f-%.2f %%, %d points", h.fromPct, h.toPct, h.points)
	if h.fallbackUsed {
		m += " (requested range not available before Fm)"
	}
	return m
}
