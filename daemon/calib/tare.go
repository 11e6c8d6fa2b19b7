package calib

import (
	"fmt"
	"math"
	"time"
)

// Window summarises a quiet window of raw readings taken for a tare.
type Window struct {
	MeanRaw float64 `json:"mean_raw"`
	// SDRaw is the sample standard deviation (n - 1), in raw units.
	SDRaw float64 `json:"sd_raw"`
	N     int     `json:"n"`
}

// Quiet summarises raw readings for a tare, skipping NaN (no reading). It
// needs two readings for a standard deviation. When maxSDRaw > 0 and the
// readings scatter more than that, it returns ErrNotQuiet: something was
// moving or loading the cell, and a tare then would offset every result.
func Quiet(raw []float64, maxSDRaw float64) (Window, error) {
	// Welford's update: stable for large counts near a large mean.
	var w Window
	var m2 float64
	for _, x := range raw {
		if math.IsNaN(x) {
			continue
		}
		if math.IsInf(x, 0) {
			return Window{}, fmt.Errorf("%w: infinite reading in tare window", ErrBadValue)
		}
		w.N++
		d := x - w.MeanRaw
		w.MeanRaw += d / float64(w.N)
		m2 += d * (x - w.MeanRaw)
	}
	if w.N < 2 {
		return Window{}, fmt.Errorf("%w: tare needs at least 2 readings, got %d", ErrTooFewPoints, w.N)
	}
	w.SDRaw = math.Sqrt(m2 / float64(w.N-1))
	if maxSDRaw > 0 && w.SDRaw > maxSDRaw {
		return w, fmt.Errorf("%w: standard deviation %.4g raw > allowed %.4g", ErrNotQuiet, w.SDRaw, maxSDRaw)
	}
	return w, nil
}

// NewTare re-zeroes a channel: it keeps prev's gain and quadratic term and
// moves the offset so that the window's mean reads zero. prev is the model
// in force (Identity for a channel without a span).
func NewTare(channel string, at time.Time, prev Model, w Window) (Calibration, error) {
	if !prev.finite() || !finite(w.MeanRaw) || !finite(w.SDRaw) {
		return Calibration{}, fmt.Errorf("%w: tare of %q from model %+v, window %+v", ErrBadValue, channel, prev, w)
	}
	m := prev
	m.Offset -= prev.Apply(w.MeanRaw)
	c := Calibration{ID: NewID(channel, at), Channel: channel, At: at, Kind: KindTare, Model: m, Tare: &w}
	return c, c.Validate()
}

// TareOn re-zeroes the channel of prev, the calibration in force, keeping
// its unit, gain and quadratic term. The span's references stay with the
// span calibration they belong to.
func TareOn(prev Calibration, at time.Time, w Window) (Calibration, error) {
	c, err := NewTare(prev.Channel, at, prev.Model, w)
	c.Unit = prev.Unit
	return c, err
}
