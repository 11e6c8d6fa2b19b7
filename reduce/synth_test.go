package reduce_test

import (
	"math"
	"math/rand/v2"

	"framed/reduce"
)

// Synthetic curves with exact answers. Each generator gives engineering
// stress as a function of engineering strain; synth samples it at constant
// strain rate and turns it into force and extension of a specimen.

type synthSpec struct {
	s0MM2, leMM float64
	samples     int
	eMax        float64                 // last engineering strain (fraction)
	stress      func(e float64) float64 // engineering stress, MPa
	// noise: standard deviations and quantisation steps of the channels.
	forceSDN, forceStepN, extSDMM, extStepMM float64
	seed                                     uint64
	// breakDrop appends samples where the force falls to near zero.
	breakDrop bool
}

func (s synthSpec) curve() reduce.Curve {
	var c reduce.Curve
	rng := rand.New(rand.NewPCG(s.seed, 7))
	q := func(v, step float64) float64 {
		if step <= 0 {
			return v
		}
		return step * math.Round(v/step)
	}
	for i := 0; i < s.samples; i++ {
		e := s.eMax * float64(i) / float64(s.samples-1)
		f := s.stress(e) * s.s0MM2
		x := e * s.leMM
		f = q(f+s.forceSDN*rng.NormFloat64(), s.forceStepN)
		x = q(x+s.extSDMM*rng.NormFloat64(), s.extStepMM)
		c.TimeS = append(c.TimeS, float64(i)*0.01)
		c.ForceN = append(c.ForceN, f)
		c.ExtensionMM = append(c.ExtensionMM, x)
		c.CrossheadMM = append(c.CrossheadMM, x*1.5)
	}
	if s.breakDrop {
		last := c.ForceN[len(c.ForceN)-1]
		x := c.ExtensionMM[len(c.ExtensionMM)-1]
		for k, frac := range []float64{0.6, 0.2, 0.01, 0.005} {
			c.TimeS = append(c.TimeS, float64(s.samples+k)*0.01)
			c.ForceN = append(c.ForceN, last*frac)
			c.ExtensionMM = append(c.ExtensionMM, x)
			c.CrossheadMM = append(c.CrossheadMM, x*1.5)
		}
	}
	return c
}

// rambergOsgood is the engineering stress at strain e of the
// Ramberg-Osgood curve eps = s/E + 0.002 (s/Rp0.2)^m (NACA TN 902, 1943,
// proof-strength form), solved by bisection.
func rambergOsgood(eMPa, rp02MPa, m float64) func(float64) float64 {
	return func(e float64) float64 {
		lo, hi := 0.0, rp02MPa*20
		for k := 0; k < 200; k++ {
			mid := (lo + hi) / 2
			if mid/eMPa+0.002*math.Pow(mid/rp02MPa, m) > e {
				hi = mid
			} else {
				lo = mid
			}
		}
		return (lo + hi) / 2
	}
}

// roStrain is the Ramberg-Osgood strain at stress s.
func roStrain(eMPa, rp02MPa, m, s float64) float64 {
	return s/eMPa + 0.002*math.Pow(s/rp02MPa, m)
}
