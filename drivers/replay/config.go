package replay

import (
	_ "embed"
	"fmt"
	"math"
	"os"

	"framed/drivers"
	"framed/reduce"
	"framed/reduce/curvefile"
)

// SampleConfig is an example configuration.
//
//go:embed sample.json
var SampleConfig []byte

// Paces and end behaviours.
const (
	PaceRealtime = "realtime"
	PaceNone     = "none"
	AtEndIdle    = "idle"
	AtEndClose   = "close"
)

// Limits of the configuration.
const (
	MinRateHz = 1
	MaxRateHz = 10000
	MaxSpeed  = 1000
	// maxSpanS bounds a recording's time span (about three years), so
	// stream times in ns stay far from overflow.
	maxSpanS = 1e8
)

// Config is the replay driver's configuration (JSON).
type Config struct {
	// Path is the curve file.
	Path string `json:"path"`
	// Speed plays the recording this many times faster (default 1).
	Speed float64 `json:"speed,omitempty"`
	// Pace is "realtime" (default: times are wall-clock instants) or
	// "none" (as fast as taken; times from the recording).
	Pace string `json:"pace,omitempty"`
	// RateHz, if set, resamples the recording at this many samples per
	// wall-clock second (linear interpolation); otherwise the recorded
	// samples are played as they are.
	RateHz float64 `json:"rate_hz,omitempty"`
	// Loop plays the recording again and again, PauseS apart.
	Loop   bool     `json:"loop,omitempty"`
	PauseS *float64 `json:"pause_s,omitempty"`
	// AtEnd is what follows the last sample without Loop: "idle"
	// (default: no-load samples) or "close" (the stream ends with ErrEnd).
	AtEnd string `json:"at_end,omitempty"`
	// BatchMS is the realtime batch interval, 5 to 500 ms (default 25).
	BatchMS float64 `json:"batch_ms,omitempty"`
	// FailAfterS injects a fault: the stream ends with an error wrapping
	// drivers.ErrDeviceGone after this much stream time (0: never).
	FailAfterS float64 `json:"fail_after_s,omitempty"`
}

// settings is a validated configuration with its recording.
type settings struct {
	Config
	pauseS float64
	curve  reduce.Curve
	// idleHz is the rate of pause and idle samples.
	idleHz float64
}

// parseSettings checks the JSON first, then reads the file. Every error
// wraps drivers.ErrBadConfig.
func parseSettings(raw []byte) (settings, error) {
	var c Config
	if err := drivers.DecodeConfig("replay", raw, &c); err != nil {
		return settings{}, err
	}
	s, err := c.settle()
	if err != nil {
		return settings{}, fmt.Errorf("%w: replay: %w", drivers.ErrBadConfig, err)
	}
	if err := s.load(); err != nil {
		return settings{}, fmt.Errorf("%w: replay: %w", drivers.ErrBadConfig, err)
	}
	return s, nil
}

func (c Config) settle() (settings, error) {
	s := settings{Config: c, pauseS: 3}
	if s.Path == "" {
		return s, fmt.Errorf("no path: give the curve file to play")
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
	if s.RateHz != 0 && !(s.RateHz >= MinRateHz && s.RateHz <= MaxRateHz) {
		return s, fmt.Errorf("rate_hz = %v, want %d to %d (or leave it out to play the recorded samples)", c.RateHz, MinRateHz, MaxRateHz)
	}
	if c.PauseS != nil {
		s.pauseS = *c.PauseS
		if !(s.pauseS >= 0 && s.pauseS <= 3600) {
			return s, fmt.Errorf("pause_s = %v, want 0 to 3600", s.pauseS)
		}
	}
	switch s.AtEnd {
	case "":
		s.AtEnd = AtEndIdle
	case AtEndIdle, AtEndClose:
	default:
		return s, fmt.Errorf("at_end %q, want %q or %q", c.AtEnd, AtEndIdle, AtEndClose)
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
	return s, nil
}

// load reads and checks the recording.
func (s *settings) load() error {
	f, err := os.Open(s.Path)
	if err != nil {
		return fmt.Errorf("%w: %w", ErrFile, err)
	}
	defer f.Close()
	c, err := curvefile.Read(f)
	if err != nil {
		return fmt.Errorf("%w: %q: %w", ErrFile, s.Path, err)
	}
	if c.Len() < 2 {
		return fmt.Errorf("%w: %q has %d samples, want at least 2", ErrFile, s.Path, c.Len())
	}
	if c.ForceN == nil {
		return fmt.Errorf("%w: %q has no force reading at all", ErrFile, s.Path)
	}
	dur := c.TimeS[c.Len()-1] - c.TimeS[0]
	if !(dur > 0) {
		return fmt.Errorf("%w: %q spans no time (all time_s %v)", ErrFile, s.Path, c.TimeS[0])
	}
	if dur > maxSpanS {
		return fmt.Errorf("%w: %q spans %v s, more than %v s", ErrFile, s.Path, dur, float64(maxSpanS))
	}
	s.curve = c
	s.idleHz = s.RateHz
	if s.idleHz == 0 {
		// The recording's mean rate on the wall clock, within limits.
		s.idleHz = min(max(float64(c.Len()-1)/dur*s.Speed, MinRateHz), MaxRateHz)
	}
	return nil
}
