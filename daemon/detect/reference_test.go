package detect

import (
	"framed/reduce/refcurves"
	"math"
	"os"
	"path/filepath"
	"testing"

	"framed/reduce"
	"framed/reduce/curvefile"
)

// The reference folder (found by refcurves) holds real tension tests
// published under CC BY 4.0: 42CrMoS4 (Platform MaterialDigital, Fraunhofer
// IWM with IWT Bremen) and S355 (Platform MaterialDigital / BAM, Zenodo
// record 6778336); see its README.

func loadRef(t *testing.T, path string) reduce.Curve {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := curvefile.Read(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return c
}

func peakIndex(c reduce.Curve) int {
	best := 0
	for i, f := range c.ForceN {
		if f > c.ForceN[best] {
			best = i
		}
	}
	return best
}

// TestReferenceCurves runs the offline detector over the real curves. The
// 42CrMoS4 records end at fracture with no fall of force, so no break may
// be found in them at all; the S355 records end in the fall of force at
// fracture, which must be found as the one break, after the peak force and
// within the last second of the record. The upper yield point of S355 (ReH,
// reported in its reported.csv) must not pass for a break.
func TestReferenceCurves(t *testing.T) {
	refDir := refcurves.Require(t)
	files, _ := filepath.Glob(filepath.Join(refDir, "*", "*.csv"))
	if len(files) == 0 {
		t.Skip("reference curves not present")
	}
	for _, path := range files {
		if filepath.Base(path) == "reported.csv" {
			continue
		}
		set := filepath.Base(filepath.Dir(path))
		t.Run(set+"/"+filepath.Base(path), func(t *testing.T) {
			c := loadRef(t, path)
			got := Offline(c, Config{})
			var starts, breaks []reduce.Event
			for _, e := range got.Events {
				switch e.Kind {
				case reduce.EventStart:
					starts = append(starts, e)
				case reduce.EventBreak:
					breaks = append(breaks, e)
				}
			}
			if len(starts) != 1 {
				t.Fatalf("starts = %v, want one", starts)
			}
			last := c.TimeS[len(c.TimeS)-1]
			switch set {
			case "42CrMoS4":
				if len(breaks) != 0 {
					t.Errorf("false break at %.2f s (record ends at fracture, %.2f s, without a fall)", breaks[0].TimeS, last)
				}
			case "S355":
				if len(breaks) != 1 {
					t.Fatalf("breaks = %v, want the one at fracture (record ends %.2f s)", breaks, last)
				}
				b := breaks[0]
				if b.TimeS < c.TimeS[peakIndex(c)] || last-b.TimeS > 1 {
					t.Errorf("break at %.2f s, want after the peak (%.2f s) and within 1 s of the end (%.2f s)",
						b.TimeS, c.TimeS[peakIndex(c)], last)
				}
				if b.ForceN == nil || math.Abs(*b.ForceN-c.ForceN[peakIndex(c)]) > 0.01*c.ForceN[peakIndex(c)] {
					t.Errorf("break force %v, want the peak %.0f N", b.ForceN, c.ForceN[peakIndex(c)])
				}
			}
			if len(got.Holds) != 0 {
				t.Errorf("holds %+v in a continuous test", got.Holds)
			}
			if len(got.Unloads) != 0 {
				t.Errorf("unloads %+v in a continuous test", got.Unloads)
			}
		})
	}
}
