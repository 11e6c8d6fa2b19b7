package sim

import "math"

// weightRun is a specimen under dead weights. After each change the
// hanger swings as a damped oscillator, so the force is
//
//	F(t) = Fnew - a (Fnew - Fold) exp(-zeta w t) (cos wd t + zeta/sqrt(1-zeta^2) sin wd t)
//
// with w = 2 pi f and wd = w sqrt(1 - zeta^2): the step response of a
// damped mass on a spring, starting at Fold for a = 1 (weight let go at
// once) and settling at Fnew = m g. The strain follows the force through
// the material: elastic below the highest stress reached so far (the
// permanent set stays), along the loading curve above it. Under a load
// that reached plastic flow (above Rp0.2) the specimen creeps
// logarithmically; a load
// above the curve's maximum runs away to fracture.
type weightRun struct {
	c      model
	tab    table
	s0MM2  float64
	leMM   float64
	lcMM   float64
	kNPerM float64 // N per mm, named for the unit

	steps   []WeightStep
	stepIdx int
	tS      float64 // test time within the current step
	fOldN   float64
	fNewN   float64
	w, wd   float64
	zeta    float64
	frac    float64

	jMax int     // table cell of the furthest state on the curve
	eMax float64 // furthest strain on the curve
	sMax float64 // stress there, MPa

	creepE    float64 // creep strain accumulated
	creepFrom float64 // stress above which the specimen creeps, MPa (Rp0.2)
	creepTS   float64 // time since plastic flow began under this step
	creeping  bool
	extOffE   float64
	extOff    bool
	runaway   bool
	broken    bool
	lastForce float64
	dt        float64 // time step of the current sample
}

// creepStressPower is how steeply creep slows below the highest stress
// reached (ours: a tenfold slowdown about 20 % below it).
const creepStressPower = 10

// runawayRate is the strain rate (1/s) at which a specimen overloaded
// past its maximum runs to fracture.
const runawayRate = 1.0

func newWeightRun(sp Specimen) *weightRun {
	c := sp.Material.compile()
	l := sp.Loading
	w := 2 * math.Pi * l.SwingHz
	r := &weightRun{
		c:       c,
		tab:     newTable(c),
		s0MM2:   sp.CrossSectionMM2(),
		leMM:    sp.leMM(),
		lcMM:    sp.lcMM(),
		kNPerM:  l.StiffnessNPerMM,
		steps:   l.Steps,
		w:       w,
		wd:      w * math.Sqrt(1-l.SwingZeta*l.SwingZeta),
		zeta:    l.SwingZeta,
		frac:    l.SwingFraction,
		extOffE: math.Inf(1),
	}
	if c.CreepPct > 0 {
		r.creepFrom = sp.Material.Truth().Rp02MPa
	}
	if p := l.ExtensometerOffPct; p > 0 {
		r.extOffE = p / 100
	}
	r.fNewN = l.Steps[0].MassKG * StandardGravity
	return r
}

// hangerForce is the force of the swinging hanger at time t after the
// current change, never below zero (a slack specimen carries nothing).
func (r *weightRun) hangerForce() float64 {
	d := r.fNewN - r.fOldN
	env := math.Exp(-r.zeta * r.w * r.tS)
	ring := math.Cos(r.wd*r.tS) + r.zeta/math.Sqrt(1-r.zeta*r.zeta)*math.Sin(r.wd*r.tS)
	return max(r.fNewN-r.frac*d*env*ring, 0)
}

// strainAt moves the specimen's state to stress sMPa and returns the
// mechanical strain; ok is false when the stress is above what the curve
// can carry from here (the specimen runs away).
func (r *weightRun) strainAt(sMPa float64) (float64, bool) {
	if sMPa <= r.sMax {
		return r.eMax - (r.sMax-sMPa)/r.c.EMPa, true
	}
	n := r.tab.last()
	j := r.jMax
	for j < n && r.tab.s[j+1] < sMPa {
		j++
	}
	if j >= n {
		return r.eMax, false
	}
	s0, s1 := r.tab.s[j], r.tab.s[j+1]
	f := 1.0
	if s1 > s0 {
		f = min(max((sMPa-s0)/(s1-s0), 0), 1)
	}
	e := r.tab.e[j] + f*(r.tab.e[j+1]-r.tab.e[j])
	if e < r.eMax {
		e = r.eMax
	}
	r.jMax, r.eMax, r.sMax = j, e, sMPa
	return e, true
}

// step advances test time by dtS; done is true once the test is over
// (broken, or all steps held).
func (r *weightRun) step(dtS float64) (sample, bool) {
	r.dt = dtS
	if r.runaway {
		out := r.runStep(dtS)
		return out, r.broken
	}
	r.tS += dtS
	if r.tS > r.steps[r.stepIdx].HoldS {
		if r.stepIdx+1 >= len(r.steps) {
			return r.state(r.hangerForce()), true
		}
		r.stepIdx++
		r.tS = dtS
		r.fOldN = r.lastForce
		r.fNewN = r.steps[r.stepIdx].MassKG * StandardGravity
		r.creeping = false
	}
	out := r.state(r.hangerForce())
	return out, r.broken
}

// state is the sample at hanger force fN, moving the specimen along.
func (r *weightRun) state(fN float64) sample {
	r.lastForce = fN
	s := fN / r.s0MM2
	before := r.eMax
	e, ok := r.strainAt(s)
	if !ok {
		r.runaway = true
		return r.runStep(r.dt)
	}
	dt := r.tS - r.creepTS
	if r.eMax > before || r.creeping {
		// Plastic flow under this load: creep, with the creep clock
		// started when flow began under the current step.
		if !r.creeping {
			r.creeping = true
			r.creepTS = r.tS
			dt = 0
		}
		if r.c.CreepPct > 0 && s >= r.creepFrom {
			// d/dt [C ln(1 + t/tau)] = C / (tau + t), slowed steeply
			// below the highest stress reached: a specimen that swung
			// past its settled load has been strained ahead of it.
			slow := math.Pow(s/r.sMax, creepStressPower)
			r.creepE += slow * r.c.CreepPct / 100 * r.dt / (r.c.CreepTauS + dt)
		}
	}
	return r.observe(e, fN)
}

func (r *weightRun) observe(e, fN float64) sample {
	total := e + r.creepE
	if total >= r.extOffE {
		r.extOff = true
	}
	ext := total * r.leMM
	if r.extOff {
		ext = math.NaN()
	}
	// A dead-weight rig has no crosshead: nothing drives the load, the
	// weights hang. The crosshead channel reads nothing (NaN), so a
	// creeping hanger is never taken for a machine still pulling.
	return sample{forceN: fN, extMM: ext, crossMM: math.NaN()}
}

// runStep moves an overloaded specimen along its falling curve to
// fracture; the weight accelerates, so the force is what the curve holds.
func (r *weightRun) runStep(dtS float64) sample {
	r.eMax += runawayRate * dtS
	if r.eMax >= r.c.fractureE {
		r.broken = true
		return sample{forceN: 0, extMM: math.NaN(), crossMM: math.NaN()}
	}
	f := r.c.stress(r.eMax) * r.s0MM2
	return r.observe(r.eMax, f)
}
