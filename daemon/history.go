package daemon

import "framed/reduce"

// history keeps the last spanS seconds of merged samples while the frame is
// idle, so that when a test is recognised its first samples (the rise that
// preceded the trigger) are stored too. Memory is bounded by spanS times the
// sample rate; old samples are dropped in blocks to keep appends cheap.
type history struct {
	spanS float64
	c     reduce.Curve
	start int // index of the oldest kept sample in c
}

func newHistory(spanS float64) *history { return &history{spanS: spanS} }

func (h *history) add(b reduce.Curve) {
	if b.Len() == 0 {
		return
	}
	if h.c.Len() == 0 {
		// adopt the batch's column set (nil columns stay nil)
		h.c = reduce.Curve{TimeS: []float64{}}
		if b.ForceN != nil {
			h.c.ForceN = []float64{}
		}
		if b.ExtensionMM != nil {
			h.c.ExtensionMM = []float64{}
		}
		if b.CrossheadMM != nil {
			h.c.CrossheadMM = []float64{}
		}
	}
	h.c.Append(b)
	newest := h.c.TimeS[h.c.Len()-1]
	for h.start < h.c.Len() && h.c.TimeS[h.start] < newest-h.spanS {
		h.start++
	}
	if h.start > 4096 && h.start > h.c.Len()/2 {
		live := h.c.Slice(h.start, h.c.Len())
		h.c = reduce.Curve{TimeS: append([]float64(nil), live.TimeS...)}
		h.c.ForceN = cloneCol(live.ForceN)
		h.c.ExtensionMM = cloneCol(live.ExtensionMM)
		h.c.CrossheadMM = cloneCol(live.CrossheadMM)
		h.start = 0
	}
}

func cloneCol(c []float64) []float64 {
	if c == nil {
		return nil
	}
	return append([]float64(nil), c...)
}

// since returns the kept samples at or after fromS (a view: copy before the
// next add if it must outlive it).
func (h *history) since(fromS float64) reduce.Curve {
	i := h.start
	for i < h.c.Len() && h.c.TimeS[i] < fromS {
		i++
	}
	return h.c.Slice(i, h.c.Len())
}

func (h *history) reset() {
	h.c = reduce.Curve{}
	h.start = 0
}
