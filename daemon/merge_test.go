package daemon

import (
	"math"
	"testing"

	"framed/drivers"
)

// batchAt builds a one-channel batch of a linear signal v = a + b*t(s).
func linearBatch(t0NS, stepNS int64, n int, a, b float64) drivers.Batch {
	bt := drivers.Batch{TimeNS: make([]int64, n), Values: [][]float64{make([]float64, n)}}
	for i := range n {
		t := t0NS + int64(i)*stepNS
		bt.TimeNS[i] = t
		bt.Values[0][i] = a + b*float64(t)/1e9
	}
	return bt
}

// Linear interpolation reproduces a linear signal exactly (a mathematical
// fact), so merging a 100 Hz force driver with a 1 kHz extension driver must
// give the extension line's own values at the force driver's instants.
func TestMergerInterpolatesAtSlowerInstants(t *testing.T) {
	src := [nSignals]source{{0, 0}, {1, 0}, {-1, -1}}
	m := newMerger(0, src, []float64{100, 1000}, []float64{0, 0}, 500e6)
	if m.master != 0 {
		t.Fatalf("master = %d, want the slower driver 0", m.master)
	}
	var got []float64
	var times []float64
	// extension: 1 kHz, v = 2 + 3 t; force: 100 Hz, v = 10 t
	for k := range 10 {
		ext := linearBatch(int64(k)*100e6, 1e6, 100, 2, 3)
		out := m.push(1, &ext)
		got = append(got, out.ExtensionMM...)
		times = append(times, out.TimeS...)
		f := linearBatch(int64(k)*100e6, 10e6, 10, 0, 10)
		out = m.push(0, &f)
		got = append(got, out.ExtensionMM...)
		times = append(times, out.TimeS...)
	}
	if len(got) < 90 {
		t.Fatalf("only %d merged samples", len(got))
	}
	for i, v := range got {
		want := 2 + 3*times[i]
		if math.Abs(v-want) > 1e-9 {
			t.Fatalf("sample %d at %.3f s: extension %v, want %v", i, times[i], v, want)
		}
	}
}

// A delay is taken off before merging: a driver 20 ms late reports at
// t+20ms what happened at t.
func TestMergerTransportDelay(t *testing.T) {
	src := [nSignals]source{{0, 0}, {1, 0}, {-1, -1}}
	m := newMerger(0, src, []float64{100, 1000}, []float64{0, 20}, 500e6)
	var got, times []float64
	for k := range 5 {
		ext := linearBatch(int64(k)*100e6+20e6, 1e6, 100, 0, 1) // v = t - 0.02 at time t
		m.push(1, &ext)
		f := linearBatch(int64(k)*100e6, 10e6, 10, 0, 0)
		out := m.push(0, &f)
		got = append(got, out.ExtensionMM...)
		times = append(times, out.TimeS...)
	}
	for i, v := range got {
		if math.IsNaN(v) {
			continue // before the first delayed sample
		}
		if want := times[i]; math.Abs(v-want) > 1e-9 {
			t.Fatalf("at %.3f s: %v, want %v", times[i], v, want)
		}
	}
}

// A driver that stops reporting is flagged and its signal becomes NaN
// rather than being held at its last value.
func TestMergerStalledChannelIsNaN(t *testing.T) {
	src := [nSignals]source{{0, 0}, {1, 0}, {-1, -1}}
	m := newMerger(0, src, []float64{100, 1000}, []float64{0, 0}, 200e6)
	ext := linearBatch(0, 1e6, 100, 5, 0) // reports until 99 ms, then stops
	m.push(1, &ext)
	var got []float64
	for k := range 10 {
		f := linearBatch(int64(k)*100e6, 10e6, 10, 0, 0)
		out := m.push(0, &f)
		got = append(got, out.ExtensionMM...)
	}
	if len(m.stalledDrivers()) != 1 {
		t.Fatalf("stalled drivers %v, want [1]", m.stalledDrivers())
	}
	if len(got) == 0 || !math.IsNaN(got[len(got)-1]) {
		t.Fatalf("last merged extension %v, want NaN after the stall", got[len(got)-1])
	}
	for _, v := range got {
		if !math.IsNaN(v) && v != 5 {
			t.Fatalf("extension %v: neither the reported 5 nor NaN", v)
		}
	}
}

func TestMergerSingleDriverPassesThrough(t *testing.T) {
	src := [nSignals]source{{0, 0}, {0, 1}, {-1, -1}}
	m := newMerger(1e9, src, []float64{1000}, []float64{0}, 500e6)
	b := drivers.Batch{TimeNS: []int64{1e9, 1e9 + 1e6}, Values: [][]float64{{1, 2}, {3, 4}}}
	out := m.push(0, &b)
	if out.Len() != 2 || out.TimeS[1] != 0.001 || out.ForceN[1] != 2 || out.ExtensionMM[0] != 3 || out.CrossheadMM != nil {
		t.Fatalf("passthrough = %+v", out)
	}
}
