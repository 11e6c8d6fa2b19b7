package store

import (
	"encoding/json"
	"errors"
	"path/filepath"
	"slices"
	"testing"
	"time"
)

var t0 = time.Date(2026, 3, 4, 8, 30, 0, 0, time.UTC)

func TestTestMetaLifecycle(t *testing.T) {
	db, _ := openTestDB(t, Options{})
	if err := db.CreateTest(TestMeta{ID: "T-0001", Frame: "frame-a", StartedAt: t0, Specimen: json.RawMessage(`{"id":"S1","shape":"round","d0_mm":10}`)}); err != nil {
		t.Fatal(err)
	}
	if err := db.CreateTest(TestMeta{ID: "T-0001", StartedAt: t0}); !errors.Is(err, ErrExists) {
		t.Fatalf("duplicate create: err = %v, want ErrExists", err)
	}
	if err := db.CreateTest(TestMeta{ID: ""}); !errors.Is(err, ErrBadState) {
		t.Fatalf("empty id: err = %v, want ErrBadState", err)
	}
	if err := db.CreateTest(TestMeta{ID: "x", State: "exploded"}); !errors.Is(err, ErrBadState) {
		t.Fatalf("bad state: err = %v, want ErrBadState", err)
	}
	if err := db.SetTestState("T-0001", StateEnded, "extensometer-removed", "extensometer-removed"); err != nil {
		t.Fatal(err)
	}
	if err := db.SetTestState("nope", StateEnded); !errors.Is(err, ErrNotFound) {
		t.Fatalf("unknown test: err = %v, want ErrNotFound", err)
	}
	m, err := db.Test("T-0001")
	if err != nil {
		t.Fatal(err)
	}
	if m.State != StateEnded || !slices.Equal(m.Flags, []string{"extensometer-removed"}) || m.Frame != "frame-a" {
		t.Fatalf("meta = %+v", m)
	}
	if _, err := db.Test("nope"); !errors.Is(err, ErrNotFound) {
		t.Fatalf("err = %v, want ErrNotFound", err)
	}
}

// The JSON of the test list is the `framectl tests --json` contract of the
// design notes: test_id, started_at, state, samples, result_revision.
func TestTestsJSONContract(t *testing.T) {
	db, _ := openTestDB(t, Options{})
	for i, id := range []string{"T-2", "T-1"} {
		if err := db.CreateTest(TestMeta{ID: id, StartedAt: t0.Add(time.Duration(1-i) * time.Hour)}); err != nil {
			t.Fatal(err)
		}
	}
	if err := db.WriteSamples("T-1", genCurve(0, 123)); err != nil {
		t.Fatal(err)
	}
	if _, err := db.PutResult("T-1", []byte(`{"test_id":"T-1"}`)); err != nil {
		t.Fatal(err)
	}
	tests, err := db.Tests()
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(tests)
	if err != nil {
		t.Fatal(err)
	}
	var got []map[string]any
	if err := json.Unmarshal(b, &got); err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 || got[0]["test_id"] != "T-1" {
		t.Fatalf("list not oldest first: %s", b)
	}
	for _, key := range []string{"test_id", "started_at", "state", "samples", "result_revision"} {
		if _, ok := got[0][key]; !ok {
			t.Errorf("key %q missing from %s", key, b)
		}
	}
	if got[0]["samples"] != 123.0 || got[0]["result_revision"] != 1.0 || got[0]["state"] != "running" {
		t.Errorf("values: %s", b)
	}
	if got[0]["started_at"] != "2026-03-04T08:30:00Z" {
		t.Errorf("started_at = %v, want RFC 3339", got[0]["started_at"])
	}
}

func TestSecondOpenFailsWithErrLocked(t *testing.T) {
	_, path := openTestDB(t, Options{})
	start := time.Now()
	_, err := Open(path, Options{LockTimeout: 50 * time.Millisecond})
	if !errors.Is(err, ErrLocked) {
		t.Fatalf("second open: err = %v, want ErrLocked", err)
	}
	if time.Since(start) > 10*time.Second {
		t.Fatalf("second open hung for %v", time.Since(start))
	}
}

func TestReopenKeepsEverything(t *testing.T) {
	path := filepath.Join(t.TempDir(), "framed.db")
	db, err := Open(path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	want := genCurve(0, 10000)
	if err := db.WriteSamples("T", want); err != nil {
		t.Fatal(err)
	}
	if _, err := db.PutResult("T", []byte(`{"a":1}`)); err != nil {
		t.Fatal(err)
	}
	if err := db.Close(); err != nil {
		t.Fatal(err)
	}
	db, err = Open(path, Options{})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { closeChecked(t, db) })
	got, err := db.ReadSamples("T")
	if err != nil {
		t.Fatal(err)
	}
	requireSameCurve(t, got, want)
	if items, err := db.OutboxPending(10); err != nil || len(items) != 1 {
		t.Fatalf("outbox after reopen: %v, %v", items, err)
	}
}
