package detectgen

import (
	"math"
	"math/rand/v2"

	"framed/reduce"
)

// Continuous describes a crosshead-driven test pulled at a constant rate.
type Continuous struct {
	RateHz float64 // sample rate
	IdleS  float64 // readings at rest before the crosshead moves
	// StiffnessNPerMM is the elastic slope of force over extension.
	StiffnessNPerMM float64
	YieldN          float64 // lower yield (or proof) force
	MaxN            float64 // maximum force Fm
	// UpperYieldFraction > 0 gives an upper yield point that much above
	// YieldN, followed by a Lüders plateau (discontinuous yielding).
	UpperYieldFraction float64
	// SerrationFraction > 0 gives serrated flow in the hardening range:
	// sudden drops of that fraction of the force every SerrationPeriodS.
	SerrationFraction float64
	SerrationPeriodS  float64
	// FractureFraction of MaxN is the force left when the neck breaks.
	FractureFraction float64
	// Break: the force falls to nothing at fracture (otherwise the
	// record just ends there).
	Break bool
	// AfterBreakS of readings follow the fracture.
	AfterBreakS float64
	// DurationS is the time from the crosshead starting to fracture.
	DurationS float64
	Sensor    Sensor
	Seed      uint64
}

// ContinuousTruth is what a detector should find in a continuous test.
type ContinuousTruth struct {
	// StartS is when the crosshead started pulling.
	StartS float64
	// FractureIndex is the first sample read after the fracture (-1 when
	// there is no break); FractureS its time.
	FractureIndex int
	FractureS     float64
	PeakN         float64
}

// Generate samples the test.
func (c Continuous) Generate() (reduce.Curve, ContinuousTruth) {
	r := rand.New(rand.NewPCG(c.Seed, c.Seed^0x5eed))
	dt := 1 / c.RateHz
	xy := c.YieldN / c.StiffnessNPerMM // extension at yield
	var xLuders, xKnee float64
	if c.UpperYieldFraction > 0 {
		xKnee = xy * (1 + c.UpperYieldFraction)
		xLuders = xKnee + 8*xy
	} else {
		xKnee = 0
		xLuders = 3 * xy
	}
	xMax := xLuders + 60*xy // extension at Fm
	xEnd := xMax + 30*xy    // extension at fracture
	v := xEnd / c.DurationS // extension rate, mm/s
	force := func(x, tS float64) float64 {
		switch {
		case x <= 0:
			return 0
		case c.UpperYieldFraction > 0 && x <= xKnee:
			return c.StiffnessNPerMM * x
		case c.UpperYieldFraction > 0 && x <= xKnee+0.3*xy:
			// the drop from the upper yield point
			s := (x - xKnee) / (0.3 * xy)
			return c.YieldN * (1 + c.UpperYieldFraction*(1-s))
		case c.UpperYieldFraction > 0 && x <= xLuders:
			return c.YieldN * (1 + 0.01*math.Sin(x/xy*7))
		case c.UpperYieldFraction == 0 && x <= xLuders:
			return c.YieldN * math.Tanh(c.StiffnessNPerMM*x/c.YieldN)
		}
		var f float64
		if x <= xMax {
			s := (x - xLuders) / (xMax - xLuders)
			y0 := c.YieldN
			if c.UpperYieldFraction == 0 {
				y0 = c.YieldN * math.Tanh(3)
			}
			f = y0 + (c.MaxN-y0)*(1-(1-s)*(1-s))
			if c.SerrationFraction > 0 && c.SerrationPeriodS > 0 {
				ph := tS / c.SerrationPeriodS
				f *= 1 - c.SerrationFraction*(1-(ph-math.Floor(ph)))
			}
		} else {
			s := (x - xMax) / (xEnd - xMax)
			f = c.MaxN - (1-c.FractureFraction)*c.MaxN*s*s
		}
		return f
	}
	tr := ContinuousTruth{StartS: c.IdleS, FractureIndex: -1, FractureS: math.NaN()}
	total := c.IdleS + c.DurationS
	if c.Break {
		total += c.AfterBreakS
	}
	n := int(total/dt) + 1
	cv := reduce.Curve{
		TimeS: make([]float64, n), ForceN: make([]float64, n),
		ExtensionMM: make([]float64, n), CrossheadMM: make([]float64, n),
	}
	idx := 0
	for i := 0; i < n; i++ {
		t := float64(i) * dt
		tt := t - c.IdleS
		x := math.Max(0, tt*v)
		var f, ext float64
		if tt <= c.DurationS {
			f = force(x, tt)
			ext = 0.8 * x
		} else {
			if !c.Break {
				break
			}
			if tr.FractureIndex < 0 {
				tr.FractureIndex, tr.FractureS = i, t
			}
			f, ext = 0, math.NaN() // fallen apart; the extensometer is off
		}
		if f > tr.PeakN {
			tr.PeakN = f
		}
		cv.TimeS[i] = roundTime(t)
		cv.ForceN[i] = c.Sensor.force(r, f)
		cv.ExtensionMM[i] = c.Sensor.ext(r, ext)
		cv.CrossheadMM[i] = c.Sensor.crosshead(x)
		idx = i + 1
	}
	return cv.Slice(0, idx), tr
}
