package lineserial

import "errors"

// Named errors of the line parser, checked with errors.Is. They are
// counted in Health, never fatal to a stream.
var (
	// ErrGarbled: the line does not have the configured layout (missing
	// or extra fields, text where a number belongs, a partial line).
	ErrGarbled = errors.New("lineserial: garbled line")
	// ErrChecksum: the line's checksum is missing or does not match.
	ErrChecksum = errors.New("lineserial: checksum mismatch")
)
