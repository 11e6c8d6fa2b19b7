package store

import (
	"errors"
	"fmt"
	"time"
)

// RetentionPolicy bounds what the store keeps. A zero field means no bound.
type RetentionPolicy struct {
	// MaxAge: tests started longer ago than this go.
	MaxAge time.Duration
	// MaxBytes: oldest tests go until the stored sample chunks fit. It
	// counts chunk bytes, not the file size (see the package doc).
	MaxBytes int64
}

// Prune deletes tests the policy no longer keeps, oldest first. It never
// deletes a running test nor one whose latest result the broker has not
// acknowledged: those are skipped, even when that leaves the store over
// its byte budget.
func (db *DB) Prune(policy RetentionPolicy, now time.Time) (deleted []string, err error) {
	tests, err := db.Tests() // oldest first
	if err != nil {
		return nil, err
	}
	var total int64
	for _, m := range tests {
		total += m.StoredBytes
	}
	for _, m := range tests {
		tooOld := policy.MaxAge > 0 && now.Sub(m.StartedAt) > policy.MaxAge
		tooBig := policy.MaxBytes > 0 && total > policy.MaxBytes
		if !tooOld && !tooBig {
			continue
		}
		if m.State == StateRunning {
			continue
		}
		if err := db.DeleteTest(m.ID); err != nil {
			if errors.Is(err, ErrNotDelivered) || errors.Is(err, ErrNotFound) {
				continue
			}
			return deleted, fmt.Errorf("prune: %w", err)
		}
		total -= m.StoredBytes
		deleted = append(deleted, m.ID)
	}
	return deleted, nil
}
