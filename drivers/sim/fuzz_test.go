package sim

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"testing"

	"framed/drivers"
)

// Any config is either refused with ErrBadConfig or runs: a few thousand
// samples of whatever it describes come out without a panic, with finite
// force and time. Seeds: the golden configs and the sample config.
func FuzzConfig(f *testing.F) {
	f.Add(SampleConfig)
	paths, _ := filepath.Glob("testdata/*/config.json")
	for _, p := range paths {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte(`{"specimens": [{"id": "h", "shape": "round", "d0_mm": 4, "L0_mm": 20, "material": {"law": "hollomon", "E_MPa": 200000, "K_MPa": 700, "n": 0.25, "fracture_pct": 45, "neck_drop": 0.4}, "loading": {"mode": "rate", "crosshead_mm_per_min": 1000, "stiffness_N_per_mm": 1}}], "rate_hz": 10, "speed": 1000}`))
	f.Fuzz(func(t *testing.T, raw []byte) {
		s, err := parseSettings(raw)
		if err != nil {
			if !errors.Is(err, drivers.ErrBadConfig) {
				t.Fatalf("refused without ErrBadConfig: %v", err)
			}
			return
		}
		s.Pace = PaceNone
		g := newGenerator(&s)
		for range 4 {
			b := g.batch(0, 1000)
			if b.Err != nil {
				if !errors.Is(b.Err, drivers.ErrDeviceGone) {
					t.Fatalf("batch error %v", b.Err)
				}
				return
			}
			for i, f := range b.Values[0] {
				if math.IsNaN(f) || math.IsInf(f, 0) {
					t.Fatalf("sample %d force %v", i, f)
				}
			}
		}
	})
}
