package store

import (
	"errors"
	"path/filepath"
	"testing"

	"go.etcd.io/bbolt"
)

// Check finds a damaged chunk, a gap in the chunk sequence and an outbox
// entry without its result. The damage is made through Bolt, as a bad
// disk or a foreign writer would.
func TestCheckFindsDamage(t *testing.T) {
	path := filepath.Join(t.TempDir(), "framed.db")
	db, err := Open(path, Options{ChunkSamples: 100})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		// The store is damaged on purpose: only bbolt's own page check
		// must still pass.
		if err := db.Bolt().View(func(tx *bbolt.Tx) error {
			for err := range tx.Check() {
				return err
			}
			return nil
		}); err != nil {
			t.Errorf("bbolt check: %v", err)
		}
		db.Close()
	})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	if err := db.WriteSamples("T", genCurve(0, 1000)); err != nil {
		t.Fatal(err)
	}
	if err := db.Check(); err != nil {
		t.Fatalf("healthy store: %v", err)
	}
	damage := func(f func(tx *bbolt.Tx) error) {
		t.Helper()
		if err := db.Bolt().Update(f); err != nil {
			t.Fatal(err)
		}
		if err := db.Check(); !errors.Is(err, ErrCorrupt) {
			t.Fatalf("Check = %v, want ErrCorrupt", err)
		}
		if _, err := db.ReadSamples("T"); !errors.Is(err, ErrCorrupt) {
			t.Fatalf("ReadSamples = %v, want ErrCorrupt", err)
		}
	}
	samples := func(tx *bbolt.Tx) *bbolt.Bucket { return tx.Bucket(bucketSamples).Bucket([]byte("T")) }
	damage(func(tx *bbolt.Tx) error {
		v := append([]byte(nil), samples(tx).Get(u64key(3))...)
		v[len(v)/2] ^= 1
		return samples(tx).Put(u64key(3), v)
	})
	damage(func(tx *bbolt.Tx) error { return samples(tx).Delete(u64key(3)) })
	if err := db.Bolt().Update(func(tx *bbolt.Tx) error {
		return tx.Bucket(bucketOutbox).Put(u64key(99), encodeOutboxEntry("ghost", 1))
	}); err != nil {
		t.Fatal(err)
	}
	if err := db.Check(); !errors.Is(err, ErrCorrupt) {
		t.Fatalf("outbox without result: Check = %v", err)
	}
}
