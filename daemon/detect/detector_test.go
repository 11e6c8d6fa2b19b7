package detect

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"framed/daemon/detect/detectgen"
	"framed/reduce"
)

// synth builds a curve at rateHz from a force function of time, with
// Gaussian noise; ext and xh (nil for none) likewise.
func synth(rateHz, durS, noiseN float64, f, ext, xh func(tS float64) float64) reduce.Curve {
	r := rand.New(rand.NewPCG(1, 2))
	n := int(durS * rateHz)
	c := reduce.Curve{TimeS: make([]float64, n), ForceN: make([]float64, n)}
	if ext != nil {
		c.ExtensionMM = make([]float64, n)
	}
	if xh != nil {
		c.CrossheadMM = make([]float64, n)
	}
	for i := range n {
		t := float64(i) / rateHz
		c.TimeS[i] = t
		c.ForceN[i] = f(t) + noiseN*r.NormFloat64()
		if ext != nil {
			c.ExtensionMM[i] = ext(t)
		}
		if xh != nil {
			c.CrossheadMM[i] = xh(t)
		}
	}
	return c
}

func eventKinds(d reduce.Detected) []string {
	var k []string
	for _, e := range d.Events {
		k = append(k, e.Kind)
	}
	return k
}

func TestSpikeNeitherStartsNorBreaks(t *testing.T) {
	// Idle with one wild reading (a knock on the frame, a glitch on the
	// serial line): no start.
	c := synth(100, 5, 0.05, func(float64) float64 { return 0 }, nil, nil)
	c.ForceN[200] = 500
	if got := Offline(c, Config{ForceRangeN: 1000}); len(got.Events) != 0 {
		t.Errorf("idle with a spike: events %v", got.Events)
	}
	// A test held at 600 N with one reading dropping to zero: no break.
	c = synth(100, 20, 0.05, func(t float64) float64 { return math.Min(600, math.Max(0, (t-1)*300)) }, nil, nil)
	c.ForceN[1500] = 0
	if got := Offline(c, Config{ForceRangeN: 1000}); slices.Contains(eventKinds(got), reduce.EventBreak) {
		t.Errorf("single low reading taken for a break: %v", got.Events)
	}
}

func TestUntaredForceFlagged(t *testing.T) {
	ramp := func(off float64) func(float64) float64 {
		return func(t float64) float64 { return off + math.Max(0, (t-2)*100) }
	}
	got := Offline(synth(100, 6, 0.05, ramp(40), nil, nil), Config{ForceRangeN: 1000})
	if !slices.Contains(got.Flags, FlagForceNotTared) {
		t.Errorf("40 N at rest on a 1 kN cell not flagged: %v", got.Flags)
	}
	got = Offline(synth(100, 6, 0.05, ramp(0.5), nil, nil), Config{ForceRangeN: 1000})
	if slices.Contains(got.Flags, FlagForceNotTared) {
		t.Errorf("0.5 N at rest flagged: %v", got.Flags)
	}
	if len(got.Events) == 0 || got.Events[0].Kind != reduce.EventStart || math.Abs(got.Events[0].TimeS-2) > 0.05 {
		t.Errorf("start %+v, want at 2 s where the ramp begins", got.Events)
	}
}

func TestStartDatedBackAtMostPreTrigger(t *testing.T) {
	// A ramp so slow that it leaves the noise 8 s before it crosses the
	// threshold: the start goes back no further than PreTriggerS.
	c := synth(50, 20, 0.01, func(t float64) float64 { return math.Max(0, (t-1)*1.0) }, nil, nil)
	d, err := New(Config{ForceRangeN: 1000, PreTriggerS: 2})
	if err != nil {
		t.Fatal(err)
	}
	ems := d.Step(c)
	if len(ems) == 0 || ems[0].Event.Kind != reduce.EventStart {
		t.Fatalf("no start: %+v", ems)
	}
	if s := d.StartTimeS(); s < ems[0].ProvedAtS-2-1e-9 || s != ems[0].Event.TimeS {
		t.Errorf("start %.3f s, proved %.3f s: further back than PreTriggerS", s, ems[0].ProvedAtS)
	}
}

func TestBadInputDoesNotPanic(t *testing.T) {
	d, err := New(Config{ForceRangeN: 1000})
	if err != nil {
		t.Fatal(err)
	}
	nan := math.NaN()
	d.Step(reduce.Curve{})
	d.Step(reduce.Curve{TimeS: []float64{0, 1, 2}})                                           // no force column
	d.Step(reduce.Curve{TimeS: []float64{3, 4}, ForceN: []float64{nan, math.Inf(1)}})         // no readings
	d.Step(reduce.Curve{TimeS: []float64{5, 6, 7}, ForceN: []float64{1, 2}})                  // ragged
	d.Step(reduce.Curve{TimeS: []float64{8, 7, nan}, ForceN: []float64{1, 2, 3}})             // time backwards, NaN time
	d.Step(reduce.Curve{TimeS: []float64{9}, ForceN: []float64{0}, ExtensionMM: []float64{}}) // short extension
	if d.State() != Idle {
		t.Errorf("state %v after junk, want idle", d.State())
	}
	got := Offline(reduce.Curve{TimeS: []float64{0, 1}, ForceN: []float64{0}}, Config{})
	if !slices.Contains(got.Flags, FlagDetectBadConfig) {
		t.Errorf("Offline on a curve without force: flags %v", got.Flags)
	}
}

// TestUnloadHeldAtZeroEnds: a weight hung and taken off again, the hanger
// left alone: an unload, and the test ends EndHoldS after the force came
// back to rest.
func TestUnloadHeldAtZeroEnds(t *testing.T) {
	g := detectgen.Wire(100, 7)
	g.Levels = []detectgen.Level{{ForceN: 200, HoldS: 10}, {ForceN: 0, HoldS: 45}}
	g.Break = false
	c, tr := g.Generate()
	d, err := New(Config{ForceRangeN: 1000, EndHoldS: 30})
	if err != nil {
		t.Fatal(err)
	}
	d.Step(c)
	got := d.Detected()
	want := []string{reduce.EventStart, reduce.EventHold, reduce.EventUnload, reduce.EventEnd}
	if !slices.Equal(eventKinds(got), want) {
		t.Fatalf("events %v, want %v", eventKinds(got), want)
	}
	end := got.Events[3].TimeS
	if back := g.IdleS + 10 + g.ChangeS; end < back+30 || end > tr.Unloads[0].SettleS+31.5 {
		t.Errorf("ended at %.2f s, want 30 s after the rest began (weights off at %.2f s)", end, back)
	}
	if d.State() != Ended {
		t.Errorf("state %v", d.State())
	}
	// Ended ignores samples; Reset arms for the next test.
	if ems := d.Step(c); len(ems) != 0 {
		t.Errorf("ended detector emitted %+v", ems)
	}
	d.Reset()
	if d.State() != Idle || len(d.Detected().Events) != 0 {
		t.Errorf("after Reset: %v %+v", d.State(), d.Detected())
	}
	d.Step(c)
	if len(d.Detected().Events) != 4 {
		t.Errorf("second run after Reset: %v", eventKinds(d.Detected()))
	}
}

// TestRelaxationAtStoppedCrosshead: a machine pulls to 8 kN and stops its
// crosshead; the force relaxes, fast at first (force falling at fixed
// position is relaxation: common practice). One hold, with a negative
// relaxation rate, and no creep as the extension stands still.
func TestRelaxationAtStoppedCrosshead(t *testing.T) {
	const stopS = 10.0
	f := func(t float64) float64 {
		switch {
		case t < 2:
			return 0
		case t < stopS:
			return (t - 2) * 1000
		}
		return 8000 - 150*(1-math.Exp(-(t-stopS)/3)) - 2*(t-stopS)
	}
	xh := func(t float64) float64 { return math.Max(0, math.Min(t, stopS)-2) * 0.05 }
	ext := func(t float64) float64 { return f(t) / 20000 }
	c := synth(200, 40, 0.2, f, ext, xh)
	got := Offline(c, Config{ForceRangeN: 10000})
	if len(got.Holds) != 1 {
		t.Fatalf("holds %+v, want one", got.Holds)
	}
	h := got.Holds[0]
	if h.SettledS < stopS || h.RelaxationNPerS >= -1 || math.Abs(h.CreepMMPerS) > 1e-3 {
		t.Errorf("hold %+v: want settled after %.0f s, relaxing (< -1 N/s), no creep", h, stopS)
	}
	if slices.Contains(eventKinds(got), reduce.EventBreak) {
		t.Errorf("relaxation taken for a break: %v", got.Events)
	}
}

// TestHandUnloadIsNotABreak: the operator runs a screw frame back from
// 5 kN to nothing in 0.3 s; crosshead and extension spring back with the
// force. That is an unload, not a break, even at 10 readings per second.
func TestHandUnloadIsNotABreak(t *testing.T) {
	for _, rate := range []float64{10, 1000} {
		f := func(t float64) float64 {
			switch {
			case t < 2:
				return 0
			case t < 7:
				return (t - 2) * 1000
			case t < 7.3:
				return 5000 * (7.3 - t) / 0.3
			}
			return 0
		}
		xh := func(t float64) float64 { return f(t) / 5000 }
		c := synth(rate, 12, 0.2, f, xh, xh)
		got := Offline(c, Config{ForceRangeN: 10000})
		want := []string{reduce.EventStart, reduce.EventUnload}
		if !slices.Equal(eventKinds(got), want) {
			t.Errorf("%g Hz: events %v, want %v", rate, eventKinds(got), want)
		}
	}
}

// TestHangerWeight: the cell was tared without the hanger, which is hung
// (20 N) before the first weight. With HangerN the returns to the hanger
// alone are unloads, and the bracket is in the channel's readings.
func TestHangerWeight(t *testing.T) {
	c, _ := detectgen.Wire(50, 4).Generate()
	const hangerN, hungS = 20.0, 1.5
	for i, ts := range c.TimeS {
		if ts >= hungS {
			c.ForceN[i] += hangerN
		}
	}
	got := Offline(c, Config{ForceRangeN: 1000, HangerN: hangerN})
	want := "start hold hold unload hold hold unload hold unload hold hold hold break end"
	if k := strings.Join(eventKinds(got), " "); k != want {
		t.Fatalf("events %q, want %q", k, want)
	}
	if got.Events[0].TimeS > hungS+0.05 {
		t.Errorf("start %.2f s, want when the hanger went on (%.1f s)", got.Events[0].TimeS, hungS)
	}
	el := got.ElasticLimit
	if el == nil || el.NoSetUpToN == nil || el.SetFromN == nil ||
		math.Abs(*el.NoSetUpToN-420) > 0.5 || math.Abs(*el.SetFromN-520) > 0.5 {
		t.Errorf("elastic limit %+v, want 420..520 N as read (400..500 N of weights on a 20 N hanger)", el)
	}
	// Without HangerN the hanger alone looks like a load: no unloads.
	if got := Offline(c, Config{ForceRangeN: 1000}); len(got.Unloads) != 0 {
		t.Errorf("unloads %+v without HangerN", got.Unloads)
	}
}

// TestHangerAloneDoesNotEnd: hanging the empty hanger starts the test;
// leaving it alone longer than EndHoldS before the first weight goes on
// must not end it.
func TestHangerAloneDoesNotEnd(t *testing.T) {
	f := func(t float64) float64 {
		switch {
		case t < 2:
			return 0
		case t < 50:
			return 20
		}
		return 220
	}
	got := Offline(synth(50, 70, 0.02, f, nil, nil), Config{ForceRangeN: 1000, EndHoldS: 30, HangerN: 20})
	if k := strings.Join(eventKinds(got), " "); k != "start hold" {
		t.Errorf("events %q, want the start and the hold under the first weight", k)
	}
}

// TestCoarseResolution: a weighing indicator showing whole newtons, its
// idle reading a flat zero; a load exactly between two digits flickers
// between them. The holds must still be found: the noise floor is never
// taken below half the resolution seen.
func TestCoarseResolution(t *testing.T) {
	g := detectgen.Wire(20, 6)
	g.Sensor = detectgen.Sensor{ForceNoiseN: 0.1, ForceStepN: 1, ExtNoiseMM: 0.0005, ExtStepMM: 0.0001}
	for i := range g.Levels {
		if g.Levels[i].ForceN > 0 {
			g.Levels[i].ForceN += 0.5
		}
	}
	c, tr := g.Generate()
	got := Offline(c, Config{ForceRangeN: 1000})
	if len(got.Holds) != len(tr.Holds) {
		t.Fatalf("%d holds, want %d: %+v", len(got.Holds), len(tr.Holds), got.Holds)
	}
	for i, h := range got.Holds {
		if math.Abs(h.ForceN-tr.Holds[i].ForceN) > 0.5 {
			t.Errorf("hold %d at %.2f N, want %.1f within the half digit", i, h.ForceN, tr.Holds[i].ForceN)
		}
	}
}
