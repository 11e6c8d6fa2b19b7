package detect

import (
	"math"
	"reflect"
	"testing"

	"pgregory.net/rapid"

	"framed/daemon/detect/detectgen"
	"framed/reduce"
)

// Property tests over generated curves. The default 100 cases per property
// keep the suite short; run a longer campaign with
//
//	go test ./daemon/detect -run Property -rapid.checks=2000

// logRange draws log-uniformly, as sample rates and noise spread over
// decades.
func logRange(t *rapid.T, lo, hi float64, label string) float64 {
	return math.Exp(rapid.Float64Range(math.Log(lo), math.Log(hi)).Draw(t, label))
}

// bridgeNoise draws the force noise and resolution of a cheap 24-bit
// bridge board: 14 to 18 noise-free bits of the range (from memory, the
// spread of such boards with the load cells they are sold with).
func bridgeNoise(t *rapid.T, rangeN float64) detectgen.Sensor {
	s := detectgen.BridgeBoard(rangeN)
	s.ForceNoiseN = rangeN * logRange(t, 4e-6, 6e-5, "noise_fraction")
	s.ForceStepN = rangeN / math.Exp2(float64(rapid.IntRange(16, 22).Draw(t, "bits")))
	return s
}

// idleS draws the time at rest before the test: at least 30 readings,
// from which the detector learns the noise. The daemon watches the idle
// frame between tests; curves that start loading at once are covered by
// the reference-curve test.
func idleS(t *rapid.T, rateHz float64) float64 {
	return rapid.Float64Range(math.Max(0.5, 30/rateHz), 3.5).Draw(t, "idle_s")
}

// runBatches feeds c in batches of the given size, collecting emissions.
func runBatches(t *rapid.T, cfg Config, c reduce.Curve, batch int) ([]Emission, reduce.Detected) {
	d, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	var ems []Emission
	for i := 0; i < c.Len() && d.State() != Ended; i += batch {
		ems = append(ems, d.Step(c.Slice(i, min(i+batch, c.Len())))...)
	}
	return ems, d.Detected()
}

func kinds(ems []Emission, kind string) []Emission {
	var out []Emission
	for _, e := range ems {
		if e.Event.Kind == kind {
			out = append(out, e)
		}
	}
	return out
}

// TestPropertyContinuous: in a continuous crosshead-driven test, with or
// without an upper yield point, with serrated flow, noise and
// quantisation, at 10 Hz to 5 kHz, with or without a crosshead reading: one start, never a false break before
// fracture, the true break proved within 100 ms of the fracture sample,
// no holds or unloads, and the same result whatever the batch size.
func TestPropertyContinuous(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		rateHz := logRange(t, 10, 5000, "rate_hz")
		rangeN := rapid.SampledFrom([]float64{1000, 5000, 20000, 100000}).Draw(t, "range_N")
		maxN := rangeN * rapid.Float64Range(0.3, 0.95).Draw(t, "max_fraction")
		yieldN := maxN * rapid.Float64Range(0.55, 0.9).Draw(t, "yield_fraction")
		g := detectgen.Continuous{
			RateHz:           rateHz,
			IdleS:            idleS(t, rateHz),
			StiffnessNPerMM:  yieldN / rapid.Float64Range(0.05, 0.5).Draw(t, "yield_ext_mm"),
			YieldN:           yieldN,
			MaxN:             maxN,
			FractureFraction: rapid.Float64Range(0.6, 0.95).Draw(t, "fracture_fraction"),
			Break:            rapid.Bool().Draw(t, "break"),
			AfterBreakS:      0.5,
			DurationS:        math.Min(rapid.Float64Range(8, 40).Draw(t, "duration_s"), 150000/rateHz),
			Sensor:           bridgeNoise(t, rangeN),
			Seed:             rapid.Uint64().Draw(t, "seed"),
		}
		if rapid.Bool().Draw(t, "upper_yield") {
			// Upper yield points a few to about ten per cent above the
			// lower one (common practice for mild steel).
			g.UpperYieldFraction = rapid.Float64Range(0.02, 0.12).Draw(t, "upper_yield_fraction")
		}
		if rapid.Bool().Draw(t, "serrated") {
			// Serrations of a few per cent of the force (common practice
			// for dynamic strain ageing).
			g.SerrationFraction = rapid.Float64Range(0.005, 0.05).Draw(t, "serration_fraction")
			g.SerrationPeriodS = rapid.Float64Range(0.1, 2).Draw(t, "serration_period_s")
		}
		c, tr := g.Generate()
		if !rapid.Bool().Draw(t, "crosshead_read") {
			c.CrossheadMM = nil // a retrofit with only a load cell and an extensometer
		}
		cfg := Config{ForceRangeN: rangeN}
		ems, got := runBatches(t, cfg, c, rapid.IntRange(1, 700).Draw(t, "batch"))

		starts := kinds(ems, reduce.EventStart)
		if len(starts) != 1 {
			t.Fatalf("starts %+v, want one", starts)
		}
		dt := 1 / rateHz
		if s := starts[0].Event.TimeS; s < tr.StartS-math.Max(5*dt, 0.05)-1e-9 || s > starts[0].ProvedAtS {
			t.Fatalf("start dated %.4f s, loading began %.4f s, proved %.4f s", s, tr.StartS, starts[0].ProvedAtS)
		}
		breaks := kinds(ems, reduce.EventBreak)
		for _, b := range breaks {
			if !g.Break || b.ProvedAtS < tr.FractureS {
				t.Fatalf("false break %+v (fracture at %.4f s)", b, tr.FractureS)
			}
		}
		if g.Break {
			if len(breaks) != 1 {
				t.Fatalf("breaks %+v, want the one at %.4f s", breaks, tr.FractureS)
			}
			if lat := breaks[0].ProvedAtS - tr.FractureS; lat > 0.1+1e-9 {
				t.Fatalf("break proved %.4f s after the fracture sample, want within 0.1 s", lat)
			}
			if at := breaks[0].Event.TimeS; at > tr.FractureS || at < tr.FractureS-math.Max(0.1, 3*dt) {
				t.Fatalf("break dated %.4f s, fracture sample %.4f s", at, tr.FractureS)
			}
			if len(kinds(ems, reduce.EventEnd)) != 1 {
				t.Fatalf("no end after the break: %+v", ems)
			}
		}
		if len(got.Holds) != 0 || len(got.Unloads) != 0 {
			t.Fatalf("holds %+v unloads %+v in a continuous test", got.Holds, got.Unloads)
		}
		_, again := runBatches(t, cfg, c, c.Len())
		if !reflect.DeepEqual(got, again) {
			t.Fatalf("batching changed the result:\n%+v\n%+v", got, again)
		}
	})
}

// TestPropertyStepped: a wire loaded by dead weights in load-unload cycles
// at 10 Hz to 5 kHz, swinging at 1 to 8 Hz (at most a quarter of
// the sample rate) after each change: every
// settled hold found once with its settled force within the noise, every
// unload with the load it came from, the elastic limit bracketed between
// the cycles, the break on the final weight proved within 100 ms, and no
// false break before it.
func TestPropertyStepped(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		rateHz := logRange(t, 10, 5000, "rate_hz")
		const rangeN = 1000
		w := rangeN * rapid.Float64Range(0.08, 0.2).Draw(t, "weight_fraction")
		sn := bridgeNoise(t, rangeN)
		// The swing is sampled at least four times a period: a slower
		// board cannot tell a swing from a fall (see the package caveats).
		swingHz := rapid.Float64Range(1, math.Min(8, rateHz/4)).Draw(t, "swing_hz")
		decay := rapid.Float64Range(1.5, 5).Draw(t, "swing_decay_per_s")
		damping := decay / (2 * math.Pi * swingHz)
		frac := rapid.Float64Range(0.2, 0.85).Draw(t, "swing_fraction")
		// The elastic limit lies above the swing's overshoot on the
		// second weight and below the third weight.
		elN := w * rapid.Float64Range(2.02+frac, 2.95).Draw(t, "elastic_limit_weights")
		changeS := rapid.Float64Range(0.3, 1).Draw(t, "change_s")
		noise := math.Max(sn.ForceNoiseN, sn.ForceStepN/math.Sqrt(12))
		// Each level lasts until its swing is down to the noise, plus
		// the settle window and a margin.
		hold := func(changeN float64) float64 {
			settle := math.Log(math.Max(frac*changeN/noise, 1)) / decay
			return changeS + settle + 1.5*DefaultSettleMinS + rapid.Float64Range(2, 4).Draw(t, "margin_s")
		}
		var levels []detectgen.Level
		prev := 0.0
		for _, f := range []float64{w, 2 * w, 0, 3 * w, 0, 3.5 * w, 4 * w} {
			levels = append(levels, detectgen.Level{ForceN: f, HoldS: hold(math.Abs(f - prev))})
			prev = f
		}
		g := detectgen.Stepped{
			RateHz:          rateHz,
			IdleS:           idleS(t, rateHz),
			Levels:          levels,
			StiffnessNPerMM: elN / rapid.Float64Range(1, 5).Draw(t, "elastic_ext_mm"),
			ElasticLimitN:   elN,
			HardeningNPerMM: (3*w - elN) / rapid.Float64Range(0.05, 0.5).Draw(t, "set_mm"),
			CreepMM:         0.2,
			CreepTauS:       2,
			ChangeS:         changeS,
			SwingHz:         swingHz,
			SwingDamping:    damping,
			SwingFraction:   frac,
			Break:           true,
			BreakAfterS:     levels[len(levels)-1].HoldS,
			AfterBreakS:     0.5,
			Sensor:          sn,
			Seed:            rapid.Uint64().Draw(t, "seed"),
		}
		c, tr := g.Generate()
		ems, got := runBatches(t, Config{ForceRangeN: rangeN}, c, rapid.IntRange(1, 700).Draw(t, "batch"))

		tol := 3 * math.Max(noise, sn.ForceStepN)
		if len(got.Holds) != len(tr.Holds) {
			t.Fatalf("%d holds, want %d:\n%+v\ntruth %+v\nevents %+v", len(got.Holds), len(tr.Holds), got.Holds, tr.Holds, got.Events)
		}
		for i, h := range got.Holds {
			want := tr.Holds[i]
			if math.Abs(h.ForceN-want.ForceN) > tol {
				t.Fatalf("hold %d settled at %.4f N, want %.4f ± %.4f", i, h.ForceN, want.ForceN, tol)
			}
			if h.SettledS < want.ChangeEndS || h.SettledS > want.EndS {
				t.Fatalf("hold %d settled at %.3f s, outside its level %.3f..%.3f s", i, h.SettledS, want.ChangeEndS, want.EndS)
			}
		}
		if len(got.Unloads) != len(tr.Unloads) {
			t.Fatalf("unloads %+v, want %+v", got.Unloads, tr.Unloads)
		}
		for i, u := range got.Unloads {
			if math.Abs(u.AfterForceN-tr.Unloads[i].AfterForceN) > tol {
				t.Fatalf("unload %d after %.4f N, want %.4f", i, u.AfterForceN, tr.Unloads[i].AfterForceN)
			}
		}
		el := got.ElasticLimit
		if el == nil || el.NoSetUpToN == nil || el.SetFromN == nil ||
			math.Abs(*el.NoSetUpToN-tr.NoSetUpToN) > tol || math.Abs(*el.SetFromN-tr.SetFromN) > tol {
			t.Fatalf("elastic limit %+v, want %.2f..%.2f N; unloads %+v truth %+v", el, tr.NoSetUpToN, tr.SetFromN, got.Unloads, tr.Unloads)
		}
		breaks := kinds(ems, reduce.EventBreak)
		if len(breaks) != 1 {
			t.Fatalf("breaks %+v, want one at %.4f s", breaks, tr.FractureS)
		}
		if lat := breaks[0].ProvedAtS - tr.FractureS; lat < 0 || lat > 0.1+1e-9 {
			t.Fatalf("break proved %.4f s after the fracture sample %.4f s", lat, tr.FractureS)
		}
	})
}
