package daemon

import (
	"math"

	"framed/drivers"
	"framed/reduce"
)

// Signal indexes of the frame: what the detector and the reduction see.
const (
	sigForce = iota
	sigExtension
	sigCrosshead
	nSignals
)

var signalNames = [nSignals]string{"force", "extension", "crosshead"}

// source is the driver channel behind one frame signal.
type source struct {
	driver, channel int // -1: the frame has no such signal
}

// merger puts channels from several drivers onto one time base: the
// instants of the slowest driver (the master), with the other drivers'
// readings interpolated linearly at those instants after each driver's
// transport delay is taken off. With one driver it copies columns through.
//
// A master sample waits until every other driver has reported past it, so
// interpolation never extrapolates; if another driver falls further behind
// than stallNS, its signals become NaN (no reading) and it is reported as
// stalled rather than silently held at its last value.
type merger struct {
	epochNS int64
	src     [nSignals]source
	master  int
	delayNS []int64
	stallNS int64

	// pending master samples not yet emitted
	pt []int64
	pv [nSignals][]float64
	// per other driver: buffered adjusted times and signal values
	ot [][]int64
	ov [][nSignals][]float64

	stalled []bool
	out     reduce.Curve
}

// newMerger builds a merger. rates are the drivers' nominal sample rates;
// the slowest driver that feeds a signal becomes the master.
func newMerger(epochNS int64, src [nSignals]source, rates []float64, delaysMS []float64, stallNS int64) *merger {
	m := &merger{epochNS: epochNS, src: src, master: -1, stallNS: stallNS}
	n := len(rates)
	m.delayNS = make([]int64, n)
	for i := range n {
		m.delayNS[i] = int64(delaysMS[i] * 1e6)
	}
	m.ot = make([][]int64, n)
	m.ov = make([][nSignals][]float64, n)
	m.stalled = make([]bool, n)
	used := make([]bool, n)
	for _, s := range src {
		if s.driver >= 0 {
			used[s.driver] = true
		}
	}
	for d := range n {
		if !used[d] {
			continue
		}
		if m.master < 0 || slower(rates[d], rates[m.master]) {
			m.master = d
		}
	}
	if src[sigForce].driver >= 0 && m.master >= 0 && rates[src[sigForce].driver] == rates[m.master] {
		m.master = src[sigForce].driver // ties go to the force driver
	}
	return m
}

// slower reports whether rate a is slower than b (0 = unknown, fastest).
func slower(a, b float64) bool {
	if a == 0 {
		return false
	}
	return b == 0 || a < b
}

// push takes one batch of driver d and returns the merged samples that are
// now complete. The returned curve is reused by the next call.
func (m *merger) push(d int, b *drivers.Batch) reduce.Curve {
	if d == m.master {
		for i, t := range b.TimeNS {
			m.pt = append(m.pt, t-m.delayNS[d])
			for s := range nSignals {
				v := math.NaN()
				if m.src[s].driver == d {
					v = b.Values[m.src[s].channel][i]
				}
				m.pv[s] = append(m.pv[s], v)
			}
		}
	} else {
		for i, t := range b.TimeNS {
			m.ot[d] = append(m.ot[d], t-m.delayNS[d])
			for s := range nSignals {
				if m.src[s].driver == d {
					m.ov[d][s] = append(m.ov[d][s], b.Values[m.src[s].channel][i])
				}
			}
		}
	}
	return m.drain()
}

func (m *merger) drain() reduce.Curve {
	m.out.TimeS = m.out.TimeS[:0]
	for s := range nSignals {
		col := m.column(s)
		*col = (*col)[:0]
	}
	single := true
	for s := range nSignals {
		if m.src[s].driver >= 0 && m.src[s].driver != m.master {
			single = false
		}
	}
	n := len(m.pt)
	if !single {
		n = m.ready()
	}
	for i := 0; i < n; i++ {
		t := m.pt[i]
		m.out.TimeS = append(m.out.TimeS, float64(t-m.epochNS)/1e9)
		for s := range nSignals {
			src := m.src[s]
			if src.driver < 0 {
				continue
			}
			col := m.column(s)
			if src.driver == m.master {
				*col = append(*col, m.pv[s][i])
				continue
			}
			*col = append(*col, m.interp(src.driver, s, t))
		}
	}
	// Drop emitted master samples and other drivers' samples no longer needed.
	m.pt = append(m.pt[:0], m.pt[n:]...)
	for s := range nSignals {
		m.pv[s] = append(m.pv[s][:0], m.pv[s][n:]...)
	}
	if !single {
		m.trim()
	}
	out := m.out
	for s := range nSignals {
		if m.src[s].driver < 0 {
			*m.column(s) = nil
		}
	}
	out.ForceN, out.ExtensionMM, out.CrossheadMM = m.out.ForceN, m.out.ExtensionMM, m.out.CrossheadMM
	return out
}

// ready counts the pending master samples every other driver has reached,
// or has fallen so far behind that it counts as stalled.
func (m *merger) ready() int {
	if len(m.pt) == 0 {
		return 0
	}
	newest := m.pt[len(m.pt)-1]
	n := len(m.pt)
	for d := range m.ot {
		if d == m.master || !m.feeds(d) {
			continue
		}
		last := int64(math.MinInt64)
		if k := len(m.ot[d]); k > 0 {
			last = m.ot[d][k-1]
		}
		m.stalled[d] = last == math.MinInt64 && newest-m.pt[0] > m.stallNS || last != math.MinInt64 && newest-last > m.stallNS
		if m.stalled[d] {
			continue // emit with NaN rather than wait forever
		}
		k := 0
		for k < n && m.pt[k] <= last {
			k++
		}
		n = k
	}
	return n
}

func (m *merger) feeds(d int) bool {
	for _, s := range m.src {
		if s.driver == d {
			return true
		}
	}
	return false
}

// interp is driver d's signal s at time t, or NaN when d has no reading
// bracketing t.
func (m *merger) interp(d, s int, t int64) float64 {
	ts, vs := m.ot[d], m.ov[d][s]
	// binary search for the first time >= t
	lo, hi := 0, len(ts)
	for lo < hi {
		mid := (lo + hi) / 2
		if ts[mid] < t {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	switch {
	case lo == len(ts):
		return math.NaN() // stalled: no reading at or after t
	case ts[lo] == t:
		return vs[lo]
	case lo == 0:
		return math.NaN() // nothing before t
	}
	t0, t1 := ts[lo-1], ts[lo]
	if t1-t0 > m.stallNS {
		return math.NaN() // a gap in that driver: do not bridge it
	}
	f := float64(t-t0) / float64(t1-t0)
	return vs[lo-1] + f*(vs[lo]-vs[lo-1])
}

// trim drops buffered samples of other drivers that lie before the oldest
// pending master instant, keeping one to interpolate from.
func (m *merger) trim() {
	oldest := int64(math.MaxInt64)
	if len(m.pt) > 0 {
		oldest = m.pt[0]
	}
	for d := range m.ot {
		ts := m.ot[d]
		k := 0
		for k+1 < len(ts) && ts[k+1] <= oldest {
			k++
		}
		if k == 0 {
			continue
		}
		m.ot[d] = append(ts[:0], ts[k:]...)
		for s := range nSignals {
			if m.ov[d][s] != nil {
				m.ov[d][s] = append(m.ov[d][s][:0], m.ov[d][s][k:]...)
			}
		}
	}
}

func (m *merger) column(s int) *[]float64 {
	switch s {
	case sigForce:
		return &m.out.ForceN
	case sigExtension:
		return &m.out.ExtensionMM
	}
	return &m.out.CrossheadMM
}

// stalledDrivers lists the drivers currently treated as stalled.
func (m *merger) stalledDrivers() []int {
	var out []int
	for d, s := range m.stalled {
		if s {
			out = append(out, d)
		}
	}
	return out
}
