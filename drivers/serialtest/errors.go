package serialtest

import "errors"

// Named errors of the helpers, checked with errors.Is.
var (
	// ErrUnread: a playback port was closed while scripted device bytes
	// were still unread or expected writes were still missing, so the
	// driver under test did not consume what the test meant it to.
	ErrUnread = errors.New("serialtest: script not consumed")
	// ErrUnexpectedWrite: the driver wrote bytes the script did not expect.
	ErrUnexpectedWrite = errors.New("serialtest: unexpected write")
	// ErrClosed: the playback port was used after Close.
	ErrClosed = errors.New("serialtest: port closed")
)
