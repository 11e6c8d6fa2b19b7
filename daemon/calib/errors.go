package calib

import "errors"

// Named errors of the package, checked with errors.Is.
var (
	// ErrTooFewPoints: not enough readings (or not enough distinct
	// indicated values) for the fit or tare asked for.
	ErrTooFewPoints = errors.New("calib: too few points")
	// ErrBadValue: a reading, reference, mass, gravity or model term is NaN,
	// infinite or out of range.
	ErrBadValue = errors.New("calib: bad value")
	// ErrBadDegree: the span model degree is not 1 (linear) or 2 (quadratic).
	ErrBadDegree = errors.New("calib: bad model degree")
	// ErrSingular: the readings cannot determine the model (e.g. all
	// indicated values equal).
	ErrSingular = errors.New("calib: singular fit")
	// ErrNotQuiet: the tare window moved more than allowed.
	ErrNotQuiet = errors.New("calib: tare window not quiet")
	// ErrBadCalibration: a Calibration lacks its channel, ID, time or kind.
	ErrBadCalibration = errors.New("calib: bad calibration")
	// ErrDuplicate: a calibration with the same ID is already stored.
	ErrDuplicate = errors.New("calib: duplicate calibration")
	// ErrCorrupt: a stored calibration cannot be decoded.
	ErrCorrupt = errors.New("calib: corrupt stored calibration")
)
