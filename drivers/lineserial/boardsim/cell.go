package boardsim

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// Limits of a signed 24-bit ADC reading: what a bridge ADC such as the
// common 24-bit weigh-scale converters puts out (two's complement).
const (
	MinCounts24 = -1 << 23
	MaxCounts24 = 1<<23 - 1
)

// LoadCell is the simulated load cell and bridge ADC:
//
//	counts = OffsetCounts + CountsPerN F (1 + NonlinearityPct/100 F/FullScaleN) + noise
//
// so the reading departs from the straight line through zero by
// NonlinearityPct percent of the reading at FullScaleN (and by half that
// at half scale): a pure quadratic term, the usual first-order shape of a
// cell's non-linearity (common practice). The result is rounded and
// clipped to the signed 24-bit range, as the ADC saturates.
type LoadCell struct {
	OffsetCounts    float64
	CountsPerN      float64
	NonlinearityPct float64
	FullScaleN      float64
	// NoiseCounts is the standard deviation of white Gaussian noise.
	NoiseCounts float64
}

// DefaultCell is a 5 kN cell giving 1000 counts per newton, with a bridge
// offset of 120000 counts, 0.05 % non-linearity at full scale and 30
// counts of noise: an invented, plausible cheap setup.
var DefaultCell = LoadCell{OffsetCounts: 120000, CountsPerN: 1000, NonlinearityPct: 0.05, FullScaleN: 5000, NoiseCounts: 30}

// Validate refuses parameters that would not give a working board.
func (c LoadCell) Validate() error {
	for _, v := range []struct {
		name string
		x    float64
	}{{"offset counts", c.OffsetCounts}, {"counts per N", c.CountsPerN}, {"non-linearity %", c.NonlinearityPct}, {"full scale N", c.FullScaleN}, {"noise counts", c.NoiseCounts}} {
		if math.IsNaN(v.x) || math.IsInf(v.x, 0) {
			return fmt.Errorf("%w: %s is %v", ErrBadCell, v.name, v.x)
		}
	}
	switch {
	case c.CountsPerN == 0:
		return fmt.Errorf("%w: counts per N is 0: the board would not see any load", ErrBadCell)
	case c.FullScaleN <= 0:
		return fmt.Errorf("%w: full scale %v N must be positive", ErrBadCell, c.FullScaleN)
	case c.NoiseCounts < 0:
		return fmt.Errorf("%w: noise %v counts must not be negative", ErrBadCell, c.NoiseCounts)
	case math.Abs(c.NonlinearityPct) >= 50:
		return fmt.Errorf("%w: non-linearity %v %% is no load cell", ErrBadCell, c.NonlinearityPct)
	}
	return nil
}

// Ideal is the noise-free, unrounded reading for force forceN.
func (c LoadCell) Ideal(forceN float64) float64 {
	return c.OffsetCounts + c.CountsPerN*forceN*(1+c.NonlinearityPct/100*forceN/c.FullScaleN)
}

// Counts is one ADC reading for forceN with noise drawn from rng (nil:
// no noise).
func (c LoadCell) Counts(forceN float64, rng *rand.Rand) int64 {
	x := c.Ideal(forceN)
	if rng != nil && c.NoiseCounts > 0 {
		x += c.NoiseCounts * rng.NormFloat64()
	}
	x = math.Round(x)
	if !(x >= MinCounts24) { // also NaN
		return MinCounts24
	}
	if x > MaxCounts24 {
		return MaxCounts24
	}
	return int64(x)
}
