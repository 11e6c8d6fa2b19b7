package store

import (
	"encoding/binary"
	"errors"
	"fmt"

	"go.etcd.io/bbolt"
)

// Check verifies the file (bbolt's own page check) and this package's
// invariants: every test has its samples bucket; its chunks are numbered
// 0, 1, 2, ... without gaps, each decodes with a good checksum, and they
// hold exactly the counted samples; every result revision up to the
// counted one exists; every outbox entry refers to a stored result; no
// test is marked delivered past its latest revision. All problems found
// are joined into one error wrapping ErrCorrupt.
func (db *DB) Check() error {
	var errs []error
	err := db.bolt.View(func(tx *bbolt.Tx) error {
		for e := range tx.Check() {
			errs = append(errs, fmt.Errorf("%w: bbolt: %v", ErrCorrupt, e))
		}
		err := tx.Bucket(bucketTests).ForEach(func(k, v []byte) error {
			m, err := getMeta(tx, string(k))
			if err != nil {
				errs = append(errs, err)
				return nil
			}
			errs = append(errs, checkSamples(tx, m)...)
			for rev := 1; rev <= m.ResultRevision; rev++ {
				if _, err := resultDoc(tx, m.ID, rev); err != nil {
					errs = append(errs, fmt.Errorf("%w: %v", ErrCorrupt, err))
				}
			}
			if d := delivered(tx, m.ID); d > m.ResultRevision {
				errs = append(errs, fmt.Errorf("%w: test %q delivered revision %d of %d", ErrCorrupt, m.ID, d, m.ResultRevision))
			}
			return nil
		})
		if err != nil {
			return err
		}
		return tx.Bucket(bucketOutbox).ForEach(func(k, v []byte) error {
			id, rev, err := decodeOutboxEntry(v)
			if err != nil {
				errs = append(errs, fmt.Errorf("outbox %x: %w", k, err))
				return nil
			}
			if _, err := resultDoc(tx, id, rev); err != nil {
				errs = append(errs, fmt.Errorf("%w: outbox %x: %v", ErrCorrupt, k, err))
			}
			return nil
		})
	})
	if err != nil {
		errs = append(errs, err)
	}
	return errors.Join(errs...)
}

func checkSamples(tx *bbolt.Tx, m TestMeta) []error {
	b := tx.Bucket(bucketSamples).Bucket([]byte(m.ID))
	if b == nil {
		return []error{fmt.Errorf("%w: test %q has no samples bucket", ErrCorrupt, m.ID)}
	}
	var errs []error
	var want uint64
	total := 0
	var bytes int64
	c := b.Cursor()
	for k, v := c.First(); k != nil; k, v = c.Next() {
		if len(k) != 8 || binary.BigEndian.Uint64(k) != want {
			errs = append(errs, fmt.Errorf("%w: test %q chunk key %x, want seq %d", ErrCorrupt, m.ID, k, want))
			if len(k) == 8 {
				want = binary.BigEndian.Uint64(k)
			}
		}
		want++
		cv, err := decodeChunkCurve(v)
		if err != nil {
			errs = append(errs, fmt.Errorf("test %q chunk %x: %w", m.ID, k, err))
			continue
		}
		total += cv.Len()
		bytes += int64(len(k) + len(v))
	}
	if total != m.Samples {
		errs = append(errs, fmt.Errorf("%w: test %q chunks hold %d samples, %d counted", ErrCorrupt, m.ID, total, m.Samples))
	}
	if bytes != m.StoredBytes {
		errs = append(errs, fmt.Errorf("%w: test %q chunks take %d bytes, %d counted", ErrCorrupt, m.ID, bytes, m.StoredBytes))
	}
	return errs
}
