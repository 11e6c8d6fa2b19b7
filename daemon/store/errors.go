package store

import "errors"

// Named errors of the store. Check them with errors.Is; the store wraps them
// with the test id or key involved.
var (
	// ErrNotFound: no test, result or outbox entry with that id.
	ErrNotFound = errors.New("store: not found")
	// ErrExists: CreateTest was given an id that is already stored.
	ErrExists = errors.New("store: already exists")
	// ErrOutboxFull: the outbox holds Options.OutboxMax items. The result
	// that met it is stored all the same; only its delivery waits.
	ErrOutboxFull = errors.New("store: outbox full")
	// ErrNotDelivered: a test whose latest result revision has not been
	// acknowledged by the broker may not be deleted.
	ErrNotDelivered = errors.New("store: result not yet delivered")
	// ErrCorrupt: a stored value failed its checksum or does not decode, or
	// the buckets disagree with each other.
	ErrCorrupt = errors.New("store: corrupt")
	// ErrLocked: another process holds the database file open.
	ErrLocked = errors.New("store: database is locked by another process")
	// ErrBadState: an unknown test state or an empty/invalid test id.
	ErrBadState = errors.New("store: bad test state or id")
	// ErrBadBatch: an appended curve has columns of unequal length.
	ErrBadBatch = errors.New("store: bad sample batch")
	// ErrBadDocument: a result document that is not valid JSON.
	ErrBadDocument = errors.New("store: result document is not JSON")
	// ErrClosed: the appender or database was closed.
	ErrClosed = errors.New("store: closed")
)
