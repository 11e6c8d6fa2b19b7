package store

import (
	"math"
	"sync"
	"time"

	"go.etcd.io/bbolt"

	"framed/reduce"
)

// Appender buffers one test's samples in memory and commits them in
// groups, so the fsync of a bbolt transaction is paid once per commit
// interval rather than once per batch.
//
// Unless Options.ManualCommit is set, a background committer commits the
// buffer every Options.CommitInterval; with ManualCommit the caller calls
// Tick from its own loop. Either way the data at risk on a power cut is
// what was appended since the last commit: at most one interval plus the
// duration of one commit. Flush commits at once.
//
// A failed commit (disk full, say) keeps the samples in memory, reports the
// error from the next Append, Flush or Tick, and is retried at the next
// interval: samples already handed over are never dropped.
type Appender struct {
	db *DB
	id string

	commitMu sync.Mutex // one commit at a time, in order
	scratch  []byte     // encoding buffer, under commitMu

	mu           sync.Mutex
	buf          pending
	spare        pending
	pendingSince time.Time
	err          error
	committed    int
	closed       bool

	stop chan struct{}
	done chan struct{}
}

// pending is a columnar buffer whose slices are reused between commits;
// has[k] says whether column k is present (a nil column in the curves
// appended so far means NaN for those samples).
type pending struct {
	cols [numColumns][]float64
	has  [numColumns]bool
}

func (p *pending) len() int { return len(p.cols[0]) }

func (p *pending) reset() {
	for k := range p.cols {
		p.cols[k] = p.cols[k][:0]
		p.has[k] = false
	}
}

func (p *pending) add(c *reduce.Curve) {
	n0 := p.len()
	src := columns(c)
	for k, s := range src {
		switch {
		case s != nil && !p.has[k] && k > 0:
			// A channel that appears mid-buffer: earlier samples had no
			// reading.
			p.cols[k] = appendNaN(p.cols[k][:0], n0)
			p.has[k] = true
			p.cols[k] = append(p.cols[k], s...)
		case s != nil:
			p.has[k] = true
			p.cols[k] = append(p.cols[k], s...)
		case p.has[k]:
			p.cols[k] = appendNaN(p.cols[k], len(c.TimeS))
		}
	}
}

// addPending appends all of q to p (used to put back a failed commit).
func (p *pending) addPending(q *pending) {
	c := q.curve()
	p.add(&c)
}

func (p *pending) curve() reduce.Curve {
	var c [numColumns][]float64
	for k := range c {
		if p.has[k] || k == 0 {
			c[k] = p.cols[k]
		}
	}
	return reduce.Curve{TimeS: c[0], ForceN: c[1], ExtensionMM: c[2], CrossheadMM: c[3]}
}

func appendNaN(v []float64, n int) []float64 {
	nan := math.NaN()
	for i := 0; i < n; i++ {
		v = append(v, nan)
	}
	return v
}

// Appender returns the appender of a test, creating it (and its background
// committer) on first use. The test must have been created with CreateTest;
// if not, commits fail with ErrNotFound.
func (db *DB) Appender(testID string) *Appender {
	db.mu.Lock()
	defer db.mu.Unlock()
	if a, ok := db.appenders[testID]; ok {
		return a
	}
	a := &Appender{db: db, id: testID}
	db.appenders[testID] = a
	if !db.opt.ManualCommit {
		a.stop = make(chan struct{})
		a.done = make(chan struct{})
		go a.run(db.opt.CommitInterval)
	}
	return a
}

func (a *Appender) run(interval time.Duration) {
	defer close(a.done)
	t := time.NewTicker(interval)
	defer t.Stop()
	for {
		select {
		case <-a.stop:
			return
		case <-t.C:
			if err := a.commit(); err != nil {
				a.mu.Lock()
				a.err = err // reported by the next Append, Tick or Flush
				a.mu.Unlock()
			}
		}
	}
}

// Append buffers c (copied; the caller may reuse it). It does not wait for
// disk. It returns an earlier commit's error, if any, once.
func (a *Appender) Append(c reduce.Curve) error {
	if err := checkBatch(&c); err != nil {
		return err
	}
	a.mu.Lock()
	defer a.mu.Unlock()
	if a.closed {
		return ErrClosed
	}
	if c.Len() == 0 {
		return nil
	}
	if a.buf.len() == 0 {
		a.pendingSince = time.Now()
	}
	a.buf.add(&c)
	err := a.err
	a.err = nil
	return err
}

// Tick commits when the oldest buffered sample has waited a commit
// interval. It is for callers that set Options.ManualCommit.
func (a *Appender) Tick(now time.Time) error {
	a.mu.Lock()
	due := a.buf.len() > 0 && now.Sub(a.pendingSince) >= a.db.opt.CommitInterval
	err := a.err
	a.err = nil
	a.mu.Unlock()
	if !due {
		return err
	}
	return a.commit()
}

// Flush commits everything buffered now.
func (a *Appender) Flush() error {
	err := a.commit()
	a.mu.Lock()
	a.err = nil // superseded: this commit's outcome is the news
	a.mu.Unlock()
	return err
}

// Committed is the number of samples this appender has committed.
func (a *Appender) Committed() int {
	a.mu.Lock()
	defer a.mu.Unlock()
	return a.committed
}

// Close stops the committer and commits what is left. Appending after
// Close fails with ErrClosed.
func (a *Appender) Close() error {
	a.mu.Lock()
	if a.closed {
		a.mu.Unlock()
		return nil
	}
	a.closed = true
	a.mu.Unlock()
	if a.stop != nil {
		close(a.stop)
		<-a.done
	}
	err := a.Flush()
	a.db.mu.Lock()
	if a.db.appenders[a.id] == a {
		delete(a.db.appenders, a.id)
	}
	a.db.mu.Unlock()
	return err
}

// commit writes the buffer in one transaction. The buffers swap so that
// Append can go on filling while the transaction runs.
func (a *Appender) commit() error {
	a.commitMu.Lock()
	defer a.commitMu.Unlock()
	a.mu.Lock()
	if a.buf.len() == 0 {
		a.mu.Unlock()
		return nil
	}
	work := a.buf
	a.buf = a.spare
	a.buf.reset()
	a.mu.Unlock()

	c := work.curve()
	var n int
	err := a.db.bolt.Update(func(tx *bbolt.Tx) error {
		var err error
		n, err = writeChunks(tx, a.id, &c, a.db.opt.ChunkSamples, &a.scratch)
		return err
	})

	a.mu.Lock()
	defer a.mu.Unlock()
	if err != nil {
		// Put the samples back in front of whatever came in meanwhile.
		work.addPending(&a.buf)
		a.spare = a.buf
		a.buf = work
		return err
	}
	a.committed += n
	a.spare = work
	if a.buf.len() > 0 {
		a.pendingSince = time.Now()
	}
	return nil
}
