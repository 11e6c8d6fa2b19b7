package detect

import (
	"fmt"
	"math"
)

// Config tunes the detector. The zero value with ForceRangeN set gives
// sensible defaults: every zero field takes the default named beside it.
// Forces are in N, displacements in mm, times in s on the recording's axis.
type Config struct {
	// ForceRangeN is the force channel's range (load cell capacity, or the
	// largest force expected). Thresholds scale with it. Required.
	ForceRangeN float64

	// StartFraction of ForceRangeN above the idle baseline is the start
	// threshold (default 0.01), raised to StartNoiseK noise floors when the
	// channel is noisier (default 10).
	StartFraction float64
	StartNoiseK   float64
	// StartSustainS is how long the force must stay above the threshold
	// before the test counts as started (default 0.05 s; always at least
	// two samples), so a knock on the frame is not a start.
	StartSustainS float64
	// PreTriggerS bounds how far before the trigger sample the start may
	// be dated back (default 2 s). The daemon must keep this much history.
	PreTriggerS float64

	// NoiseFloorN is the force channel's noise (one standard deviation).
	// Zero: estimated from the idle samples before the start.
	NoiseFloorN float64
	// TareToleranceFraction of ForceRangeN is the idle reading above which
	// the force is flagged as not tared (default 0.01).
	TareToleranceFraction float64
	// HangerN is the force, above the idle baseline, to which unloads
	// return: a hanger hung after the idle period. Default 0 (the load
	// cell was tared with the hanger on, or there is none).
	HangerN float64

	// SettleMinS is the minimum time the reading must stay settled before
	// a hold is reported (default 1 s). It is also the window over which
	// the settled force and extension are averaged.
	SettleMinS float64
	// SettleNoiseK: the reading is settled when, over SettleMinS, its
	// scatter is within SettleNoiseK noise floors (default 1.3), widened
	// for the chance scatter of few readings: the swing has died out
	// into the noise.
	SettleNoiseK float64
	// HoldBandFraction of ForceRangeN (default 0.005, at least 8 noise
	// floors) is the band a hold's force stays in; leaving it ends the
	// hold, and a settle drifting by more than it is not a hold.
	HoldBandFraction float64
	// HoldCrossheadMaxMMPerS: when the crosshead is read, a hold needs it
	// stopped, i.e. moving slower than this (default 0.002 mm/s). This
	// keeps the flat top of a continuous test from passing for a hold.
	HoldCrossheadMaxMMPerS float64

	// SetThresholdMM is the permanent set that counts as set (for the
	// elastic limit). Zero: six extension noise floors, at least 0.001 mm.
	SetThresholdMM float64

	// BreakDropFraction of the running peak force is the fall, within
	// BreakWindowS, that marks a break (default 0.2). Yield drops and
	// serrated flow fall far less; necking falls far slower.
	BreakDropFraction float64
	// BreakWindowS is the time within which the fall must happen (default
	// 0.05 s, widened to 2.5 sample intervals at low sample rates).
	BreakWindowS float64

	// EndHoldS: a test whose force has rested unloaded this long has ended
	// (default 120 s: longer than an operator takes to read the set
	// between load cycles, far shorter than a night).
	EndHoldS float64
}

// Defaults for the zero fields of Config.
const (
	DefaultStartFraction          = 0.01
	DefaultStartNoiseK            = 10
	DefaultStartSustainS          = 0.05
	DefaultPreTriggerS            = 2
	DefaultTareToleranceFraction  = 0.01
	DefaultSettleMinS             = 1
	DefaultSettleNoiseK           = 1.3
	DefaultHoldBandFraction       = 0.005
	DefaultHoldCrossheadMaxMMPerS = 0.002
	DefaultBreakDropFraction      = 0.2
	DefaultBreakWindowS           = 0.05
	DefaultEndHoldS               = 120
	// minSetThresholdMM is the floor of the automatic set threshold: the
	// resolution of a good dial gauge (common practice).
	minSetThresholdMM = 0.001
	// minNoiseFraction of ForceRangeN floors the estimated noise: about
	// 20 noise-free bits, better than a 24-bit bridge board delivers
	// (from memory). Coarser resolutions are floored by quantum.go.
	minNoiseFraction = 1e-6
)

// withDefaults checks c and fills its zero fields.
func (c Config) withDefaults() (Config, error) {
	if !(c.ForceRangeN > 0) || math.IsInf(c.ForceRangeN, 0) {
		return c, fmt.Errorf("%w: ForceRangeN must be a positive force, got %g", ErrBadConfig, c.ForceRangeN)
	}
	type field struct {
		name string
		v    *float64
		def  float64
		max  float64 // exclusive upper bound, 0 = none
	}
	fields := []field{
		{"StartFraction", &c.StartFraction, DefaultStartFraction, 1},
		{"StartNoiseK", &c.StartNoiseK, DefaultStartNoiseK, 0},
		{"StartSustainS", &c.StartSustainS, DefaultStartSustainS, 0},
		{"PreTriggerS", &c.PreTriggerS, DefaultPreTriggerS, 0},
		{"NoiseFloorN", &c.NoiseFloorN, 0, 0},
		{"TareToleranceFraction", &c.TareToleranceFraction, DefaultTareToleranceFraction, 1},
		{"HangerN", &c.HangerN, 0, 0},
		{"SettleMinS", &c.SettleMinS, DefaultSettleMinS, 0},
		{"SettleNoiseK", &c.SettleNoiseK, DefaultSettleNoiseK, 0},
		{"HoldBandFraction", &c.HoldBandFraction, DefaultHoldBandFraction, 1},
		{"HoldCrossheadMaxMMPerS", &c.HoldCrossheadMaxMMPerS, DefaultHoldCrossheadMaxMMPerS, 0},
		{"SetThresholdMM", &c.SetThresholdMM, 0, 0},
		{"BreakDropFraction", &c.BreakDropFraction, DefaultBreakDropFraction, 1},
		{"BreakWindowS", &c.BreakWindowS, DefaultBreakWindowS, 0},
		{"EndHoldS", &c.EndHoldS, DefaultEndHoldS, 0},
	}
	for _, f := range fields {
		v := *f.v
		if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
			return c, fmt.Errorf("%w: %s must be a finite non-negative number, got %g", ErrBadConfig, f.name, v)
		}
		if f.max > 0 && v >= f.max {
			return c, fmt.Errorf("%w: %s must be below %g, got %g", ErrBadConfig, f.name, f.max, v)
		}
		if v == 0 {
			*f.v = f.def
		}
	}
	if c.HangerN >= c.ForceRangeN {
		return c, fmt.Errorf("%w: HangerN %g must be below ForceRangeN %g", ErrBadConfig, c.HangerN, c.ForceRangeN)
	}
	return c, nil
}
