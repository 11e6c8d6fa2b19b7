package detect

import "math"

// maxQueue keeps the running maximum of a value over a sliding time
// window as a monotonic queue: amortised O(1) per sample and no
// allocation after init. If the ring fills, the oldest entries go and the
// window only gets shorter.
type maxQueue struct {
	t, v    []float64
	head, n int
	mask    int
}

// init sizes the ring; capacity must be a power of two.
func (q *maxQueue) init(capacity int) {
	q.t, q.v = make([]float64, capacity), make([]float64, capacity)
	q.mask = capacity - 1
}

func (q *maxQueue) reset() { q.head, q.n = 0, 0 }

func (q *maxQueue) idx(i int) int { return (q.head + i) & q.mask }

// push adds a reading; NaN readings are not pushed (no reading).
func (q *maxQueue) push(tS, v float64) {
	if v != v {
		return
	}
	for q.n > 0 && q.v[q.idx(q.n-1)] <= v {
		q.n--
	}
	if q.n == len(q.t) {
		q.head = q.idx(1)
		q.n--
	}
	j := q.idx(q.n)
	q.t[j], q.v[j] = tS, v
	q.n++
}

// dropBefore forgets readings older than tS.
func (q *maxQueue) dropBefore(tS float64) {
	for q.n > 0 && q.t[q.head] < tS {
		q.head = q.idx(1)
		q.n--
	}
}

// at returns the i-th entry from the oldest: the maximum is at 0, later
// entries are the maxima of ever later parts of the window.
func (q *maxQueue) at(i int) (tS, v float64) {
	j := q.idx(i)
	return q.t[j], q.v[j]
}

// recentRing keeps the last readings (a power-of-two count) for searches
// that are needed only rarely.
type recentRing struct {
	s       []sample
	next, n int
	mask    int
}

func (r *recentRing) init(capacity int) {
	r.s = make([]sample, capacity)
	r.mask = capacity - 1
}

func (r *recentRing) reset() { r.next, r.n = 0, 0 }

func (r *recentRing) push(s sample) {
	r.s[r.next] = s
	r.next = (r.next + 1) & r.mask
	if r.n < len(r.s) {
		r.n++
	}
}

// firstDispSince is the oldest extension (ext true) or crosshead reading
// kept at or after fromS; NaN when there is none.
func (r *recentRing) firstDispSince(fromS float64, ext bool) float64 {
	first := math.NaN()
	for i := 1; i <= r.n; i++ {
		s := &r.s[(r.next-i)&r.mask]
		if s.t < fromS {
			break
		}
		first = s.xh
		if ext {
			first = s.ext
		}
	}
	return first
}

// maxDispSince is the highest extension (ext true) or crosshead reading
// kept at or after fromS; -Inf when there is none.
func (r *recentRing) maxDispSince(fromS float64, ext bool) float64 {
	top := math.Inf(-1)
	for i := 1; i <= r.n; i++ {
		s := &r.s[(r.next-i)&r.mask]
		if s.t < fromS {
			break
		}
		v := s.xh
		if ext {
			v = s.ext
		}
		if v > top {
			top = v
		}
	}
	return top
}
