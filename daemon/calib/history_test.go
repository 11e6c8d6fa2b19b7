package calib

import (
	"errors"
	"path/filepath"
	"testing"
	"time"

	"go.etcd.io/bbolt"
)

// openDB opens a fresh bbolt file and checks its consistency when the test
// ends.
func openDB(t *testing.T) *bbolt.DB {
	t.Helper()
	db, err := bbolt.Open(filepath.Join(t.TempDir(), "state.db"), 0o600, &bbolt.Options{Timeout: time.Second})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		if err := db.View(func(tx *bbolt.Tx) error {
			for err := range tx.Check() {
				return err
			}
			return nil
		}); err != nil {
			t.Errorf("bbolt consistency: %v", err)
		}
		if err := db.Close(); err != nil {
			t.Error(err)
		}
	})
	return db
}

var t0 = time.Date(2026, 1, 10, 8, 0, 0, 0, time.UTC)

func span(t *testing.T, channel string, at time.Time, gain float64) Calibration {
	t.Helper()
	c, err := NewSpan(channel, "N", at, []Reference{{0, 0, 0}, {1000, 1000 / gain, 0}, {2000, 2000 / gain, 0}}, 1)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func TestHistory(t *testing.T) {
	db := openDB(t)
	h, err := NewHistory(db)
	if err != nil {
		t.Fatal(err)
	}
	if _, ok, err := h.Current("force"); ok || err != nil {
		t.Fatalf("empty history: ok %v err %v", ok, err)
	}
	// Saved out of time order: List and Current go by time, not by order
	// of saving.
	late := span(t, "force", t0.Add(48*time.Hour), 0.02)
	early := span(t, "force", t0, 0.025)
	ext := span(t, "extension", t0.Add(24*time.Hour), 0.001)
	ext.Unit = "mm"
	for _, c := range []Calibration{late, early, ext} {
		if err := h.Save(c); err != nil {
			t.Fatal(err)
		}
	}
	cur, ok, err := h.Current("force")
	if err != nil || !ok || cur.ID != late.ID {
		t.Fatalf("current = %v %v %v, want %s", cur.ID, ok, err, late.ID)
	}
	if !relNear(cur.Apply(50000), 1000, 1e-9) { // 50000 raw x 0.02 N per count
		t.Errorf("stored model %+v", cur.Model)
	}
	list, err := h.List("force")
	if err != nil || len(list) != 2 || list[0].ID != early.ID || list[1].ID != late.ID {
		t.Fatalf("list %v %v", list, err)
	}
	if !list[1].At.Equal(late.At) || list[1].StdErr == nil || len(list[1].Residuals) != 3 {
		t.Errorf("round trip lost fields: %+v", list[1])
	}
	all, err := h.List("")
	if err != nil || len(all) != 3 || all[0].ID != early.ID || all[1].ID != ext.ID || all[2].ID != late.ID {
		t.Errorf("list all: %v %v", all, err)
	}
	if none, err := h.List("crosshead"); err != nil || len(none) != 0 || none == nil {
		t.Errorf("unknown channel: %#v %v", none, err)
	}
	// A tare on top keeps the gain and becomes current.
	w, err := Quiet([]float64{149, 150, 151}, 5)
	if err != nil {
		t.Fatal(err)
	}
	tare, err := NewTare("force", t0.Add(72*time.Hour), cur.Model, w)
	if err != nil {
		t.Fatal(err)
	}
	if err := h.Save(tare); err != nil {
		t.Fatal(err)
	}
	cur, _, _ = h.Current("force")
	if cur.Kind != KindTare || cur.Apply(150) != 0 || cur.Model.Gain != late.Model.Gain {
		t.Errorf("after tare: %+v", cur)
	}
	// Duplicates and invalid calibrations are refused, nothing overwritten.
	if err := h.Save(late); !errors.Is(err, ErrDuplicate) {
		t.Errorf("duplicate: %v", err)
	}
	bad := late
	bad.ID = "x"
	bad.Kind = "guess"
	if err := h.Save(bad); !errors.Is(err, ErrBadCalibration) {
		t.Errorf("bad kind: %v", err)
	}
	bad = late
	bad.ID, bad.At = "y", time.Time{}
	if err := h.Save(bad); !errors.Is(err, ErrBadCalibration) {
		t.Errorf("no time: %v", err)
	}
	if list, _ := h.List("force"); len(list) != 3 {
		t.Errorf("%d stored after refusals, want 3", len(list))
	}
}

func TestHistoryReopen(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "state.db")
	db, err := bbolt.Open(path, 0o600, nil)
	if err != nil {
		t.Fatal(err)
	}
	h, err := NewHistory(db)
	if err != nil {
		t.Fatal(err)
	}
	c := span(t, "force", t0, 0.02)
	if err := h.Save(c); err != nil {
		t.Fatal(err)
	}
	if err := db.Close(); err != nil {
		t.Fatal(err)
	}
	db, err = bbolt.Open(path, 0o600, nil)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		if err := db.View(func(tx *bbolt.Tx) error {
			for err := range tx.Check() {
				return err
			}
			return nil
		}); err != nil {
			t.Errorf("bbolt consistency: %v", err)
		}
		db.Close()
	})
	h, err = NewHistory(db)
	if err != nil {
		t.Fatal(err)
	}
	got, ok, err := h.Current("force")
	if err != nil || !ok || got.ID != c.ID || got.Model != c.Model {
		t.Errorf("after reopen: %+v %v %v", got, ok, err)
	}
}

func TestHistoryCorrupt(t *testing.T) {
	db := openDB(t)
	h, err := NewHistory(db)
	if err != nil {
		t.Fatal(err)
	}
	if err := db.Update(func(tx *bbolt.Tx) error {
		b, err := tx.Bucket(bucketName).CreateBucket([]byte("force"))
		if err != nil {
			return err
		}
		return b.Put([]byte("short"), []byte("{not json"))
	}); err != nil {
		t.Fatal(err)
	}
	if _, _, err := h.Current("force"); !errors.Is(err, ErrCorrupt) {
		t.Errorf("current: %v", err)
	}
	if _, err := h.List(""); !errors.Is(err, ErrCorrupt) {
		t.Errorf("list: %v", err)
	}
	// A short foreign key does not upset the duplicate check.
	if err := h.Save(span(t, "force", t0, 0.02)); err != nil {
		t.Errorf("save beside a foreign key: %v", err)
	}
}

func TestStaleAndFlag(t *testing.T) {
	db := openDB(t)
	h, err := NewHistory(db)
	if err != nil {
		t.Fatal(err)
	}
	year := 365 * 24 * time.Hour
	flag, _, err := h.Flag("force", t0, year)
	if err != nil || flag != FlagMissing {
		t.Errorf("no calibration: %q %v", flag, err)
	}
	c := span(t, "force", t0, 0.02)
	if err := h.Save(c); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		now  time.Time
		max  time.Duration
		want bool
	}{
		{t0.Add(year), year, false},                  // exactly at the limit: not yet stale
		{t0.Add(year + time.Nanosecond), year, true}, // one ns over
		{t0.Add(-time.Hour), year, false},            // clock set back
		{t0.Add(10 * year), 0, false},                // no limit
	}
	for _, k := range cases {
		if got := Stale(c, k.now, k.max); got != k.want {
			t.Errorf("Stale at %v max %v = %v, want %v", k.now.Sub(t0), k.max, got, k.want)
		}
		flag, cur, err := h.Flag("force", k.now, k.max)
		want := ""
		if k.want {
			want = FlagStale
		}
		if err != nil || flag != want || cur.ID != c.ID {
			t.Errorf("Flag at %v = %q (%v), want %q", k.now.Sub(t0), flag, err, want)
		}
	}
	if !Stale(Calibration{}, t0, year) {
		t.Error("a calibration without a time is not stale")
	}
}
