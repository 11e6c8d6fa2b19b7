package replay_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"framed/drivers"
	"framed/drivers/replay"
)

// golden is a testdata/<case>/expected.json.
type golden struct {
	Note     string `json:"note"`
	Error    string `json:"error"`
	Channels []struct {
		Name string `json:"name"`
		Unit string `json:"unit"`
	} `json:"channels"`
	Samples []struct {
		Index   int        `json:"index"`
		OffsetS float64    `json:"offset_s"`
		Values  []*float64 `json:"values"` // null: no reading
	} `json:"samples"`
	// EndError and Total: the stream ends after Total samples with an
	// error containing EndError.
	EndError string `json:"end_error"`
	Total    int    `json:"total"`
}

// caseConfig reads a case's config with its path made absolute (paths in
// the golden configs are relative to the case folder).
func caseConfig(t *testing.T, dir string) []byte {
	t.Helper()
	raw, err := os.ReadFile(filepath.Join(dir, "config.json"))
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(raw, &m); err != nil {
		t.Fatal(err)
	}
	if p, ok := m["path"].(string); ok {
		abs, err := filepath.Abs(filepath.Join(dir, p))
		if err != nil {
			t.Fatal(err)
		}
		m["path"] = abs
	}
	out, err := json.Marshal(m)
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func TestGolden(t *testing.T) {
	cfgs, err := filepath.Glob("testdata/*/config.json")
	if err != nil || len(cfgs) == 0 {
		t.Fatalf("no golden cases: %v", err)
	}
	for _, p := range cfgs {
		dir := filepath.Dir(p)
		t.Run(filepath.Base(dir), func(t *testing.T) {
			raw, err := os.ReadFile(filepath.Join(dir, "expected.json"))
			if err != nil {
				t.Fatal(err)
			}
			var want golden
			dec := json.NewDecoder(bytes.NewReader(raw))
			dec.DisallowUnknownFields()
			if err := dec.Decode(&want); err != nil {
				t.Fatalf("expected.json: %v", err)
			}
			d := replay.New()
			info, err := d.Configure(context.Background(), caseConfig(t, dir))
			if want.Error != "" {
				if !errors.Is(err, drivers.ErrBadConfig) || !strings.Contains(err.Error(), want.Error) {
					t.Fatalf("Configure: %v, want ErrBadConfig containing %q", err, want.Error)
				}
				return
			}
			if err != nil {
				t.Fatalf("Configure: %v", err)
			}
			if len(info.Channels) != len(want.Channels) {
				t.Fatalf("channels %+v, want %+v", info.Channels, want.Channels)
			}
			for i, c := range want.Channels {
				if info.Channels[i].Name != c.Name || info.Channels[i].Unit != c.Unit {
					t.Errorf("channel %d: %s in %s, want %s in %s", i, info.Channels[i].Name, info.Channels[i].Unit, c.Name, c.Unit)
				}
			}
			n := want.Total
			for _, s := range want.Samples {
				n = max(n, s.Index+1)
			}
			times, cols, end := read(t, d, n)
			if want.EndError != "" {
				if len(times) != want.Total || end == nil || !strings.Contains(end.Error(), want.EndError) {
					t.Errorf("stream gave %d samples and ended with %v, want %d and %q", len(times), end, want.Total, want.EndError)
				}
			}
			for _, s := range want.Samples {
				if off := float64(times[s.Index] - times[0]); math.Abs(off-s.OffsetS*1e9) > 0.5 {
					t.Errorf("sample %d at %v ns from the start, want %v s", s.Index, off, s.OffsetS)
				}
				for ch, w := range s.Values {
					got := cols[ch][s.Index]
					switch {
					case w == nil && !math.IsNaN(got):
						t.Errorf("sample %d %s: %v, want no reading", s.Index, info.Channels[ch].Name, got)
					case w != nil && !(math.Abs(got-*w) <= 1e-5*math.Abs(*w)+1e-9):
						t.Errorf("sample %d %s: %v, want %v", s.Index, info.Channels[ch].Name, got, *w)
					}
				}
			}
		})
	}
}

// read streams up to n samples (or to the stream's end) and returns the
// times, the columns and the error that ended the stream, if any.
func read(t *testing.T, d drivers.Driver, n int) ([]int64, [][]float64, error) {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	var times []int64
	var cols [][]float64
	var end error
	for b := range ch {
		if b.Err != nil {
			end = b.Err
			continue
		}
		if cols == nil {
			cols = make([][]float64, len(b.Values))
		}
		times = append(times, b.TimeNS...)
		for i := range b.Values {
			cols[i] = append(cols[i], b.Values[i]...)
		}
		if len(times) >= n {
			cancel()
		}
	}
	return times, cols, end
}
