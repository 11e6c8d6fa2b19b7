package detect

import "errors"

// ErrBadConfig is returned by New (wrapped, naming the field) when a Config
// value is negative, not finite, or out of its range.
var ErrBadConfig = errors.New("detect: bad config")
