package store

import (
	"errors"
	"fmt"
	"sync"
	"time"

	"go.etcd.io/bbolt"
	bolterrors "go.etcd.io/bbolt/errors"
)

// Options tune a store. The zero value gives the defaults.
type Options struct {
	// CommitInterval is the longest an appended sample waits in memory
	// before its transaction commits (the data-at-risk window). Default
	// 100 ms.
	CommitInterval time.Duration
	// ManualCommit stops appenders from starting their background
	// committer; the caller then commits with Appender.Tick or Flush.
	ManualCommit bool
	// OutboxMax bounds the outbox; PutResult returns ErrOutboxFull past it.
	// Default 10000.
	OutboxMax int
	// LockTimeout is how long Open waits for another process to let go of
	// the file before it fails with ErrLocked. Default 1 s.
	LockTimeout time.Duration
	// ChunkSamples is the most samples one stored chunk holds. Default 64:
	// bbolt rewrites a leaf page whole on every commit that adds to it and
	// does not split a leaf of four keys or fewer, so big chunks made every
	// 100 ms commit rewrite tens of kB of older samples (write
	// amplification near 7 at 10 kHz); 64-sample chunks (about 1.6 kB)
	// fill leaves that then stay untouched (about 2.4), which is what an
	// SD card's wear is about.
	ChunkSamples int
}

func (o Options) withDefaults() Options {
	if o.CommitInterval <= 0 {
		o.CommitInterval = 100 * time.Millisecond
	}
	if o.OutboxMax <= 0 {
		o.OutboxMax = 10000
	}
	if o.LockTimeout <= 0 {
		o.LockTimeout = time.Second
	}
	if o.ChunkSamples <= 0 {
		o.ChunkSamples = 64
	}
	return o
}

// Bucket names.
var (
	bucketTests     = []byte("tests")
	bucketSamples   = []byte("samples")
	bucketResults   = []byte("results")
	bucketOutbox    = []byte("outbox")
	bucketDelivered = []byte("delivered")
)

// DB is an open store. Its methods are safe for concurrent use.
type DB struct {
	bolt *bbolt.DB
	opt  Options

	mu        sync.Mutex
	appenders map[string]*Appender
}

// Open opens (or creates) the store file at path.
func Open(path string, opt Options) (*DB, error) {
	opt = opt.withDefaults()
	b, err := bbolt.Open(path, 0o600, &bbolt.Options{Timeout: opt.LockTimeout})
	if err != nil {
		if errors.Is(err, bolterrors.ErrTimeout) {
			return nil, fmt.Errorf("open %s: %w (waited %v)", path, ErrLocked, opt.LockTimeout)
		}
		return nil, fmt.Errorf("open %s: %w", path, err)
	}
	err = b.Update(func(tx *bbolt.Tx) error {
		for _, name := range [][]byte{bucketTests, bucketSamples, bucketResults, bucketOutbox, bucketDelivered} {
			if _, err := tx.CreateBucketIfNotExists(name); err != nil {
				return err
			}
		}
		return nil
	})
	if err != nil {
		b.Close()
		return nil, fmt.Errorf("open %s: create buckets: %w", path, err)
	}
	return &DB{bolt: b, opt: opt, appenders: map[string]*Appender{}}, nil
}

// Bolt gives other packages the underlying database for buckets of their
// own (calibrations, for example). They must not touch this package's
// buckets.
func (db *DB) Bolt() *bbolt.DB { return db.bolt }

// Options returns the options in force, defaults filled in.
func (db *DB) Options() Options { return db.opt }

// Close flushes and closes every open appender, then the file.
func (db *DB) Close() error {
	db.mu.Lock()
	apps := make([]*Appender, 0, len(db.appenders))
	for _, a := range db.appenders {
		apps = append(apps, a)
	}
	db.mu.Unlock()
	var first error
	for _, a := range apps {
		if err := a.Close(); err != nil && first == nil {
			first = err
		}
	}
	if err := db.bolt.Close(); err != nil && first == nil {
		first = err
	}
	return first
}
