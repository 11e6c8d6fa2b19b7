package rtusim

import "errors"

// Named errors, checked with errors.Is.
var (
	// ErrBadSlaveID: a slave address outside 1..247.
	ErrBadSlaveID = errors.New("rtusim: slave id must be 1..247")
)
