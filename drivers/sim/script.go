package sim

import "math"

// sample is one true (noise-free) reading: force in N, extension over Le
// in mm (NaN: extensometer off), crosshead travel in mm.
type sample struct {
	forceN  float64
	extMM   float64
	crossMM float64
}

// run is one specimen's physics, advanced one sample at a time; done is
// true on the last sample of the loading (fracture, or all weights held).
type run interface {
	step(dtS float64) (s sample, done bool)
}

func newRun(sp Specimen) run {
	if sp.Loading.Mode == ModeDeadWeight {
		return newWeightRun(sp)
	}
	return newRateRun(sp)
}

type phase int

const (
	phasePause   phase = iota // specimen out: force about 0, no extensometer
	phasePreroll              // specimen gripped, extensometer on, no load yet
	phaseLoad
	phasePost // broken or unloaded, pieces still in the grips
	phaseIdle // script over, loop off
)

// script sequences the specimens: pause, preroll, load, post, then the
// next specimen, over and over when looping. Each call of next is one
// sample; the values depend only on the sample count, never on the wall
// clock, so a seed and a config give the same curve at any pace.
type script struct {
	specs    []Specimen
	loop     bool
	dtS      float64 // test time per sample: speed / rate
	pauseN   int     // samples, wall time
	prerollN int
	postN    int

	i     int
	ph    phase
	n     int // samples spent in the current phase
	cur   run
	last  sample
	tests uint64 // loadings finished
}

func newScript(specs []Specimen, loop bool, rateHz, speed, pauseS float64) *script {
	return &script{
		specs:    specs,
		loop:     loop,
		dtS:      speed / rateHz,
		pauseN:   int(math.Round(pauseS * rateHz)),
		prerollN: int(math.Round(prerollS * rateHz)),
		postN:    int(math.Round(postS * rateHz)),
		last:     sample{extMM: math.NaN()},
	}
}

// Wall-clock lengths of the phases around each loading, seconds.
const (
	prerollS = 1.0
	postS    = 1.0
)

// next returns the true state of the next sample.
func (sc *script) next() sample {
	for {
		switch sc.ph {
		case phasePause:
			if sc.n < sc.pauseN {
				sc.n++
				return sample{extMM: math.NaN(), crossMM: sc.last.crossMM}
			}
			sc.enter(phasePreroll)
		case phasePreroll:
			if sc.n < sc.prerollN {
				sc.n++
				return sample{}
			}
			sc.cur = newRun(sc.specs[sc.i])
			sc.enter(phaseLoad)
		case phaseLoad:
			s, done := sc.cur.step(sc.dtS)
			if done {
				sc.tests++
				sc.cur = nil
				sc.enter(phasePost)
			}
			sc.last = s
			return s
		case phasePost:
			if sc.n < sc.postN {
				sc.n++
				return sample{extMM: math.NaN(), crossMM: sc.last.crossMM}
			}
			sc.i++
			if sc.i >= len(sc.specs) {
				if !sc.loop {
					sc.enter(phaseIdle)
					continue
				}
				sc.i = 0
			}
			sc.last.crossMM = 0
			sc.enter(phasePause)
		default:
			return sample{extMM: math.NaN(), crossMM: sc.last.crossMM}
		}
	}
}

func (sc *script) enter(p phase) { sc.ph, sc.n = p, 0 }
