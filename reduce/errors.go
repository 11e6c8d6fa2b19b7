package reduce

import "errors"

// Named errors for input Reduce cannot use. Check with errors.Is; the
// returned error wraps one of these with the detail.
var (
	// ErrNoSamples: the curve has no samples, or columns of unequal length.
	ErrNoSamples = errors.New("reduce: no usable samples")
	// ErrNoForce: there is no force column or no finite force reading.
	ErrNoForce = errors.New("reduce: no force readings")
	// ErrNoSection: the specimen's cross-section cannot be computed.
	ErrNoSection = errors.New("reduce: no original cross-section S0")
	// ErrNoGaugeLength: a gauge length needed for strain is missing.
	ErrNoGaugeLength = errors.New("reduce: no gauge length")
	// ErrBadOptions: an option is out of range (negative class, proof
	// extension not positive...).
	ErrBadOptions = errors.New("reduce: bad options")
	// ErrNoCalibration: a compliance calibration record is unusable (no
	// crosshead, too few loading points, a bar stiffer than its E says).
	ErrNoCalibration = errors.New("reduce: calibration record unusable")
	// ErrRaggedCurve: the curve's columns differ in length.
	ErrRaggedCurve = errors.New("reduce: columns of unequal length")
)
