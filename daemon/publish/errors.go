package publish

import "errors"

// Named errors of the publisher. Check them with errors.Is.
var (
	// ErrBadConfig: the configuration was refused before any I/O.
	ErrBadConfig = errors.New("publish: bad configuration")
	// ErrPortInUse: the embedded broker's address is taken, most likely by
	// another broker; point framed at it with --broker instead.
	ErrPortInUse = errors.New("publish: broker port already in use")
	// ErrStarted: Start was called twice.
	ErrStarted = errors.New("publish: already started")
	// ErrBadSpecimen: an inbound specimen message was refused.
	ErrBadSpecimen = errors.New("publish: bad specimen message")
	// ErrBadCommand: a remote command message was malformed or not allowed.
	ErrBadCommand = errors.New("publish: bad remote command")
)
