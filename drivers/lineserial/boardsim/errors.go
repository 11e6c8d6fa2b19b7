package boardsim

import "errors"

// Named errors, checked with errors.Is.
var (
	// ErrBadCell: a load-cell parameter that is not finite or out of range.
	ErrBadCell = errors.New("boardsim: bad load-cell parameter")
	// ErrBadLoad: a load command that is not a mass or force.
	ErrBadLoad = errors.New("boardsim: bad load")
	// ErrBadScript: a load script that cannot be read.
	ErrBadScript = errors.New("boardsim: bad load script")
	// ErrBadRate: a line rate that is not positive and finite.
	ErrBadRate = errors.New("boardsim: bad line rate")
	// ErrLink: the pty or its symlink could not be set up.
	ErrLink = errors.New("boardsim: pty link")
)
