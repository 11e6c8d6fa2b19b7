package reduce

// Curve is a recorded tension test in columns on its own time axis. The
// columns match the curve file contract (time_s, force_N, extension_mm,
// crosshead_mm). A NaN in ExtensionMM or CrossheadMM means no reading, e.g.
// the extensometer was removed. Every column has the same length; a nil
// column means the channel was never there.
type Curve struct {
	TimeS       []float64
	ForceN      []float64
	ExtensionMM []float64
	CrossheadMM []float64
}

// Len is the number of samples.
func (c *Curve) Len() int { return len(c.TimeS) }

// Append adds the samples of o to c. Nil columns in o are padded with NaN
// where c has that column, so partial batches keep the columns aligned.
func (c *Curve) Append(o Curve) {
	n := o.Len()
	c.TimeS = append(c.TimeS, o.TimeS...)
	c.ForceN = appendCol(c.ForceN, o.ForceN, n)
	c.ExtensionMM = appendCol(c.ExtensionMM, o.ExtensionMM, n)
	c.CrossheadMM = appendCol(c.CrossheadMM, o.CrossheadMM, n)
}

func appendCol(dst, src []float64, n int) []float64 {
	if src != nil {
		return append(dst, src...)
	}
	if dst == nil {
		return nil
	}
	for i := 0; i < n; i++ {
		dst = append(dst, nan)
	}
	return dst
}

// Slice returns the samples [from, to) sharing c's storage.
func (c *Curve) Slice(from, to int) Curve {
	s := Curve{TimeS: c.TimeS[from:to]}
	if c.ForceN != nil {
		s.ForceN = c.ForceN[from:to]
	}
	if c.ExtensionMM != nil {
		s.ExtensionMM = c.ExtensionMM[from:to]
	}
	if c.CrossheadMM != nil {
		s.CrossheadMM = c.CrossheadMM[from:to]
	}
	return s
}
