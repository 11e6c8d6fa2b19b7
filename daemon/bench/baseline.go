package bench

import (
	"encoding/binary"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"time"

	"framed/daemon/store"
	"framed/reduce"
)

// directStore appends total samples from y straight to a fresh store
// through an Appender with its background committer at interval: the
// store's limit without driver, gRPC, calibration or detection. The time
// runs until the last sample is committed.
func directStore(dir string, y *cycler, total int, interval time.Duration) (samplesPerS float64, err error) {
	db, err := store.Open(filepath.Join(dir, "direct.db"), store.Options{CommitInterval: interval})
	if err != nil {
		return 0, err
	}
	defer db.Close()
	if err := db.CreateTest(store.TestMeta{ID: "direct", StartedAt: time.Now().UTC(), State: store.StateRunning}); err != nil {
		return 0, err
	}
	a := db.Appender("direct")
	start := time.Now()
	for n := 0; n < total; {
		b := y.next(min(batchSamples, total-n))
		if err := a.Append(b); err != nil {
			return 0, err
		}
		n += b.Len()
	}
	if err := a.Close(); err != nil {
		return 0, err
	}
	el := time.Since(start)
	meta, err := db.Test("direct")
	if err != nil {
		return 0, err
	}
	if meta.Samples != total {
		return 0, fmt.Errorf("%w: direct store committed %d of %d samples", ErrDaemon, meta.Samples, total)
	}
	return float64(total) / el.Seconds(), nil
}

// plainFile appends the same batches to a plain file, packed as
// little-endian float64 rows (time, force, extension, crosshead), with an
// fsync whenever interval has passed since the last: the disk's own limit
// at the same durability rhythm.
func plainFile(dir string, y *cycler, total int, interval time.Duration) (samplesPerS float64, err error) {
	f, err := os.OpenFile(filepath.Join(dir, "plain.bin"), os.O_CREATE|os.O_WRONLY|os.O_TRUNC, 0o600)
	if err != nil {
		return 0, err
	}
	defer f.Close()
	buf := make([]byte, 0, batchSamples*rawBytesPerSample)
	start := time.Now()
	lastSync := start
	for n := 0; n < total; {
		b := y.next(min(batchSamples, total-n))
		buf = packRows(buf[:0], b)
		if _, err := f.Write(buf); err != nil {
			return 0, err
		}
		n += b.Len()
		if time.Since(lastSync) >= interval {
			if err := f.Sync(); err != nil {
				return 0, err
			}
			lastSync = time.Now()
		}
	}
	if err := f.Sync(); err != nil {
		return 0, err
	}
	return float64(total) / time.Since(start).Seconds(), nil
}

func packRows(dst []byte, c reduce.Curve) []byte {
	for i := range c.TimeS {
		for _, col := range [][]float64{c.TimeS, c.ForceN, c.ExtensionMM, c.CrossheadMM} {
			v := math.NaN()
			if col != nil {
				v = col[i]
			}
			dst = binary.LittleEndian.AppendUint64(dst, math.Float64bits(v))
		}
	}
	return dst
}

// commitTimes commits n groups of perCommit samples, one transaction each,
// and returns how long each commit took: with the commit interval, the
// longest says how long a sample can wait before it is durable.
func commitTimes(dir string, y *cycler, perCommit, n int) ([]time.Duration, error) {
	db, err := store.Open(filepath.Join(dir, "commits.db"), store.Options{ManualCommit: true})
	if err != nil {
		return nil, err
	}
	defer db.Close()
	if err := db.CreateTest(store.TestMeta{ID: "commits", StartedAt: time.Now().UTC(), State: store.StateRunning}); err != nil {
		return nil, err
	}
	a := db.Appender("commits")
	out := make([]time.Duration, 0, n)
	for range n {
		for k := 0; k < perCommit; {
			b := y.next(min(batchSamples, perCommit-k))
			if err := a.Append(b); err != nil {
				return nil, err
			}
			k += b.Len()
		}
		start := time.Now()
		if err := a.Flush(); err != nil {
			return nil, err
		}
		out = append(out, time.Since(start))
	}
	slices.Sort(out)
	return out, a.Close()
}
