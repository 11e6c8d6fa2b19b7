package bench

import (
	"context"
	"encoding/binary"
	"math"
	"os"
	"path/filepath"
	"testing"
	"time"

	"framed/daemon/store"
)

func testCurve(t *testing.T, n int) *cycler {
	t.Helper()
	s, err := ingestSettings()
	if err != nil {
		t.Fatal(err)
	}
	c, err := simCurve(context.Background(), s, n)
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != n {
		t.Fatalf("sim gave %d of %d samples", c.Len(), n)
	}
	return newCycler(c)
}

// The cycler keeps time steady across the wrap: every step is the sim's
// sample period, 1/10 kHz.
func TestCyclerKeepsTimeSteady(t *testing.T) {
	y := testCurve(t, 3000)
	prev := math.NaN()
	for range 10 {
		b := y.next(1024)
		for _, ts := range b.TimeS {
			if !math.IsNaN(prev) && math.Abs(ts-prev-1e-4) > 1e-9 {
				t.Fatalf("step %.9f s after %.6f s, want 1e-4 s", ts-prev, prev)
			}
			prev = ts
		}
	}
}

// The plain file holds exactly the packed rows, readable back bit for bit.
func TestPlainFileWritesPackedRows(t *testing.T) {
	dir := t.TempDir()
	y := testCurve(t, 5000)
	rate, err := plainFile(dir, y, 12345, 10*time.Millisecond)
	if err != nil {
		t.Fatal(err)
	}
	if !(rate > 0) {
		t.Errorf("rate %v", rate)
	}
	raw, err := os.ReadFile(filepath.Join(dir, "plain.bin"))
	if err != nil {
		t.Fatal(err)
	}
	if len(raw) != 12345*rawBytesPerSample {
		t.Fatalf("%d bytes, want %d", len(raw), 12345*rawBytesPerSample)
	}
	ref := testCurve(t, 5000).src
	for i, col := range [][]float64{ref.TimeS, ref.ForceN, ref.ExtensionMM, ref.CrossheadMM} {
		got := math.Float64frombits(binary.LittleEndian.Uint64(raw[4321*rawBytesPerSample+8*i:]))
		if math.Float64bits(got) != math.Float64bits(col[4321]) {
			t.Errorf("row 4321 column %d: %v, want %v", i, got, col[4321])
		}
	}
}

// The direct baseline commits every sample it times, and the store it
// leaves is consistent.
func TestDirectStoreCommitsEverything(t *testing.T) {
	dir := t.TempDir()
	y := testCurve(t, 5000)
	rate, err := directStore(dir, y, 20000, 10*time.Millisecond)
	if err != nil {
		t.Fatal(err)
	}
	if !(rate > 0) {
		t.Errorf("rate %v", rate)
	}
	db, err := store.Open(filepath.Join(dir, "direct.db"), store.Options{})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		if err := db.Check(); err != nil {
			t.Error(err)
		}
		db.Close()
	})
	c, err := db.ReadSamples("direct")
	if err != nil {
		t.Fatal(err)
	}
	if c.Len() != 20000 {
		t.Errorf("%d samples stored, want 20000", c.Len())
	}
}

func TestCommitTimesAreSorted(t *testing.T) {
	d, err := commitTimes(t.TempDir(), testCurve(t, 5000), 1000, 5)
	if err != nil {
		t.Fatal(err)
	}
	if len(d) != 5 {
		t.Fatalf("%d commits timed", len(d))
	}
	for i := 1; i < len(d); i++ {
		if d[i] < d[i-1] || d[0] <= 0 {
			t.Fatalf("commit times %v: want sorted and positive", d)
		}
	}
}

// The stored test the reduce figure times holds one whole loading: the
// break falls inside it (the crosshead rate is set from the sample count).
func TestReduceTimesAWholeTest(t *testing.T) {
	rt, err := measureReduce(context.Background(), t.TempDir(), 200_000)
	if err != nil {
		t.Fatal(err)
	}
	if !rt.broke {
		t.Error("the stored test holds no break")
	}
	if !(rt.readS > 0 && rt.computeS > 0 && rt.reduceS >= rt.readS) {
		t.Errorf("timings %+v", rt)
	}
}
