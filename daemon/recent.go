package daemon

import (
	"math"
	"sync"
)

// recentSize is how many of the latest raw force readings are kept for
// tare, span and verification reads (10 s at 1 kHz).
const recentSize = 10000

// recentReadings keeps the latest raw (uncalibrated) force readings so the
// operator's tools can read the frame without interrupting acquisition.
type recentReadings struct {
	mu    sync.Mutex
	buf   [recentSize]float64
	n     int // total written
	stamp uint64
}

func (r *recentReadings) add(col []float64) {
	if col == nil {
		return
	}
	r.mu.Lock()
	for _, v := range col {
		r.buf[r.n%recentSize] = v
		r.n++
	}
	r.mu.Unlock()
}

// stats returns the mean and standard deviation of the last k readings
// (NaN skipped) and how many were used.
func (r *recentReadings) stats(k int) (mean, sd float64, used int) {
	r.mu.Lock()
	defer r.mu.Unlock()
	k = min(k, r.n, recentSize)
	var sum, sum2 float64
	for i := 0; i < k; i++ {
		v := r.buf[(r.n-1-i)%recentSize]
		if math.IsNaN(v) {
			continue
		}
		sum += v
		sum2 += v * v
		used++
	}
	if used == 0 {
		return math.NaN(), math.NaN(), 0
	}
	mean = sum / float64(used)
	if used > 1 {
		sd = math.Sqrt(math.Max(0, (sum2-float64(used)*mean*mean)/float64(used-1)))
	}
	return mean, sd, used
}

// count is the number of readings seen so far.
func (r *recentReadings) count() int {
	r.mu.Lock()
	defer r.mu.Unlock()
	return r.n
}

// last copies the latest k raw readings, oldest first.
func (r *recentReadings) last(k int) []float64 {
	r.mu.Lock()
	defer r.mu.Unlock()
	k = min(k, r.n, recentSize)
	out := make([]float64, k)
	for i := 0; i < k; i++ {
		out[k-1-i] = r.buf[(r.n-1-i)%recentSize]
	}
	return out
}
