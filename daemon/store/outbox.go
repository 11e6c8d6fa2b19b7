package store

import (
	"encoding/binary"
	"encoding/json"
	"fmt"

	"go.etcd.io/bbolt"
)

// OutboxItem is one result revision waiting for the broker's
// acknowledgement.
type OutboxItem struct {
	Seq      uint64
	TestID   string
	Revision int
	Doc      []byte
}

func u64key(v uint64) []byte {
	var k [8]byte
	binary.BigEndian.PutUint64(k[:], v)
	return k[:]
}

func revKey(rev int) []byte {
	var k [4]byte
	binary.BigEndian.PutUint32(k[:], uint32(rev))
	return k[:]
}

func encodeOutboxEntry(id string, rev int) []byte {
	v := binary.AppendUvarint(nil, uint64(rev))
	return append(v, id...)
}

func decodeOutboxEntry(v []byte) (id string, rev int, err error) {
	r, k := binary.Uvarint(v)
	if k <= 0 || r == 0 || r > 1<<31 {
		return "", 0, fmt.Errorf("%w: outbox entry", ErrCorrupt)
	}
	return string(v[k:]), int(r), nil
}

// NextRevision is the revision the next PutResult for the test will get,
// so the caller can write it into the document first. Only one writer
// stores results for a test, so the number holds.
func (db *DB) NextRevision(testID string) (int, error) {
	m, err := db.Test(testID)
	return m.ResultRevision + 1, err
}

// PutResult stores doc as the test's next result revision and queues it
// for delivery, both in one transaction: a result is never stored without
// being queued. When the outbox already holds Options.OutboxMax items the
// result is still stored (and its revision returned) but not queued, and
// the error is ErrOutboxFull; a later PutResult or Requeue queues it.
func (db *DB) PutResult(testID string, doc []byte) (revision int, err error) {
	if !json.Valid(doc) {
		return 0, fmt.Errorf("result of %q: %w", testID, ErrBadDocument)
	}
	var full bool
	err = db.bolt.Update(func(tx *bbolt.Tx) error {
		m, err := getMeta(tx, testID)
		if err != nil {
			return err
		}
		rb, err := tx.Bucket(bucketResults).CreateBucketIfNotExists([]byte(testID))
		if err != nil {
			return fmt.Errorf("result of %q: %w", testID, err)
		}
		revision = m.ResultRevision + 1
		if err := rb.Put(revKey(revision), append([]byte(nil), doc...)); err != nil {
			return fmt.Errorf("result of %q: %w", testID, err)
		}
		m.ResultRevision = revision
		if err := putMeta(tx, &m); err != nil {
			return err
		}
		ob := tx.Bucket(bucketOutbox)
		if ob.Stats().KeyN >= db.opt.OutboxMax {
			full = true
			return nil
		}
		return enqueue(ob, testID, revision)
	})
	if err != nil {
		return 0, err
	}
	if full {
		return revision, fmt.Errorf("result %q revision %d stored, not queued: %w (%d items)", testID, revision, ErrOutboxFull, db.opt.OutboxMax)
	}
	return revision, nil
}

func enqueue(ob *bbolt.Bucket, testID string, rev int) error {
	seq, err := ob.NextSequence()
	if err != nil {
		return err
	}
	return ob.Put(u64key(seq), encodeOutboxEntry(testID, rev))
}

// Requeue queues the latest result of a test again unless it is already
// waiting or delivered: the way out after ErrOutboxFull.
func (db *DB) Requeue(testID string) error {
	return db.bolt.Update(func(tx *bbolt.Tx) error {
		m, err := getMeta(tx, testID)
		if err != nil {
			return err
		}
		if m.ResultRevision == 0 {
			return fmt.Errorf("result of %q: %w", testID, ErrNotFound)
		}
		if delivered(tx, testID) >= m.ResultRevision {
			return nil
		}
		ob := tx.Bucket(bucketOutbox)
		c := ob.Cursor()
		for k, v := c.First(); k != nil; k, v = c.Next() {
			if id, rev, err := decodeOutboxEntry(v); err == nil && id == testID && rev == m.ResultRevision {
				return nil
			}
		}
		if ob.Stats().KeyN >= db.opt.OutboxMax {
			return fmt.Errorf("requeue %q: %w", testID, ErrOutboxFull)
		}
		return enqueue(ob, testID, m.ResultRevision)
	})
}

// Result returns the latest result revision of a test.
func (db *DB) Result(testID string) (doc []byte, revision int, err error) {
	err = db.bolt.View(func(tx *bbolt.Tx) error {
		m, err := getMeta(tx, testID)
		if err != nil {
			return err
		}
		if m.ResultRevision == 0 {
			return fmt.Errorf("result of %q: %w", testID, ErrNotFound)
		}
		doc, err = resultDoc(tx, testID, m.ResultRevision)
		revision = m.ResultRevision
		return err
	})
	return doc, revision, err
}

func resultDoc(tx *bbolt.Tx, testID string, rev int) ([]byte, error) {
	rb := tx.Bucket(bucketResults).Bucket([]byte(testID))
	if rb == nil {
		return nil, fmt.Errorf("result %q revision %d: %w", testID, rev, ErrNotFound)
	}
	v := rb.Get(revKey(rev))
	if v == nil {
		return nil, fmt.Errorf("result %q revision %d: %w", testID, rev, ErrNotFound)
	}
	return append([]byte(nil), v...), nil
}

// OutboxPending returns up to max waiting items, oldest first.
func (db *DB) OutboxPending(max int) ([]OutboxItem, error) {
	var out []OutboxItem
	err := db.bolt.View(func(tx *bbolt.Tx) error {
		c := tx.Bucket(bucketOutbox).Cursor()
		for k, v := c.First(); k != nil && len(out) < max; k, v = c.Next() {
			id, rev, err := decodeOutboxEntry(v)
			if err != nil {
				return err
			}
			doc, err := resultDoc(tx, id, rev)
			if err != nil {
				return fmt.Errorf("outbox %x: %w: %v", k, ErrCorrupt, err)
			}
			out = append(out, OutboxItem{Seq: binary.BigEndian.Uint64(k), TestID: id, Revision: rev, Doc: doc})
		}
		return nil
	})
	return out, err
}

// OutboxLen is the number of items waiting.
func (db *DB) OutboxLen() (int, error) {
	var n int
	err := db.bolt.View(func(tx *bbolt.Tx) error {
		n = tx.Bucket(bucketOutbox).Stats().KeyN
		return nil
	})
	return n, err
}

// OutboxDone removes an item once the broker has acknowledged it (PUBACK)
// and records its revision as delivered. An unknown seq is ErrNotFound.
func (db *DB) OutboxDone(seq uint64) error {
	return db.bolt.Update(func(tx *bbolt.Tx) error {
		ob := tx.Bucket(bucketOutbox)
		v := ob.Get(u64key(seq))
		if v == nil {
			return fmt.Errorf("outbox item %d: %w", seq, ErrNotFound)
		}
		id, rev, err := decodeOutboxEntry(v)
		if err != nil {
			return err
		}
		if err := ob.Delete(u64key(seq)); err != nil {
			return err
		}
		if rev > delivered(tx, id) {
			return tx.Bucket(bucketDelivered).Put([]byte(id), revKey(rev))
		}
		return nil
	})
}

// Delivered is the highest result revision of a test the broker has
// acknowledged, 0 for none.
func (db *DB) Delivered(testID string) (revision int) {
	_ = db.bolt.View(func(tx *bbolt.Tx) error {
		revision = delivered(tx, testID)
		return nil
	})
	return revision
}

func delivered(tx *bbolt.Tx, id string) int {
	v := tx.Bucket(bucketDelivered).Get([]byte(id))
	if len(v) != 4 {
		return 0
	}
	return int(binary.BigEndian.Uint32(v))
}

func dropOutboxOf(tx *bbolt.Tx, id string) error {
	ob := tx.Bucket(bucketOutbox)
	var drop [][]byte
	c := ob.Cursor()
	for k, v := c.First(); k != nil; k, v = c.Next() {
		if eid, _, err := decodeOutboxEntry(v); err == nil && eid == id {
			drop = append(drop, append([]byte(nil), k...))
		}
	}
	for _, k := range drop {
		if err := ob.Delete(k); err != nil {
			return err
		}
	}
	return nil
}
