package reduce

import "math"

// buildStrain fills w.strain (a fraction, not yet zeroed) from the
// extensometer over Le, stitching the crosshead on after an extensometer
// removal, or from the crosshead alone (apparent) when there is no
// extensometer.
func (w *work) buildStrain() {
	w.strain = make([]float64, w.n)
	ext, xh, f := w.c.ExtensionMM, w.c.CrossheadMM, w.c.ForceN
	c := w.opt.ComplianceMMPerN
	xc := func(i int) float64 { return xh[i] - c*f[i] }
	last := -1
	if ext != nil {
		for i := w.iBreak; i >= 0; i-- {
			if finite(ext[i]) {
				last = i
				break
			}
		}
	}
	hasXH := xh != nil
	// One division, then multiplications: the loops below run over every
	// sample of tests of millions.
	perLe := 1 / w.leMM
	switch {
	case last >= 0:
		for i := 0; i <= last; i++ {
			w.strain[i] = ext[i] * perLe
		}
		for i := last + 1; i < w.n; i++ {
			w.strain[i] = nan
		}
		if last < w.iBreak {
			w.iRemoved = last
			w.flag(FlagExtensometerRemoved)
			if hasXH && finite(xc(last)) {
				// Uniform elongation: the extensometer's share of the
				// crosshead motion as last seen. Past Fm the neck takes all
				// further elongation, and it lies within Le (else the test
				// is void), so the crosshead motion counts in full.
				k := w.matchSlope(last)
				e := ext[last]
				prev := xc(last)
				for i := last + 1; i < w.n; i++ {
					cur := xh[i] - c*f[i]
					d := cur - prev
					prev = cur
					if !finite(d) {
						w.strain[i] = e * perLe
						continue
					}
					if i > w.iFm {
						e += d
					} else {
						e += k * d
					}
					w.strain[i] = e * perLe
				}
			}
		}
	case hasXH:
		w.source = fromCrosshead
		w.flag(FlagNoExtensometer)
		w.flag(FlagModulusApparent)
		if c == 0 {
			w.flag(FlagNoCompliance)
		}
		for i := range w.strain {
			w.strain[i] = (xh[i] - c*f[i]) * perLe
		}
	default:
		w.flag(FlagNoExtensometer)
		for i := range w.strain {
			w.strain[i] = nan
		}
	}
	w.first = -1
	for i := 0; i < w.n; i++ {
		if finite(w.stress[i]) && finite(w.strain[i]) {
			w.first = i
			break
		}
	}
}

// matchSlope is d(extension)/d(corrected crosshead) over the last quarter of
// the extensometer's range before removal, so the stitched extension runs on
// at the rate the extensometer last showed (plastic flow, where the load
// train's stretch hardly changes). Falls back to 1 when it cannot be told.
func (w *work) matchSlope(last int) float64 {
	ext, xh, f := w.c.ExtensionMM, w.c.CrossheadMM, w.c.ForceN
	c := w.opt.ComplianceMMPerN
	top := ext[last]
	if !(top > 0) {
		return 1
	}
	var s sums
	x0 := xh[last] - c*f[last]
	for i := last; i >= 0; i-- {
		e := ext[i]
		if !finite(e) {
			continue
		}
		if e < 0.75*top {
			break
		}
		x := xh[i] - c*f[i]
		if finite(x) {
			s.add(x-x0, e-top)
		}
	}
	l, ok := s.fit()
	if !ok || !(l.slope > 0.1) || l.slope > 1.5 || math.IsNaN(l.slope) {
		return 1
	}
	return l.slope
}
