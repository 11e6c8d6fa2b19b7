package detect

// sample is one reading. Ext and Xh are NaN when not read.
type sample struct {
	t, f, ext, xh float64
	// rawF is the sample's own force reading, for averages and scatter:
	// f may be a neighbour's, after the median.
	rawF float64
}

// median3 delays the force by one sample and replaces it by the median of
// itself and its neighbours, so that a single wild reading can neither
// start a test nor fake a break. This one-sample delay is the detector's
// whole look-ahead (LookaheadSamples).
type median3 struct {
	n    int
	a, b sample // the two samples before the newest
}

// push takes the newest sample and returns the filtered previous one.
func (m *median3) push(s sample) (sample, bool) {
	if m.n < 2 {
		if m.n == 0 {
			m.b = s
		} else {
			m.a, m.b = m.b, s
		}
		m.n++
		return sample{}, false
	}
	// The median sample lends its force and its displacements together,
	// so that they stay a consistent pair; the time stays the middle one.
	out := medSample(&m.a, &m.b, &s)
	out.t, out.rawF = m.b.t, m.b.f
	m.a, m.b = m.b, s
	return out, true
}

func medSample(x, y, z *sample) sample {
	if x.f > y.f {
		x, y = y, x
	}
	if y.f > z.f {
		y = z
	}
	if x.f > y.f {
		return *x
	}
	return *y
}
