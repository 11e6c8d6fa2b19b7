package verify

import (
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// goldenDir holds the hand-worked verification cases shared with the
// framectl verify tests. Each case folder has readings.csv, args (the
// framectl flags), NOTES.md (the arithmetic, by hand from the standards'
// definitions) and expected.json or expected-error.
const goldenDir = "../../testdata/verify"

func TestGolden(t *testing.T) {
	dirs, err := filepath.Glob(filepath.Join(goldenDir, "*"))
	if err != nil || len(dirs) == 0 {
		t.Fatalf("no golden cases in %s: %v", goldenDir, err)
	}
	for _, dir := range dirs {
		if fi, err := os.Stat(dir); err != nil || !fi.IsDir() {
			continue // README.md
		}
		t.Run(filepath.Base(dir), func(t *testing.T) {
			argsB, err := os.ReadFile(filepath.Join(dir, "args"))
			if err != nil {
				t.Fatal(err)
			}
			fs := flag.NewFlagSet("args", flag.ContinueOnError)
			resN := fs.Float64("resolution-N", 0, "")
			zeroN := fs.Float64("zero-after-N", 0, "")
			ext := fs.Bool("extensometer", false, "")
			resMM := fs.Float64("resolution-mm", 0, "")
			if err := fs.Parse(strings.Fields(string(argsB))); err != nil {
				t.Fatal(err)
			}
			in, err := os.ReadFile(filepath.Join(dir, "readings.csv"))
			if err != nil {
				t.Fatal(err)
			}
			var got any
			if *ext {
				var d []Displacement
				if d, err = ReadDisplacements(bytes.NewReader(in)); err == nil {
					got, err = ClassifyExtensometer(d, *resMM)
				}
			} else {
				var rd []Reading
				if rd, err = ReadReadings(bytes.NewReader(in)); err == nil {
					got, err = ClassifyForce(rd, *resN, *zeroN)
				}
			}
			if wantErr, e := os.ReadFile(filepath.Join(dir, "expected-error")); e == nil {
				w := strings.TrimSpace(string(wantErr))
				if err == nil || !strings.Contains(err.Error(), w) {
					t.Fatalf("err = %v, want one containing %q", err, w)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			wantB, err := os.ReadFile(filepath.Join(dir, "expected.json"))
			if err != nil {
				t.Fatal(err)
			}
			gotB, err := json.Marshal(got)
			if err != nil {
				t.Fatal(err)
			}
			var want, gotV any
			if err := json.Unmarshal(wantB, &want); err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(gotB, &gotV); err != nil {
				t.Fatal(err)
			}
			if diffs := subsetDiff("", want, gotV); len(diffs) > 0 {
				t.Errorf("differs from expected.json:\n%s\ngot %s", strings.Join(diffs, "\n"), gotB)
			}
		})
	}
}

// subsetDiff lists where got differs from want. Objects in want need only
// their own keys in got; arrays must have the same length; numbers agree to
// 1e-9 relative (the expected values are written in decimal).
func subsetDiff(path string, want, got any) []string {
	switch w := want.(type) {
	case map[string]any:
		g, ok := got.(map[string]any)
		if !ok {
			return []string{fmt.Sprintf("%s: got %v, want an object", path, got)}
		}
		var out []string
		for k, wv := range w {
			gv, ok := g[k]
			if !ok {
				out = append(out, fmt.Sprintf("%s.%s: missing", path, k))
				continue
			}
			out = append(out, subsetDiff(path+"."+k, wv, gv)...)
		}
		return out
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			return []string{fmt.Sprintf("%s: got %v, want %d elements", path, got, len(w))}
		}
		var out []string
		for i := range w {
			out = append(out, subsetDiff(fmt.Sprintf("%s[%d]", path, i), w[i], g[i])...)
		}
		return out
	case float64:
		g, ok := got.(float64)
		if !ok || math.Abs(g-w) > 1e-9*math.Max(1, math.Abs(w)) {
			return []string{fmt.Sprintf("%s: got %v, want %v", path, got, w)}
		}
		return nil
	default:
		if want != got {
			return []string{fmt.Sprintf("%s: got %v, want %v", path, got, want)}
		}
		return nil
	}
}
