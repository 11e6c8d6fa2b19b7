package verify

import "errors"

// Named errors of the package. Callers check them with errors.Is; the
// returned errors wrap them with the line or force concerned.
var (
	// ErrNoReadings: the input holds no readings at all.
	ErrNoReadings = errors.New("verify: no readings")
	// ErrBadHeader: the CSV header is missing or not the expected columns.
	ErrBadHeader = errors.New("verify: bad CSV header")
	// ErrBadLine: a CSV line has the wrong number of fields or is unreadable.
	ErrBadLine = errors.New("verify: bad CSV line")
	// ErrBadSeries: a series is not 1, 2, 3 or r.
	ErrBadSeries = errors.New("verify: bad series")
	// ErrBadNumber: a number is missing, not a number, not finite, or out
	// of its allowed range (reference forces must be positive).
	ErrBadNumber = errors.New("verify: bad number")
	// ErrDuplicate: the same series was read twice at the same reference.
	ErrDuplicate = errors.New("verify: duplicate reading")
	// ErrBadResolution: the resolution is not a positive finite number.
	ErrBadResolution = errors.New("verify: bad resolution")
	// ErrBadZero: the zero reading after unloading is not finite.
	ErrBadZero = errors.New("verify: bad zero reading")
)
