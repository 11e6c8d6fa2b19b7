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
	buf  [3]sample
	n    int
	a, b int // slots of the two samples before the newest, oldest first
}

// push takes the newest sample and writes the filtered previous one to
// out, reporting whether there was one. The samples stay in place in a
// three-slot buffer.
func (m *median3) push(s *sample, out *sample) bool {
	if m.n < 2 {
		m.buf[m.n] = *s
		m.a, m.b = 0, m.n
		m.n++
		return false
	}
	c := 3 - m.a - m.b // the free slot
	m.buf[c] = *s
	x, y, z := &m.buf[m.a], &m.buf[m.b], &m.buf[c]
	// The median sample lends its force and its displacements together,
	// so that they stay a consistent pair; the time stays the middle one.
	// The median's value without branches (noise makes them
	// unpredictable), then the sample that holds it.
	medF := max(min(x.f, y.f), min(max(x.f, y.f), z.f))
	med := z
	if medF == y.f {
		med = y
	} else if medF == x.f {
		med = x
	}
	*out = *med
	out.t, out.rawF = y.t, y.f
	m.a, m.b = m.b, c
	return true
}
