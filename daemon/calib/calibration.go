package calib

import (
	"fmt"
	"time"
)

// Kind says how a calibration was made.
type Kind string

// Kinds of calibration.
const (
	// KindTare re-zeroes the channel: only the offset changes.
	KindTare Kind = "tare"
	// KindSpan fits offset, gain (and optionally a quadratic term) to
	// reference weights or forces.
	KindSpan Kind = "span"
)

// Reference is one point of a span calibration: the known value (N for a
// force channel, mm for a displacement channel) and the raw reading the
// channel gave for it.
type Reference struct {
	Reference float64 `json:"reference"`
	Indicated float64 `json:"indicated"`
	// MassKG is the reference mass when the reference is a weight.
	MassKG float64 `json:"mass_kg,omitempty"`
}

// Residual is how far the fitted model misses one reference, in the
// calibration's Unit and in percent of the reference.
type Residual struct {
	Reference float64 `json:"reference"`
	// Residual is model(indicated) - reference.
	Residual float64 `json:"residual"`
	// Pct is 100 Residual / Reference; nil at a zero reference.
	Pct *float64 `json:"pct"`
}

// Calibration is one stored calibration of a channel. Model is the whole
// conversion in force from At on (a tare keeps the previous gain).
type Calibration struct {
	ID      string `json:"id"`
	Channel string `json:"channel"`
	// At is when the calibration was made, passed in by the caller.
	At   time.Time `json:"at"`
	Kind Kind      `json:"kind"`
	// Unit of the calibrated values: "N" or "mm".
	Unit  string `json:"unit,omitempty"`
	Model Model  `json:"model"`
	// Degree of the span fit: 1 linear, 2 quadratic (0 for a tare).
	Degree     int         `json:"degree,omitempty"`
	References []Reference `json:"references,omitempty"`
	Residuals  []Residual  `json:"residuals,omitempty"`
	// StdErr is the standard error of the span fit in Unit,
	// sqrt(sum of squared residuals / (n - parameters)); nil when the fit
	// has no degrees of freedom left.
	StdErr *float64 `json:"std_err,omitempty"`
	// GravityMS2 is the g used to turn reference masses into forces.
	GravityMS2 float64 `json:"gravity_m_s2,omitempty"`
	// Tare is the quiet window behind a tare.
	Tare     *Window `json:"tare,omitempty"`
	Operator string  `json:"operator,omitempty"`
	Note     string  `json:"note,omitempty"`
}

// Apply converts one raw reading with the calibration's model.
func (c Calibration) Apply(raw float64) float64 { return c.Model.Apply(raw) }

// ApplyColumn converts a column of raw readings in place.
func (c Calibration) ApplyColumn(col []float64) { c.Model.ApplyColumn(col) }

// NewID names a calibration by channel and time, so IDs sort and read
// naturally ("force-20260102T030405.000000006Z").
func NewID(channel string, at time.Time) string {
	return channel + "-" + at.UTC().Format("20060102T150405.000000000Z")
}

// Validate says why a calibration cannot be stored, or nil.
func (c Calibration) Validate() error {
	switch {
	case c.Channel == "":
		return fmt.Errorf("%w: no channel", ErrBadCalibration)
	case c.ID == "":
		return fmt.Errorf("%w: no ID", ErrBadCalibration)
	case c.At.IsZero():
		return fmt.Errorf("%w: %q has no time", ErrBadCalibration, c.ID)
	case c.Kind != KindTare && c.Kind != KindSpan:
		return fmt.Errorf("%w: %q has kind %q, want tare or span", ErrBadCalibration, c.ID, c.Kind)
	case !c.Model.finite():
		return fmt.Errorf("%w: %q has a non-finite model %+v", ErrBadCalibration, c.ID, c.Model)
	case c.Model.Gain == 0 && c.Model.Quad == 0:
		return fmt.Errorf("%w: %q has zero gain", ErrBadCalibration, c.ID)
	}
	return nil
}
