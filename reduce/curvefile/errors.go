package curvefile

import "errors"

// Named errors; the returned error wraps one with the line number and text.
var (
	// ErrHeader: the first line is not the curve file header.
	ErrHeader = errors.New("curvefile: wrong header")
	// ErrColumns: a line has the wrong number of cells.
	ErrColumns = errors.New("curvefile: wrong number of columns")
	// ErrNumber: a cell is not a finite decimal number (NaN and Inf text
	// are refused; an empty cell is the only way to say "no reading").
	ErrNumber = errors.New("curvefile: bad number")
	// ErrTime: time_s is empty or goes backwards.
	ErrTime = errors.New("curvefile: time not monotone")
	// ErrLineTooLong: a line exceeds MaxLineBytes.
	ErrLineTooLong = errors.New("curvefile: line too long")
	// ErrRead: the underlying reader failed.
	ErrRead = errors.New("curvefile: read failed")
)
