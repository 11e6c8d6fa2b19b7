package store

import (
	"encoding/binary"
	"fmt"

	"go.etcd.io/bbolt"

	"framed/reduce"
)

func checkBatch(c *reduce.Curve) error {
	n := len(c.TimeS)
	for k, col := range columns(c) {
		if col != nil && len(col) != n {
			return fmt.Errorf("%w: column %d has %d samples, time has %d", ErrBadBatch, k, len(col), n)
		}
	}
	return nil
}

// WriteSamples commits c to the test in one transaction of its own. It is
// the plain, unbuffered path (and the baseline the buffered Appender is
// measured against); live acquisition should use an Appender.
func (db *DB) WriteSamples(id string, c reduce.Curve) error {
	if err := checkBatch(&c); err != nil {
		return err
	}
	var buf []byte
	return db.bolt.Update(func(tx *bbolt.Tx) error {
		_, err := writeChunks(tx, id, &c, db.opt.ChunkSamples, &buf)
		return err
	})
}

// writeChunks stores c as chunks of at most chunkSamples after the test's
// last chunk and updates its counts, all in tx. buf is scratch space kept
// by the caller so steady appending does not allocate.
func writeChunks(tx *bbolt.Tx, id string, c *reduce.Curve, chunkSamples int, buf *[]byte) (int, error) {
	n := c.Len()
	if n == 0 {
		return 0, nil
	}
	m, err := getMeta(tx, id)
	if err != nil {
		return 0, err
	}
	b := tx.Bucket(bucketSamples).Bucket([]byte(id))
	if b == nil {
		return 0, fmt.Errorf("test %q: %w: samples bucket missing", id, ErrCorrupt)
	}
	// Keys only grow, so pages fill completely instead of splitting half
	// empty.
	b.FillPercent = 1.0
	var seq uint64
	if k, _ := b.Cursor().Last(); k != nil {
		if len(k) != 8 {
			return 0, fmt.Errorf("test %q: %w: chunk key of %d bytes", id, ErrCorrupt, len(k))
		}
		seq = binary.BigEndian.Uint64(k) + 1
	}
	var key [8]byte
	for from := 0; from < n; from += chunkSamples {
		to := min(from+chunkSamples, n)
		*buf = encodeChunk((*buf)[:0], c, from, to)
		binary.BigEndian.PutUint64(key[:], seq)
		// bbolt keeps the slices until commit: give it copies.
		v := append([]byte(nil), *buf...)
		if err := b.Put(append([]byte(nil), key[:]...), v); err != nil {
			return 0, fmt.Errorf("test %q: put chunk %d: %w", id, seq, err)
		}
		m.StoredBytes += int64(len(v) + len(key))
		seq++
	}
	m.Samples += n
	return n, putMeta(tx, &m)
}

// ReadSamples returns every committed sample of a test in one sequential
// pass: the columns are allocated once from the committed count and each
// chunk decodes straight into place. A column no chunk holds is nil.
func (db *DB) ReadSamples(id string) (reduce.Curve, error) {
	var out reduce.Curve
	err := db.bolt.View(func(tx *bbolt.Tx) error {
		m, err := getMeta(tx, id)
		if err != nil {
			return err
		}
		b := tx.Bucket(bucketSamples).Bucket([]byte(id))
		if b == nil {
			return fmt.Errorf("test %q: %w: samples bucket missing", id, ErrCorrupt)
		}
		var cols [numColumns][]float64
		for k := range cols {
			cols[k] = make([]float64, m.Samples)
		}
		var present uint8
		off := 0
		c := b.Cursor()
		for k, v := c.First(); k != nil; k, v = c.Next() {
			n, err := chunkCount(v)
			if err != nil {
				return fmt.Errorf("test %q chunk %x: %w", id, k, err)
			}
			if off+n > m.Samples {
				return fmt.Errorf("test %q: %w: chunks hold more than the %d samples counted", id, ErrCorrupt, m.Samples)
			}
			_, p, err := decodeChunk(v, cols, off)
			if err != nil {
				return fmt.Errorf("test %q chunk %x: %w", id, k, err)
			}
			present |= p
			off += n
		}
		if off != m.Samples {
			return fmt.Errorf("test %q: %w: chunks hold %d samples, %d counted", id, ErrCorrupt, off, m.Samples)
		}
		for k := range cols {
			if present&(1<<k) == 0 && k > 0 {
				cols[k] = nil
			}
		}
		out = reduce.Curve{TimeS: cols[0], ForceN: cols[1], ExtensionMM: cols[2], CrossheadMM: cols[3]}
		return nil
	})
	return out, err
}
