package sim

import (
	"math"
	"math/rand/v2"
)

// Sensors is the frame's instrumentation: a load cell on a 24-bit bridge
// ADC spanning plus and minus ForceRangeN, an extensometer and a crosshead
// encoder with their resolutions, each with white noise of the given RMS.
// Zero fields take the defaults of DefaultSensors.
type Sensors struct {
	ForceRangeN           float64 `json:"force_range_N,omitempty"`
	ForceNoiseN           float64 `json:"force_noise_N,omitempty"`
	ExtRangeMM            float64 `json:"ext_range_mm,omitempty"`
	ExtResolutionMM       float64 `json:"ext_resolution_mm,omitempty"`
	ExtNoiseMM            float64 `json:"ext_noise_mm,omitempty"`
	CrossheadRangeMM      float64 `json:"crosshead_range_mm,omitempty"`
	CrossheadResolutionMM float64 `json:"crosshead_resolution_mm,omitempty"`
	CrossheadNoiseMM      float64 `json:"crosshead_noise_mm,omitempty"`
	// RawCounts reports ADC and encoder counts instead of N and mm, for
	// exercising the daemon's calibration.
	RawCounts bool `json:"raw_counts,omitempty"`
}

// DefaultSensors is a 100 kN frame with a good bridge amplifier, a 100 mm, 0.1 um
// extensometer and a 1 um crosshead encoder.
var DefaultSensors = Sensors{
	ForceRangeN:           100000,
	ForceNoiseN:           0.5,
	ExtRangeMM:            100,
	ExtResolutionMM:       0.0001,
	ExtNoiseMM:            0.0002,
	CrossheadRangeMM:      1000,
	CrossheadResolutionMM: 0.001,
	CrossheadNoiseMM:      0.0005,
}

// adcBits is the bridge ADC's resolution; it is bipolar, so full scale is
// 2^(bits-1) counts each way.
const adcBits = 24

func (s Sensors) withDefaults() Sensors {
	d := DefaultSensors
	pick := func(v, def float64) float64 {
		if v == 0 {
			return def
		}
		return v
	}
	s.ForceRangeN = pick(s.ForceRangeN, d.ForceRangeN)
	s.ForceNoiseN = pick(s.ForceNoiseN, d.ForceNoiseN)
	s.ExtRangeMM = pick(s.ExtRangeMM, d.ExtRangeMM)
	s.ExtResolutionMM = pick(s.ExtResolutionMM, d.ExtResolutionMM)
	s.ExtNoiseMM = pick(s.ExtNoiseMM, d.ExtNoiseMM)
	s.CrossheadRangeMM = pick(s.CrossheadRangeMM, d.CrossheadRangeMM)
	s.CrossheadResolutionMM = pick(s.CrossheadResolutionMM, d.CrossheadResolutionMM)
	s.CrossheadNoiseMM = pick(s.CrossheadNoiseMM, d.CrossheadNoiseMM)
	return s
}

// ForceStepN is one ADC count in N.
func (s Sensors) ForceStepN() float64 {
	return s.ForceRangeN / math.Exp2(adcBits-1)
}

// sensorModel turns true samples into readings: add noise, then quantise
// to whole counts, clipped at the range.
type sensorModel struct {
	rng            *rand.Rand
	noise          float64 // factor on every noise RMS
	forceStep      float64
	forceMaxCounts float64
	extStep        float64
	extMaxCounts   float64
	crossStep      float64
	crossMaxCounts float64
	fNoise, eNoise float64
	cNoise         float64
	raw            bool
}

func newSensorModel(s Sensors, noise float64, seed uint64) *sensorModel {
	return &sensorModel{
		// Two PCG words from one seed: the stream is fixed by the seed.
		rng:            rand.New(rand.NewPCG(seed, seed^0x9e3779b97f4a7c15)),
		noise:          noise,
		forceStep:      s.ForceStepN(),
		forceMaxCounts: math.Exp2(adcBits-1) - 1,
		extStep:        s.ExtResolutionMM,
		extMaxCounts:   math.Round(s.ExtRangeMM / s.ExtResolutionMM),
		crossStep:      s.CrossheadResolutionMM,
		crossMaxCounts: math.Round(s.CrossheadRangeMM / s.CrossheadResolutionMM),
		fNoise:         s.ForceNoiseN * noise,
		eNoise:         s.ExtNoiseMM * noise,
		cNoise:         s.CrossheadNoiseMM * noise,
		raw:            s.RawCounts,
	}
}

// read turns one true sample into the three channel values.
func (m *sensorModel) read(t sample, out *[3]float64) {
	nf, ne, nc := m.rng.NormFloat64(), m.rng.NormFloat64(), m.rng.NormFloat64()
	out[0] = m.quantise(t.forceN+nf*m.fNoise, m.forceStep, m.forceMaxCounts)
	out[1] = m.quantise(t.extMM+ne*m.eNoise, m.extStep, m.extMaxCounts)
	out[2] = m.quantise(t.crossMM+nc*m.cNoise, m.crossStep, m.crossMaxCounts)
}

// quantise rounds v to whole counts of step, clipped at plus and minus
// maxCounts, and returns counts or engineering units. NaN stays NaN.
func (m *sensorModel) quantise(v, step, maxCounts float64) float64 {
	c := math.Round(v / step)
	c = min(max(c, -maxCounts), maxCounts)
	if m.raw {
		return c
	}
	return c * step
}
