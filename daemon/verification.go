package daemon

import (
	"encoding/json"
	"fmt"
	"time"

	"go.etcd.io/bbolt"
)

// bucketVerifications keeps every force verification report framectl
// hands in, keyed by the time it was stored, so the frame's history of
// classes survives beside its calibrations.
var bucketVerifications = []byte("verifications")

// maxVerificationBytes bounds one stored report.
const maxVerificationBytes = 1 << 20

// storeVerification keeps a verification report and publishes it retained
// on <root>/<frame>/verification.
func (d *Daemon) storeVerification(raw json.RawMessage) (any, error) {
	if len(raw) == 0 || len(raw) > maxVerificationBytes || !json.Valid(raw) {
		return nil, fmt.Errorf("verification: want one JSON report of at most %d bytes", maxVerificationBytes)
	}
	var probe struct {
		Points []json.RawMessage `json:"points"`
	}
	if err := json.Unmarshal(raw, &probe); err != nil || len(probe.Points) == 0 {
		return nil, fmt.Errorf("verification: not a force verification report (no points)")
	}
	at := time.Now().UTC()
	var doc map[string]any
	json.Unmarshal(raw, &doc)
	doc["at"], doc["frame"] = at.Format(time.RFC3339), d.cfg.Frame
	b, _ := json.Marshal(doc)
	err := d.db.Bolt().Update(func(tx *bbolt.Tx) error {
		bk, err := tx.CreateBucketIfNotExists(bucketVerifications)
		if err != nil {
			return err
		}
		return bk.Put([]byte(at.Format(time.RFC3339Nano)), b)
	})
	if err != nil {
		return nil, fmt.Errorf("store verification: %w", err)
	}
	d.pub.Verification(b)
	d.log.Info("force verification stored and published", "at", at)
	return map[string]string{"at": at.Format(time.RFC3339)}, nil
}
