package detectgen

import "errors"

// ErrBadCSV is returned (wrapped, with the line) for a curve file that is
// not in the curve file format.
var ErrBadCSV = errors.New("detectgen: bad curve file")
