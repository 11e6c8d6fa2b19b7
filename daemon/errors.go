package daemon

import "errors"

// Named errors of the daemon. Check them with errors.Is.
var (
	// ErrBadConfig: the configuration was refused before any I/O.
	ErrBadConfig = errors.New("bad configuration")
	// ErrNoChannel: no driver offers a channel the frame needs (force).
	ErrNoChannel = errors.New("no such channel")
	// ErrDriverStart: a driver process could not be started or configured.
	ErrDriverStart = errors.New("driver failed to start")
	// ErrNotRunning: framectl found no daemon on the control socket.
	ErrNotRunning = errors.New("framed is not running")
)

// firstLine keeps only the first line of a wrapped error's message (plugin
// launch errors carry a page of advice) while errors.Is still sees through.
type firstLine struct{ err error }

func (e firstLine) Error() string {
	s := e.err.Error()
	for i := 0; i < len(s); i++ {
		if s[i] == '\n' {
			return s[:i]
		}
	}
	return s
}

func (e firstLine) Unwrap() error { return e.err }
