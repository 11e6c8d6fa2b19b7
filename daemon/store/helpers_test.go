package store

import (
	"math"
	"path/filepath"
	"testing"

	"go.etcd.io/bbolt"

	"framed/reduce"
)

// openTestDB opens a fresh store and, in t.Cleanup, checks bbolt's page
// consistency and this package's invariants before closing it.
func openTestDB(t testing.TB, opt Options) (*DB, string) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "framed.db")
	db, err := Open(path, opt)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { closeChecked(t, db) })
	return db, path
}

func closeChecked(t testing.TB, db *DB) {
	t.Helper()
	if err := db.Bolt().View(func(tx *bbolt.Tx) error {
		for err := range tx.Check() {
			return err
		}
		return nil
	}); err != nil {
		t.Errorf("bbolt check: %v", err)
	}
	if err := db.Check(); err != nil {
		t.Errorf("store check: %v", err)
	}
	if err := db.Close(); err != nil {
		t.Errorf("close: %v", err)
	}
}

// genCurve makes samples [from, from+n) of a synthetic 10 kHz recording
// whose values depend only on the index, so a reader can verify any
// sample without keeping the writer's copy. Force is a 24-bit ADC count
// times a non-binary scale (every mantissa bit matters); extension moves
// in 0.1 µm steps and drops out (NaN) on every 97th sample.
func genCurve(from, n int) reduce.Curve {
	c := reduce.Curve{
		TimeS:       make([]float64, n),
		ForceN:      make([]float64, n),
		ExtensionMM: make([]float64, n),
		CrossheadMM: make([]float64, n),
	}
	for j := 0; j < n; j++ {
		i := from + j
		c.TimeS[j] = float64(i) * 1e-4
		counts := int32(uint32(i)*2654435761>>8) - 1<<23 // 24-bit signed
		c.ForceN[j] = float64(counts) * 0.0123456789
		if i%97 == 0 {
			c.ExtensionMM[j] = math.NaN()
		} else {
			c.ExtensionMM[j] = float64(i) * 1e-4
		}
		c.CrossheadMM[j] = float64(i) * 3.3e-4
	}
	return c
}

// sameBits reports the first index where two columns differ bit for bit.
func sameBits(a, b []float64) (int, bool) {
	if len(a) != len(b) {
		return min(len(a), len(b)), false
	}
	for i := range a {
		if math.Float64bits(a[i]) != math.Float64bits(b[i]) {
			return i, false
		}
	}
	return 0, true
}

type fataler interface {
	Helper()
	Fatalf(format string, args ...any)
}

func requireSameCurve(t fataler, got, want reduce.Curve) {
	t.Helper()
	g, w := columns(&got), columns(&want)
	names := []string{"time_s", "force_N", "extension_mm", "crosshead_mm"}
	for k := range g {
		if (g[k] == nil) != (w[k] == nil) {
			t.Fatalf("%s: nil %v, want nil %v", names[k], g[k] == nil, w[k] == nil)
		}
		if i, ok := sameBits(g[k], w[k]); !ok {
			if i < len(g[k]) && i < len(w[k]) {
				t.Fatalf("%s[%d] = %v, want %v (len %d, want %d)", names[k], i, g[k][i], w[k][i], len(g[k]), len(w[k]))
			}
			t.Fatalf("%s: len %d, want %d", names[k], len(g[k]), len(w[k]))
		}
	}
}
