package reduce

// Proof strengths (ISO 6892-1, ASTM E8 offset method).
//
// Rp: the first point where the plastic (non-proportional) strain
// strain - stress/E reaches the offset, i.e. where the curve meets the
// elastic line moved right by the offset; linear between the two samples
// that bracket it. Rt: the first point where the total strain reaches the
// given extension.

// crossing is where a curve quantity first reaches a level, interpolated
// between samples i-1 and i (frac of the way from i-1).
type crossing struct {
	i    int
	frac float64
	ok   bool
}

func (w *work) at(col []float64, c crossing) float64 {
	if c.frac == 1 || c.i == 0 {
		return col[c.i]
	}
	p := c.i - 1
	for p > 0 && !(finite(col[p]) && finite(w.strain[p])) {
		p--
	}
	return col[p] + c.frac*(col[c.i]-col[p])
}

// firstReach is the first sample in [w.first, w.iBreak] where g reaches
// level from below (g may be NaN where there is no reading).
func (w *work) firstReach(g func(i int) float64, level float64) crossing {
	if w.first < 0 {
		return crossing{}
	}
	prev, pv := -1, 0.0
	for i := w.first; i <= w.iBreak; i++ {
		v := g(i)
		// Only loaded samples: a swing or slack below zero is no proof.
		if !finite(v) || !(w.stress[i] > 0) {
			continue
		}
		if v >= level {
			if prev < 0 || pv >= level {
				return crossing{i: i, frac: 1, ok: true}
			}
			return crossing{i: i, frac: (level - pv) / (v - pv), ok: true}
		}
		prev, pv = i, v
	}
	return crossing{}
}

// proof is Rp at plastic strain p (a fraction) with modulus eMPa.
func (w *work) proof(p, eMPa float64) (float64, crossing) {
	c := w.firstReach(func(i int) float64 {
		return w.strain[i] - w.stress[i]/eMPa
	}, p)
	if !c.ok {
		return nan, c
	}
	return w.at(w.stress, c), c
}

// totalProof is Rt at total strain t (a fraction).
func (w *work) totalProof(t float64) (float64, crossing) {
	c := w.firstReach(func(i int) float64 { return w.strain[i] }, t)
	if !c.ok {
		return nan, c
	}
	return w.at(w.stress, c), c
}

// localSlopeMPa is the stress-strain slope around sample i over about
// 0.1 % strain either side, for turning a strain uncertainty into stress.
func (w *work) localSlopeMPa(i int) float64 {
	if i <= w.first || i >= w.n {
		return 0
	}
	e := w.strain[i]
	a, b := i, i
	for a > w.first && finite(w.strain[a-1]) && e-w.strain[a-1] < 0.001 {
		a--
	}
	for b < w.iBreak && finite(w.strain[b+1]) && w.strain[b+1]-e < 0.001 {
		b++
	}
	if a == b || !(w.strain[b]-w.strain[a] > 0) {
		return 0
	}
	return (w.stress[b] - w.stress[a]) / (w.strain[b] - w.strain[a])
}
