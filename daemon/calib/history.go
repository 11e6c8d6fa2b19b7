package calib

import (
	"bytes"
	"encoding/binary"
	"encoding/json"
	"fmt"
	"slices"
	"time"

	"go.etcd.io/bbolt"
)

// bucketName is the bbolt bucket the history lives in. It holds one nested
// bucket per channel; keys there are the calibration time (8 bytes, big
// endian, sign bit flipped so times before 1970 sort too) followed by the
// ID, so a cursor walks a channel's calibrations oldest first.
var bucketName = []byte("calibrations")

// History is the stored record of every calibration, in the daemon's bbolt
// database. Nothing is ever overwritten or deleted: a result can always name
// the calibration it used. It is safe for concurrent use (bbolt serialises
// writers and gives readers consistent snapshots).
type History struct {
	db *bbolt.DB
}

// NewHistory opens (creating if needed) the history's bucket in db.
func NewHistory(db *bbolt.DB) (*History, error) {
	if err := db.Update(func(tx *bbolt.Tx) error {
		_, err := tx.CreateBucketIfNotExists(bucketName)
		return err
	}); err != nil {
		return nil, fmt.Errorf("calib: create bucket: %w", err)
	}
	return &History{db: db}, nil
}

func key(c Calibration) []byte {
	k := make([]byte, 8, 8+len(c.ID))
	binary.BigEndian.PutUint64(k, uint64(c.At.UnixNano())^(1<<63))
	return append(k, c.ID...)
}

// Save stores c. It refuses an invalid calibration and one whose ID the
// channel already holds.
func (h *History) Save(c Calibration) error {
	if err := c.Validate(); err != nil {
		return err
	}
	v, err := json.Marshal(c)
	if err != nil {
		return fmt.Errorf("calib: encode %q: %w", c.ID, err)
	}
	return h.db.Update(func(tx *bbolt.Tx) error {
		b, err := tx.Bucket(bucketName).CreateBucketIfNotExists([]byte(c.Channel))
		if err != nil {
			return fmt.Errorf("calib: channel bucket %q: %w", c.Channel, err)
		}
		id := []byte(c.ID)
		if err := b.ForEach(func(k, _ []byte) error {
			if len(k) >= 8 && bytes.Equal(k[8:], id) {
				return fmt.Errorf("%w: %q on channel %q", ErrDuplicate, c.ID, c.Channel)
			}
			return nil
		}); err != nil {
			return err
		}
		return b.Put(key(c), v)
	})
}

// Current returns the newest calibration of channel; false when it has none.
func (h *History) Current(channel string) (Calibration, bool, error) {
	var c Calibration
	found := false
	err := h.db.View(func(tx *bbolt.Tx) error {
		b := tx.Bucket(bucketName).Bucket([]byte(channel))
		if b == nil {
			return nil
		}
		_, v := b.Cursor().Last()
		if v == nil {
			return nil
		}
		found = true
		return decode(v, &c)
	})
	return c, found && err == nil, err
}

// List returns channel's calibrations, newest last. An empty channel lists
// every channel's, newest last.
func (h *History) List(channel string) ([]Calibration, error) {
	out := []Calibration{}
	err := h.db.View(func(tx *bbolt.Tx) error {
		root := tx.Bucket(bucketName)
		each := func(b *bbolt.Bucket) error {
			return b.ForEach(func(_, v []byte) error {
				var c Calibration
				if err := decode(v, &c); err != nil {
					return err
				}
				out = append(out, c)
				return nil
			})
		}
		if channel != "" {
			if b := root.Bucket([]byte(channel)); b != nil {
				return each(b)
			}
			return nil
		}
		return root.ForEach(func(name, v []byte) error {
			if v != nil {
				return nil // not a channel bucket
			}
			return each(root.Bucket(name))
		})
	})
	if err != nil {
		return nil, err
	}
	if channel == "" {
		slices.SortStableFunc(out, func(a, b Calibration) int { return a.At.Compare(b.At) })
	}
	return out, nil
}

func decode(v []byte, c *Calibration) error {
	if err := json.Unmarshal(v, c); err != nil {
		return fmt.Errorf("%w: %v", ErrCorrupt, err)
	}
	return nil
}

// Flags on a result when a channel's calibration cannot be trusted.
const (
	FlagStale   = "calibration-stale"
	FlagMissing = "calibration-missing"
)

// Stale reports whether c is older than maxAge at now. A calibration with
// no time is stale; maxAge <= 0 means calibrations never go stale. A
// calibration dated after now (a clock set back) is not stale.
func Stale(c Calibration, now time.Time, maxAge time.Duration) bool {
	if c.At.IsZero() {
		return true
	}
	if maxAge <= 0 {
		return false
	}
	return now.Sub(c.At) > maxAge
}

// Flag returns the result flag for channel at now: FlagMissing without a
// calibration, FlagStale when the newest is older than maxAge, "" when it
// is current. The calibration found is returned too.
func (h *History) Flag(channel string, now time.Time, maxAge time.Duration) (string, Calibration, error) {
	c, ok, err := h.Current(channel)
	switch {
	case err != nil:
		return "", Calibration{}, err
	case !ok:
		return FlagMissing, Calibration{}, nil
	case Stale(c, now, maxAge):
		return FlagStale, c, nil
	}
	return "", c, nil
}
