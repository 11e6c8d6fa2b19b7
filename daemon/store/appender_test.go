package store

import (
	"errors"
	"math"
	"testing"
	"time"

	"framed/reduce"
)

func TestAppenderFlushReadBack(t *testing.T) {
	db, _ := openTestDB(t, Options{ManualCommit: true, ChunkSamples: 1000})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	a := db.Appender("T")
	if db.Appender("T") != a {
		t.Fatal("a second Appender for the same test must be the same one")
	}
	want := genCurve(0, 25000)
	// Batches of uneven size, as a driver delivers them, with flushes
	// at odd places so chunks straddle batch boundaries.
	for from, step := 0, 1; from < want.Len(); step = step*7%997 + 1 {
		to := min(from+step, want.Len())
		if err := a.Append(want.Slice(from, to)); err != nil {
			t.Fatal(err)
		}
		if from%5 == 0 {
			if err := a.Flush(); err != nil {
				t.Fatal(err)
			}
		}
		from = to
	}
	if err := a.Close(); err != nil {
		t.Fatal(err)
	}
	if err := a.Append(want.Slice(0, 1)); !errors.Is(err, ErrClosed) {
		t.Fatalf("append after close: err = %v, want ErrClosed", err)
	}
	got, err := db.ReadSamples("T")
	if err != nil {
		t.Fatal(err)
	}
	requireSameCurve(t, got, want)
	if a.Committed() != want.Len() {
		t.Fatalf("committed %d, want %d", a.Committed(), want.Len())
	}
}

// A channel that comes and goes between batches (extensometer clipped on
// mid-test, removed before the break) reads back as NaN where absent.
func TestAppenderChannelsComeAndGo(t *testing.T) {
	db, _ := openTestDB(t, Options{ManualCommit: true})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	a := db.Appender("T")
	full := genCurve(0, 300)
	b1 := full.Slice(0, 100)
	b1.ExtensionMM = nil
	b2 := full.Slice(100, 200)
	b3 := full.Slice(200, 300)
	b3.ExtensionMM = nil
	for i, b := range []reduce.Curve{b1, b2, b3} {
		if err := a.Append(b); err != nil {
			t.Fatal(err)
		}
		if i == 1 {
			if err := a.Flush(); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := a.Close(); err != nil {
		t.Fatal(err)
	}
	got, err := db.ReadSamples("T")
	if err != nil {
		t.Fatal(err)
	}
	want := genCurve(0, 300)
	for i := range want.ExtensionMM {
		if i < 100 || i >= 200 {
			want.ExtensionMM[i] = math.NaN()
		}
	}
	requireSameCurve(t, got, want)

	// A force-only test keeps its missing columns nil.
	if err := db.CreateTest(TestMeta{ID: "F", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	fo := reduce.Curve{TimeS: full.TimeS[:50], ForceN: full.ForceN[:50]}
	if err := db.WriteSamples("F", fo); err != nil {
		t.Fatal(err)
	}
	got, err = db.ReadSamples("F")
	if err != nil {
		t.Fatal(err)
	}
	requireSameCurve(t, got, fo)
}

func TestAppenderRejectsRaggedBatch(t *testing.T) {
	db, _ := openTestDB(t, Options{ManualCommit: true})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	err := db.Appender("T").Append(reduce.Curve{TimeS: []float64{1, 2}, ForceN: []float64{1}})
	if !errors.Is(err, ErrBadBatch) {
		t.Fatalf("err = %v, want ErrBadBatch", err)
	}
}

// The background committer commits without Flush: poll (no timing
// assertion) until the samples are committed.
func TestAppenderBackgroundCommit(t *testing.T) {
	db, _ := openTestDB(t, Options{CommitInterval: 10 * time.Millisecond})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	if err := db.Appender("T").Append(genCurve(0, 777)); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(10 * time.Second)
	for {
		m, err := db.Test("T")
		if err != nil {
			t.Fatal(err)
		}
		if m.Samples == 777 {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("background committer did not commit: %d samples", m.Samples)
		}
		time.Sleep(5 * time.Millisecond)
	}
}

func TestManualTickCommitsWhenDue(t *testing.T) {
	db, _ := openTestDB(t, Options{ManualCommit: true, CommitInterval: time.Hour})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	a := db.Appender("T")
	if err := a.Append(genCurve(0, 10)); err != nil {
		t.Fatal(err)
	}
	if err := a.Tick(time.Now()); err != nil || a.Committed() != 0 {
		t.Fatalf("tick before the interval committed %d (err %v)", a.Committed(), err)
	}
	if err := a.Tick(time.Now().Add(2 * time.Hour)); err != nil || a.Committed() != 10 {
		t.Fatalf("tick after the interval committed %d (err %v)", a.Committed(), err)
	}
}

// A commit that fails keeps the samples and reports the error; once the
// cause is gone, the same samples commit.
func TestAppenderKeepsSamplesWhenCommitFails(t *testing.T) {
	db, _ := openTestDB(t, Options{ManualCommit: true})
	a := db.Appender("late") // test not created yet
	want := genCurve(0, 1000)
	if err := a.Append(want.Slice(0, 600)); err != nil {
		t.Fatal(err)
	}
	if err := a.Flush(); !errors.Is(err, ErrNotFound) {
		t.Fatalf("flush without test: err = %v, want ErrNotFound", err)
	}
	if err := a.Append(want.Slice(600, 1000)); err != nil {
		t.Fatal(err)
	}
	if err := db.CreateTest(TestMeta{ID: "late", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	if err := a.Close(); err != nil {
		t.Fatal(err)
	}
	got, err := db.ReadSamples("late")
	if err != nil {
		t.Fatal(err)
	}
	requireSameCurve(t, got, want)
}

// Readers see a consistent prefix while an appender commits in the
// background: every read decodes, and what it holds is exactly the first
// samples written.
func TestReadWhileAppending(t *testing.T) {
	db, _ := openTestDB(t, Options{CommitInterval: 2 * time.Millisecond, ChunkSamples: 300})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		t.Fatal(err)
	}
	const total = 200_000
	done := make(chan error, 1)
	go func() {
		a := db.Appender("T")
		for from := 0; from < total; from += 1000 {
			if err := a.Append(genCurve(from, 1000)); err != nil {
				done <- err
				return
			}
		}
		done <- a.Close()
	}()
	reads := 0
	for {
		c, err := db.ReadSamples("T")
		if err != nil {
			t.Fatal(err)
		}
		if c.Len() > 0 {
			requireSameCurve(t, c, genCurve(0, c.Len()))
		}
		reads++
		select {
		case err := <-done:
			if err != nil {
				t.Fatal(err)
			}
			c, err := db.ReadSamples("T")
			if err != nil {
				t.Fatal(err)
			}
			requireSameCurve(t, c, genCurve(0, total))
			t.Logf("%d reads while appending", reads)
			return
		default:
		}
	}
}
