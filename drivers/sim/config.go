package sim

import (
	_ "embed"
	"fmt"
	"math"

	"framed/drivers"
)

// SampleConfig is an example configuration: the demo series at five
// times real speed, looping.
//
//go:embed sample.json
var SampleConfig []byte

// Pace says how batches are timed.
const (
	// PaceRealtime emits batches every BatchMS on the wall clock with the
	// samples due by then; sample times are real wall-clock instants.
	PaceRealtime = "realtime"
	// PaceNone emits as fast as the consumer takes them; times start at
	// the stream's start and advance by 1/rate (benchmarks, tests).
	PaceNone = "none"
)

// ScriptDemo names the built-in demo series (DemoScript).
const ScriptDemo = "demo"

// Config is the sim driver's configuration (JSON).
type Config struct {
	// Seed fixes the noise: the same seed and config give the same
	// samples at any pace.
	Seed uint64 `json:"seed"`
	// RateHz is samples per wall-clock second, 10 to 10000 (default 200).
	RateHz float64 `json:"rate_hz,omitempty"`
	// Speed compresses test time: at 5 a two-minute test runs in 24 s
	// (default 1).
	Speed float64 `json:"speed,omitempty"`
	// Pace is "realtime" (default) or "none".
	Pace string `json:"pace,omitempty"`
	// Noise scales every sensor's noise (default 1; 0 for none).
	Noise *float64 `json:"noise,omitempty"`
	// PauseS is the wall time between tests, specimen out (default 3).
	PauseS *float64 `json:"pause_s,omitempty"`
	// Loop runs the series again and again; otherwise the frame idles
	// after the last test.
	Loop bool `json:"loop,omitempty"`
	// Script "demo" runs DemoScript; otherwise Specimens are run.
	Script    string     `json:"script,omitempty"`
	Specimens []Specimen `json:"specimens,omitempty"`
	Sensors   Sensors    `json:"sensors,omitzero"`
	// BatchMS is the realtime batch interval, 5 to 500 ms (default 25).
	BatchMS float64 `json:"batch_ms,omitempty"`
	// FailAfterS injects a fault: after this much stream time the stream
	// ends with an error wrapping drivers.ErrDeviceGone (0: never).
	FailAfterS float64 `json:"fail_after_s,omitempty"`
}

// Limits of the configuration.
const (
	MinRateHz = 10
	MaxRateHz = 10000
	MaxSpeed  = 1000
)

// settings is a validated configuration with its defaults applied.
type settings struct {
	Config
	noise  float64
	pauseS float64
	specs  []Specimen
}

// ParseConfig decodes and validates a configuration. Unknown fields are
// refused, so a typo never silently falls back to a default. Errors wrap
// drivers.ErrBadConfig.
func ParseConfig(raw []byte) (Config, error) {
	s, err := parseSettings(raw)
	return s.Config, err
}

func parseSettings(raw []byte) (settings, error) {
	var c Config
	if err := drivers.DecodeConfig("sim", raw, &c); err != nil {
		return settings{}, err
	}
	s, err := c.settle()
	if err != nil {
		return settings{}, fmt.Errorf("%w: sim: %w", drivers.ErrBadConfig, err)
	}
	return s, nil
}

func (c Config) settle() (settings, error) {
	s := settings{Config: c, noise: 1, pauseS: 3}
	if s.RateHz == 0 {
		s.RateHz = 200
	}
	if !(s.RateHz >= MinRateHz && s.RateHz <= MaxRateHz) {
		return s, fmt.Errorf("rate_hz = %v, want %d to %d", c.RateHz, MinRateHz, MaxRateHz)
	}
	if s.Speed == 0 {
		s.Speed = 1
	}
	if !(s.Speed > 0 && s.Speed <= MaxSpeed) {
		return s, fmt.Errorf("speed = %v, want 0 < speed <= %d", c.Speed, MaxSpeed)
	}
	switch s.Pace {
	case "":
		s.Pace = PaceRealtime
	case PaceRealtime, PaceNone:
	default:
		return s, fmt.Errorf("pace %q, want %q or %q", c.Pace, PaceRealtime, PaceNone)
	}
	if c.Noise != nil {
		s.noise = *c.Noise
		if !(s.noise >= 0 && s.noise <= 100) {
			return s, fmt.Errorf("noise = %v, want 0 to 100", s.noise)
		}
	}
	if c.PauseS != nil {
		s.pauseS = *c.PauseS
		if !(s.pauseS >= 0 && s.pauseS <= 3600) {
			return s, fmt.Errorf("pause_s = %v, want 0 to 3600", s.pauseS)
		}
	}
	if s.BatchMS == 0 {
		s.BatchMS = 25
	}
	if !(s.BatchMS >= 5 && s.BatchMS <= 500) {
		return s, fmt.Errorf("batch_ms = %v, want 5 to 500", c.BatchMS)
	}
	if !(s.FailAfterS >= 0) || math.IsInf(s.FailAfterS, 0) {
		return s, fmt.Errorf("fail_after_s = %v, want >= 0", c.FailAfterS)
	}
	switch {
	case c.Script == ScriptDemo && len(c.Specimens) > 0:
		return s, fmt.Errorf("give script %q or specimens, not both", ScriptDemo)
	case c.Script == ScriptDemo:
		s.specs = DemoScript()
	case c.Script != "":
		return s, fmt.Errorf("script %q, want %q (or a specimens list)", c.Script, ScriptDemo)
	case len(c.Specimens) == 0:
		return s, fmt.Errorf("no specimens: give script %q or a specimens list", ScriptDemo)
	default:
		s.specs = c.Specimens
	}
	for i, sp := range s.specs {
		if err := sp.Validate(); err != nil {
			return s, fmt.Errorf("specimens[%d]: %w", i, err)
		}
	}
	s.Sensors = c.Sensors.withDefaults()
	if err := s.Sensors.validate(); err != nil {
		return s, err
	}
	return s, nil
}

func (s Sensors) validate() error {
	for _, f := range []struct {
		name string
		v    float64
	}{
		{"force_range_N", s.ForceRangeN}, {"force_noise_N", s.ForceNoiseN},
		{"ext_range_mm", s.ExtRangeMM}, {"ext_resolution_mm", s.ExtResolutionMM},
		{"ext_noise_mm", s.ExtNoiseMM}, {"crosshead_range_mm", s.CrossheadRangeMM},
		{"crosshead_resolution_mm", s.CrossheadResolutionMM}, {"crosshead_noise_mm", s.CrossheadNoiseMM},
	} {
		if !(f.v > 0) || math.IsInf(f.v, 0) {
			return fmt.Errorf("sensors.%s = %v, want a positive value", f.name, f.v)
		}
	}
	if s.ExtResolutionMM > s.ExtRangeMM || s.CrossheadResolutionMM > s.CrossheadRangeMM {
		return fmt.Errorf("sensors: a resolution is coarser than its range")
	}
	return nil
}
