package reduce_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"framed/reduce"
)

// curve6M is a 10 kHz, 10-minute test: 6 million samples on three channels
// (force, extension, crosshead), a Ramberg-Osgood steel with noise, the
// extensometer removed at 4 % and a break at the end.
func curve6M() reduce.Curve {
	const n = 6_000_000
	c := reduce.Curve{
		TimeS: make([]float64, n), ForceN: make([]float64, n),
		ExtensionMM: make([]float64, n), CrossheadMM: make([]float64, n),
	}
	rng := rand.New(rand.NewPCG(9, 9))
	const eMPa, rp, m, s0, le = 205000.0, 370.0, 19.6, 78.54, 50.0
	// Invert eps(s) along the curve by stepping the stress: cheap and
	// monotone (no root finding per sample).
	s := 0.0
	for i := 0; i < n; i++ {
		e := 0.2 * float64(i) / n
		for s/eMPa+0.002*math.Pow(s/rp, m) < e {
			s += 0.01
		}
		c.TimeS[i] = float64(i) / 10000
		c.ForceN[i] = s*s0 + 2*rng.NormFloat64()
		x := e * le
		c.CrossheadMM[i] = 1.2 * x
		if e > 0.04 {
			x = math.NaN()
		} else {
			x += 0.0002 * rng.NormFloat64()
		}
		c.ExtensionMM[i] = x
	}
	for i := n - 10; i < n; i++ {
		c.ForceN[i] = 10
	}
	return c
}

// BenchmarkReduce6M reduces a 6-million-sample test. The target is no more
// than twice one sequential read of the same samples from the raw store
// (measured with the store); BenchmarkSequentialPass6M is the in-memory
// floor for comparison.
func BenchmarkReduce6M(b *testing.B) {
	c := curve6M()
	sp := reduce.Specimen{S0MM2: 78.54, L0MM: 50}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := reduce.Reduce(c, sp, reduce.Detected{}, reduce.Options{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/6e6, "ns/sample")
}

// BenchmarkSequentialPass6M touches every value of the same samples once:
// the cost of any O(n) pass, as a yardstick for BenchmarkReduce6M.
func BenchmarkSequentialPass6M(b *testing.B) {
	c := curve6M()
	b.ResetTimer()
	var sum float64
	for range b.N {
		for i := range c.TimeS {
			sum += c.TimeS[i] + c.ForceN[i] + c.ExtensionMM[i] + c.CrossheadMM[i]
		}
	}
	if sum == 1 {
		b.Log(sum)
	}
}
