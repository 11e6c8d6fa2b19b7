package store

import (
	"fmt"
	"slices"
	"testing"
	"time"
)

func TestPruneNeverDeletesUndelivered(t *testing.T) {
	db, _ := openTestDB(t, Options{})
	now := t0.Add(100 * 24 * time.Hour)
	// T0..T4, one day apart, oldest first; each 1000 samples.
	for i := 0; i < 5; i++ {
		id := fmt.Sprintf("T%d", i)
		if err := db.CreateTest(TestMeta{ID: id, StartedAt: t0.Add(time.Duration(i) * 24 * time.Hour), State: StateEnded}); err != nil {
			t.Fatal(err)
		}
		if err := db.WriteSamples(id, genCurve(0, 1000)); err != nil {
			t.Fatal(err)
		}
	}
	// T0 has an undelivered result; T1 a delivered one; T4 is running.
	if _, err := db.PutResult("T0", []byte(`{}`)); err != nil {
		t.Fatal(err)
	}
	if _, err := db.PutResult("T1", []byte(`{}`)); err != nil {
		t.Fatal(err)
	}
	items, _ := db.OutboxPending(10)
	if err := db.OutboxDone(items[1].Seq); err != nil {
		t.Fatal(err)
	}
	if err := db.SetTestState("T4", StateRunning); err != nil {
		t.Fatal(err)
	}

	// Age: everything is older than 90 days except nothing; keep 97.5 days:
	// T0 (100 d), T1 (99 d), T2 (98 d) are too old.
	deleted, err := db.Prune(RetentionPolicy{MaxAge: 97*24*time.Hour + 12*time.Hour}, now)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(deleted, []string{"T1", "T2"}) {
		t.Fatalf("age prune deleted %v, want [T1 T2] (T0 undelivered)", deleted)
	}

	// Bytes: budget for one test; T3 goes, T0 stays (undelivered), T4
	// stays (running) even though that leaves the store over budget.
	m, _ := db.Test("T3")
	deleted, err = db.Prune(RetentionPolicy{MaxBytes: m.StoredBytes}, now)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(deleted, []string{"T3"}) {
		t.Fatalf("size prune deleted %v, want [T3]", deleted)
	}
	left, _ := db.Tests()
	if len(left) != 2 || left[0].ID != "T0" || left[1].ID != "T4" {
		t.Fatalf("left %+v", left)
	}
}
