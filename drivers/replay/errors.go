package replay

import "errors"

// Named errors of the replay driver. Config errors also wrap
// drivers.ErrBadConfig.
var (
	// ErrFile: the curve file is missing, unreadable or not a curve file.
	ErrFile = errors.New("replay: curve file unusable")
	// ErrEnd: the recording ended and the config asked the stream to
	// close ("at_end": "close").
	ErrEnd = errors.New("replay: end of recording")
)
