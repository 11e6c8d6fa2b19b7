package reduce

// energyMJPerM3 is the work of fracture per unit volume: the area under the
// engineering stress-strain curve from the first sample to the fracture
// sample, by the trapezoid rule (MPa x strain = MJ/m3). It uses the
// stitched strain after an extensometer removal.
func (w *work) energyMJPerM3() float64 {
	if w.first < 0 {
		return nan
	}
	sum := 0.0
	px, ps := w.strain[w.first], w.stress[w.first]
	for i := w.first + 1; i <= w.iBreak; i++ {
		x, s := w.strain[i], w.stress[i]
		if !finite(x) || !finite(s) {
			continue
		}
		sum += (x - px) * (s + ps) / 2
		px, ps = x, s
	}
	if px < 0 {
		return nan
	}
	return sum
}
