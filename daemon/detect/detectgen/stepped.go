package detectgen

import (
	"math"
	"math/rand/v2"

	"framed/reduce"
)

// Level is one load step of a dead-weight test: the weights on the
// hanger (as force above the hanger's, N) and how long they stay.
type Level struct {
	ForceN float64
	HoldS  float64
}

// Stepped describes a wire loaded by dead weights added and removed by
// hand. The load cell was tared with the hanger on, so the hanger alone
// reads zero. Each change takes ChangeS and leaves the hanging mass
// swinging at SwingHz, damped with ratio SwingDamping, with an amplitude
// of SwingFraction of the change. Past ElasticLimitN the wire takes a
// permanent set (extra load over the limit divided by HardeningNPerMM) and
// creeps while the load stays above the limit. On the last level the wire
// breaks after BreakAfterS (when Break is set).
type Stepped struct {
	RateHz          float64
	IdleS           float64
	Levels          []Level
	StiffnessNPerMM float64
	ElasticLimitN   float64
	HardeningNPerMM float64
	// CreepMM is the creep of a hold loaded twice the elastic limit
	// after about CreepTauS (logarithmic creep).
	CreepMM       float64
	CreepTauS     float64
	ChangeS       float64
	SwingHz       float64
	SwingDamping  float64
	SwingFraction float64
	Break         bool
	BreakAfterS   float64
	AfterBreakS   float64
	Sensor        Sensor
	Seed          uint64
}

// HoldTruth is a hold the detector should report.
type HoldTruth struct {
	ChangeEndS  float64 // the weights are on
	SettleS     float64 // the swing is down to the force noise
	EndS        float64 // the next change begins
	ForceN      float64
	ExtensionMM float64 // at SettleS
	Creeping    bool    // loaded past the elastic limit
}

// UnloadTruth is a return to the hanger alone.
type UnloadTruth struct {
	SettleS     float64
	AfterForceN float64
	SetMM       float64
}

// SteppedTruth is what a detector should find in a dead-weight test.
type SteppedTruth struct {
	StartS        float64
	Holds         []HoldTruth
	Unloads       []UnloadTruth
	NoSetUpToN    float64 // NaN when no unload left no set
	SetFromN      float64 // NaN when no unload showed set
	FractureIndex int
	FractureS     float64
	PeakN         float64
}

// Generate samples the test.
func (s Stepped) Generate() (reduce.Curve, SteppedTruth) {
	r := rand.New(rand.NewPCG(s.Seed, s.Seed^0xdead))
	dt := 1 / s.RateHz
	w := 2 * math.Pi * s.SwingHz
	decay := s.SwingDamping * w
	wd := w * math.Sqrt(1-s.SwingDamping*s.SwingDamping)
	tr := SteppedTruth{StartS: s.IdleS, FractureIndex: -1, FractureS: math.NaN(),
		NoSetUpToN: math.NaN(), SetFromN: math.NaN()}

	// Plan the changes on the time axis.
	type seg struct{ t0, f0, f1 float64 }
	segs := make([]seg, len(s.Levels))
	t, prev := s.IdleS, 0.0
	for i, l := range s.Levels {
		segs[i] = seg{t, prev, l.ForceN}
		t += l.HoldS
		prev = l.ForceN
	}
	end := t
	breakS := math.Inf(1)
	if s.Break && len(segs) > 0 {
		breakS = segs[len(segs)-1].t0 + s.BreakAfterS
		end = breakS + s.AfterBreakS
	}
	n := int(end/dt) + 1
	cv := reduce.Curve{
		TimeS: make([]float64, n), ForceN: make([]float64, n),
		ExtensionMM: make([]float64, n), CrossheadMM: make([]float64, n),
	}
	noiseN := math.Max(s.Sensor.ForceNoiseN, s.Sensor.ForceStepN/math.Sqrt(12))
	// State carried along: the highest load so far (set) and the creep.
	maxN, creepMM := 0.0, 0.0
	k := 0
	cycleMax := 0.0
	trueExt := make([]float64, n)
	plastic := make([]float64, n)
	for i := 0; i < n; i++ {
		ti := float64(i) * dt
		for k+1 < len(segs) && ti >= segs[k+1].t0 {
			k++
		}
		var fN float64 // true force in the wire above the hanger
		var sg seg
		var since float64
		if len(segs) > 0 && ti >= segs[0].t0 {
			sg = segs[k]
			since = ti - sg.t0
			if since < s.ChangeS {
				// the hand lets go of the weights a little early
				a := s.SwingFraction * (sg.f1 - sg.f0)
				fN = sg.f0 + (sg.f1-a-sg.f0)*since/s.ChangeS
			} else {
				a := s.SwingFraction * (sg.f1 - sg.f0)
				ts := since - s.ChangeS
				fN = sg.f1 - a*math.Exp(-decay*ts)*math.Cos(wd*ts)
			}
		}
		if fN > maxN {
			maxN = fN
		}
		setMM := 0.0
		if maxN > s.ElasticLimitN {
			setMM = (maxN - s.ElasticLimitN) / s.HardeningNPerMM
		}
		// Logarithmic creep while the steady load is over the limit.
		if len(segs) > 0 && ti >= segs[0].t0 && sg.f1 > s.ElasticLimitN && since >= s.ChangeS {
			over := (sg.f1 - s.ElasticLimitN) / s.ElasticLimitN
			rate := s.CreepMM * over / (s.CreepTauS + since - s.ChangeS)
			creepMM += rate * dt
		}
		ext := fN/s.StiffnessNPerMM + setMM + creepMM
		broken := ti >= breakS
		if broken {
			if tr.FractureIndex < 0 {
				tr.FractureIndex, tr.FractureS = i, ti
			}
			fN, ext = 0, math.NaN()
		}
		if fN > tr.PeakN {
			tr.PeakN = fN
		}
		cv.TimeS[i] = roundTime(ti)
		cv.ForceN[i] = s.Sensor.force(r, fN)
		cv.ExtensionMM[i] = s.Sensor.ext(r, ext)
		cv.CrossheadMM[i] = math.NaN() // dead weights: no crosshead
		trueExt[i] = ext
		plastic[i] = setMM + creepMM
	}
	// The truth of holds and unloads, from the plan.
	for i, sg := range segs {
		change := math.Abs(sg.f1 - sg.f0)
		settle := sg.t0 + s.ChangeS
		if a := s.SwingFraction * change; a > noiseN {
			settle += math.Log(a/noiseN) / decay
		}
		endS := sg.t0 + s.Levels[i].HoldS
		if s.Break && i == len(segs)-1 {
			endS = breakS
		}
		if sg.f1 > cycleMax {
			cycleMax = sg.f1
		}
		if sg.f1 <= 0 {
			if cycleMax > 0 {
				tr.Unloads = append(tr.Unloads, UnloadTruth{SettleS: settle, AfterForceN: cycleMax,
					SetMM: extAt(cv.TimeS, trueExt, settle) - extAt(cv.TimeS, trueExt, s.IdleS/2)})
				// Set comes from the highest force the wire really
				// carried, swing included: a swinging weight can take
				// it past the limit when its level does not.
				if extAt(cv.TimeS, plastic, settle) > 0 {
					if math.IsNaN(tr.SetFromN) {
						tr.SetFromN = cycleMax
					}
				} else if math.IsNaN(tr.SetFromN) && !(cycleMax <= tr.NoSetUpToN) {
					tr.NoSetUpToN = cycleMax
				}
			}
			cycleMax = 0
			continue
		}
		tr.Holds = append(tr.Holds, HoldTruth{ChangeEndS: sg.t0 + s.ChangeS, SettleS: settle, EndS: endS,
			ForceN: sg.f1, ExtensionMM: extAt(cv.TimeS, trueExt, settle), Creeping: sg.f1 > s.ElasticLimitN})
	}
	return cv, tr
}

// extAt is the true extension at the sample nearest tS.
func extAt(timeS, extMM []float64, tS float64) float64 {
	if len(timeS) == 0 {
		return math.NaN()
	}
	dt := timeS[len(timeS)-1] / float64(len(timeS)-1)
	i := int(math.Round(tS / dt))
	if i < 0 {
		i = 0
	}
	if i >= len(extMM) {
		i = len(extMM) - 1
	}
	return extMM[i]
}
