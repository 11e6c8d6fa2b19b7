package store

import (
	"encoding/json"
	"fmt"
	"slices"
	"time"

	"go.etcd.io/bbolt"
)

// Test states.
const (
	StateRunning     = "running"
	StateEnded       = "ended"
	StateInterrupted = "interrupted"
	StateReduced     = "reduced"
)

func validState(s string) bool {
	switch s {
	case StateRunning, StateEnded, StateInterrupted, StateReduced:
		return true
	}
	return false
}

// TestMeta describes one stored test. Its JSON is the element of
// `framectl tests --json` (test_id, started_at, state, samples,
// result_revision are a contract; the rest are extensions).
type TestMeta struct {
	ID        string          `json:"test_id"`
	Frame     string          `json:"frame,omitempty"`
	StartedAt time.Time       `json:"started_at"`
	State     string          `json:"state"`
	Specimen  json.RawMessage `json:"specimen,omitempty"`
	// Samples is the number of committed samples.
	Samples int `json:"samples"`
	// ResultRevision is the latest stored result revision, 0 for none.
	ResultRevision int      `json:"result_revision"`
	Flags          []string `json:"flags,omitempty"`
	// StoredBytes is the size of the committed sample chunks (retention).
	StoredBytes int64 `json:"stored_bytes"`
}

func validID(id string) bool {
	return id != "" && len(id) <= 200
}

// CreateTest stores a new test. Samples, ResultRevision and StoredBytes are
// the store's to count and are ignored here.
func (db *DB) CreateTest(meta TestMeta) error {
	if !validID(meta.ID) {
		return fmt.Errorf("create test %q: %w: empty or over-long id", meta.ID, ErrBadState)
	}
	if meta.State == "" {
		meta.State = StateRunning
	}
	if !validState(meta.State) {
		return fmt.Errorf("create test %q: %w: state %q", meta.ID, ErrBadState, meta.State)
	}
	if len(meta.Specimen) > 0 && !json.Valid(meta.Specimen) {
		return fmt.Errorf("create test %q: %w: specimen is not JSON", meta.ID, ErrBadState)
	}
	meta.Samples, meta.ResultRevision, meta.StoredBytes = 0, 0, 0
	return db.bolt.Update(func(tx *bbolt.Tx) error {
		if tx.Bucket(bucketTests).Get([]byte(meta.ID)) != nil {
			return fmt.Errorf("create test %q: %w", meta.ID, ErrExists)
		}
		if _, err := tx.Bucket(bucketSamples).CreateBucket([]byte(meta.ID)); err != nil {
			return fmt.Errorf("create test %q: samples bucket: %w", meta.ID, err)
		}
		return putMeta(tx, &meta)
	})
}

// SetTestState records a new state and adds flags (kept once each, in the
// order first given).
func (db *DB) SetTestState(id, state string, flags ...string) error {
	if !validState(state) {
		return fmt.Errorf("set state of %q: %w: state %q", id, ErrBadState, state)
	}
	return db.bolt.Update(func(tx *bbolt.Tx) error {
		m, err := getMeta(tx, id)
		if err != nil {
			return err
		}
		m.State = state
		for _, f := range flags {
			if !slices.Contains(m.Flags, f) {
				m.Flags = append(m.Flags, f)
			}
		}
		return putMeta(tx, &m)
	})
}

// Test returns one test's metadata.
func (db *DB) Test(id string) (TestMeta, error) {
	var m TestMeta
	err := db.bolt.View(func(tx *bbolt.Tx) error {
		var err error
		m, err = getMeta(tx, id)
		return err
	})
	return m, err
}

// Tests lists every stored test, oldest start first.
func (db *DB) Tests() ([]TestMeta, error) {
	out := []TestMeta{}
	err := db.bolt.View(func(tx *bbolt.Tx) error {
		return tx.Bucket(bucketTests).ForEach(func(k, v []byte) error {
			var m TestMeta
			if err := json.Unmarshal(v, &m); err != nil {
				return fmt.Errorf("test %q: %w: %v", k, ErrCorrupt, err)
			}
			out = append(out, m)
			return nil
		})
	})
	slices.SortStableFunc(out, func(a, b TestMeta) int { return a.StartedAt.Compare(b.StartedAt) })
	return out, err
}

// DeleteTest removes a test with its samples and results. It refuses with
// ErrNotDelivered while the latest result revision has not been
// acknowledged, so retention can never lose an undelivered result.
func (db *DB) DeleteTest(id string) error {
	return db.bolt.Update(func(tx *bbolt.Tx) error {
		m, err := getMeta(tx, id)
		if err != nil {
			return err
		}
		if d := delivered(tx, id); m.ResultRevision > d {
			return fmt.Errorf("delete test %q: %w (revision %d stored, %d delivered)", id, ErrNotDelivered, m.ResultRevision, d)
		}
		key := []byte(id)
		for _, name := range [][]byte{bucketSamples, bucketResults} {
			if b := tx.Bucket(name); b.Bucket(key) != nil {
				if err := b.DeleteBucket(key); err != nil {
					return fmt.Errorf("delete test %q: %w", id, err)
				}
			}
		}
		if err := dropOutboxOf(tx, id); err != nil {
			return err
		}
		if err := tx.Bucket(bucketDelivered).Delete(key); err != nil {
			return err
		}
		return tx.Bucket(bucketTests).Delete(key)
	})
}

func getMeta(tx *bbolt.Tx, id string) (TestMeta, error) {
	var m TestMeta
	v := tx.Bucket(bucketTests).Get([]byte(id))
	if v == nil {
		return m, fmt.Errorf("test %q: %w", id, ErrNotFound)
	}
	if err := json.Unmarshal(v, &m); err != nil {
		return m, fmt.Errorf("test %q: %w: %v", id, ErrCorrupt, err)
	}
	return m, nil
}

func putMeta(tx *bbolt.Tx, m *TestMeta) error {
	v, err := json.Marshal(m)
	if err != nil {
		return fmt.Errorf("test %q: %w", m.ID, err)
	}
	return tx.Bucket(bucketTests).Put([]byte(m.ID), v)
}
