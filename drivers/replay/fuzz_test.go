package replay_test

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"testing"

	"framed/drivers"
	"framed/drivers/replay"
)

// Any file is either refused with ErrBadConfig or played: times rise and
// a few thousand samples come out, resampled or not, without a panic.
func FuzzReplayFile(f *testing.F) {
	paths, _ := filepath.Glob("testdata/curves/*.csv")
	for _, p := range paths {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b, 0.0)
			f.Add(b, 7.0)
		}
	}
	f.Add([]byte("time_s,force_N,extension_mm,crosshead_mm\n0,1,,\n1e-9,2,,\n"), 10000.0)
	f.Add([]byte("time_s,force_N,extension_mm,crosshead_mm\n-5,1,1,1\n1e20,2,2,2\n"), 0.0)
	f.Fuzz(func(t *testing.T, file []byte, rateHz float64) {
		path := filepath.Join(t.TempDir(), "c.csv")
		if err := os.WriteFile(path, file, 0o600); err != nil {
			t.Fatal(err)
		}
		d := replay.New()
		cfg := fmt.Sprintf(`{"path": %q, "pace": "none", "loop": true, "pause_s": 0.5, "speed": 3}`, path)
		if rateHz >= 1 && rateHz <= 10000 {
			cfg = fmt.Sprintf(`{"path": %q, "pace": "none", "loop": true, "pause_s": 0.5, "speed": 3, "rate_hz": %v}`, path, math.Round(rateHz))
		}
		if _, err := d.Configure(t.Context(), []byte(cfg)); err != nil {
			if !errors.Is(err, drivers.ErrBadConfig) {
				t.Fatalf("refused without ErrBadConfig: %v", err)
			}
			return
		}
		times, _, _ := read(t, d, 3000)
		for i := 1; i < len(times); i++ {
			if times[i] <= times[i-1] {
				t.Fatalf("time %d does not rise: %d after %d", i, times[i], times[i-1])
			}
		}
	})
}
