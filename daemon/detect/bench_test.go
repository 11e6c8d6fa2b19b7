package detect

import (
	"testing"

	"framed/daemon/detect/detectgen"
	"framed/reduce"
)

// benchStep feeds c in 100-sample batches over and over, resetting at the
// end of each pass, and reports the cost per sample.
func benchStep(b *testing.B, c reduce.Curve) {
	d, err := New(Config{ForceRangeN: 1000})
	if err != nil {
		b.Fatal(err)
	}
	const batch = 100
	b.ReportAllocs()
	b.ResetTimer()
	samples := 0
	i := 0
	for b.Loop() {
		if i >= c.Len() || d.State() == Ended {
			d.Reset()
			i = 0
		}
		j := min(i+batch, c.Len())
		d.Step(c.Slice(i, j))
		samples += j - i
		i = j
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(samples), "ns/sample")
}

// BenchmarkStep runs the whole stepped wire test at 1 kHz: idle, swings,
// holds, unloads, the break. Target: well under 100 ns/sample.
func BenchmarkStep(b *testing.B) {
	c, _ := detectgen.Wire(1000, 1).Generate()
	benchStep(b, c)
}

// steadyHold is 60 s of a settled 300 N hold at 1 kHz, after its start.
func steadyHold() (warm, steady reduce.Curve) {
	g := detectgen.Wire(1000, 3)
	g.Levels = []detectgen.Level{{ForceN: 300, HoldS: 70}}
	g.Break = false
	c, _ := g.Generate()
	cut := int((g.IdleS + 10) * g.RateHz)
	return c.Slice(0, cut), c.Slice(cut, c.Len())
}

// BenchmarkStepSteady is the cost during a long hold, the daemon's usual
// state: no events, so no allocations.
func BenchmarkStepSteady(b *testing.B) {
	warm, steady := steadyHold()
	d, err := New(Config{ForceRangeN: 1000})
	if err != nil {
		b.Fatal(err)
	}
	d.Step(warm)
	b.ReportAllocs()
	samples, i := 0, 0
	for b.Loop() {
		if i+100 > steady.Len() {
			i = 0
		}
		d.Step(steady.Slice(i, i+100))
		samples += 100
		i += 100
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(samples), "ns/sample")
}

// TestStepSteadyStateAllocatesNothing: once a hold is being followed, Step
// allocates nothing (the emissions slice is reused).
func TestStepSteadyStateAllocatesNothing(t *testing.T) {
	warm, steady := steadyHold()
	d, err := New(Config{ForceRangeN: 1000})
	if err != nil {
		t.Fatal(err)
	}
	d.Step(warm)
	if len(d.Detected().Holds) != 1 {
		t.Fatalf("warm-up did not settle the hold: %+v", d.Detected())
	}
	i := 0
	allocs := testing.AllocsPerRun(200, func() {
		d.Step(steady.Slice(i, i+100))
		i += 100
	})
	if allocs != 0 {
		t.Errorf("%.1f allocations per Step in a steady hold, want 0", allocs)
	}
}

// BenchmarkStepIdle is the cost between tests, watching the frame at rest
// (learning the noise, waiting for a start): the daemon's usual state.
func BenchmarkStepIdle(b *testing.B) {
	g := detectgen.Wire(1000, 4)
	g.IdleS = 120
	c, _ := g.Generate()
	idle := c.Slice(0, int(110*g.RateHz))
	d, err := New(Config{ForceRangeN: 1000})
	if err != nil {
		b.Fatal(err)
	}
	d.Step(idle.Slice(0, 10000)) // past the filling of the noise estimate
	b.ReportAllocs()
	samples, i := 0, 10000
	for b.Loop() {
		if i+100 > idle.Len() {
			i = 10000
		}
		d.Step(idle.Slice(i, i+100))
		samples += 100
		i += 100
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(samples), "ns/sample")
	if d.State() != Idle {
		b.Fatalf("started at rest: %v", d.State())
	}
}
