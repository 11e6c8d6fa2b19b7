package reduce_test

import (
	"math"
	"math/rand/v2"
	"sort"

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
	// knots are strains sampled in addition to the even grid, so corners
	// of a piecewise curve are hit exactly.
	knots []float64
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
	grid := make([]float64, 0, s.samples+len(s.knots))
	for i := 0; i < s.samples; i++ {
		grid = append(grid, s.eMax*float64(i)/float64(s.samples-1))
	}
	grid = append(grid, s.knots...)
	sort.Float64s(grid)
	for i, e := range grid {
		f := s.stress(e) * s.s0MM2
		x := e * s.leMM
		f = q(f+s.forceSDN*rng.NormFloat64(), s.forceStepN)
		x = q(x+s.extSDMM*rng.NormFloat64(), s.extStepMM)
		c.TimeS = append(c.TimeS, float64(i)*0.01)
		c.ForceN = append(c.ForceN, f)
		c.ExtensionMM = append(c.ExtensionMM, x)
		c.CrossheadMM = append(c.CrossheadMM, x*1.5)
	}
	s.samples = len(grid)
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
		for k := 0; k < 80; k++ {
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

// hollomon is an engineering curve with an elastic line, a flat yield
// plateau (engineering stress constant, so Rp0.2 is the plateau stress) and
// Hollomon hardening sigma_true = K eps_p^n from plastic true strain epsL on.
// It returns the curve and the plateau stress.
func hollomon(eMPa, kMPa, n, epsL float64) (func(float64) float64, float64) {
	sigL := kMPa * math.Pow(epsL, n)
	epsTotL := epsL + sigL/eMPa
	sY := sigL * math.Exp(-epsTotL) // engineering stress where hardening starts
	eL := math.Exp(epsTotL) - 1
	return func(e float64) float64 {
		eps := math.Log1p(e)
		if s := eMPa * eps / (1 + e); s < sY {
			return s
		}
		if e <= eL {
			return sY
		}
		// Solve K ep^n / E + ep = eps for the plastic true strain.
		ep := bisect(func(ep float64) float64 { return kMPa*math.Pow(ep, n)/eMPa + ep - eps }, 0, eps)
		return kMPa * math.Pow(ep, n) / (1 + e)
	}, sY
}

// considere is the maximum of the Hollomon engineering curve: dsigma/deps
// = sigma (Considere), i.e. eps_p = n (1 - sigma/E) with sigma = K eps_p^n,
// solved by fixed-point iteration. It returns Rm, Agt and Ag (fractions).
func considere(eMPa, kMPa, n float64) (rm, agt, ag float64) {
	ep := n
	for k := 0; k < 200; k++ {
		ep = n * (1 - kMPa*math.Pow(ep, n)/eMPa)
	}
	sig := kMPa * math.Pow(ep, n)
	eps := ep + sig/eMPa
	agt = math.Exp(eps) - 1
	rm = sig / (1 + agt)
	return rm, agt, agt - rm/eMPa
}
