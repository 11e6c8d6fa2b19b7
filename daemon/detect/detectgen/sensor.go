package detectgen

import (
	"math"
	"math/rand/v2"
)

// Sensor adds noise and quantisation to true readings.
type Sensor struct {
	// ForceNoiseN is the standard deviation of the force noise.
	ForceNoiseN float64
	// ForceStepN is the force channel's resolution (0: none).
	ForceStepN float64
	// ForceOffsetN is added to every force reading (an untared cell).
	ForceOffsetN float64
	// ExtNoiseMM and ExtStepMM are the extension channel's noise and
	// resolution; CrossheadStepMM the crosshead's resolution.
	ExtNoiseMM      float64
	ExtStepMM       float64
	CrossheadStepMM float64
}

// BridgeBoard is a cheap 24-bit bridge amplifier on a load cell of range
// rangeN: about 16 noise-free bits at 10 to 80 samples/s (from memory:
// typical of the HX711 class of boards), and a 1 µm extension scale.
func BridgeBoard(rangeN float64) Sensor {
	return Sensor{
		ForceNoiseN:     rangeN * 2e-5,
		ForceStepN:      rangeN / (1 << 20),
		ExtNoiseMM:      0.0005,
		ExtStepMM:       0.0001,
		CrossheadStepMM: 0.001,
	}
}

func quant(x, step float64) float64 {
	if step <= 0 {
		return x
	}
	return step * math.Round(x/step)
}

func (s Sensor) force(r *rand.Rand, f float64) float64 {
	return quant(f+s.ForceOffsetN+s.ForceNoiseN*r.NormFloat64(), s.ForceStepN)
}

func (s Sensor) ext(r *rand.Rand, x float64) float64 {
	if math.IsNaN(x) {
		return x
	}
	return quant(x+s.ExtNoiseMM*r.NormFloat64(), s.ExtStepMM)
}

func (s Sensor) crosshead(x float64) float64 {
	if math.IsNaN(x) {
		return x
	}
	return quant(x, s.CrossheadStepMM)
}

// roundTime keeps sample times to the microsecond, as a logger writes them.
func roundTime(tS float64) float64 { return math.Round(tS*1e6) / 1e6 }
