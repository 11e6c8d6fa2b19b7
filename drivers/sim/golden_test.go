package sim_test

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"framed/drivers"
	"framed/drivers/sim"
)

// golden is a testdata/<case>/expected.json: either the error a config
// must be refused with, or the channels and some samples it must give.
type golden struct {
	Note     string `json:"note"`
	Error    string `json:"error"`
	Channels []struct {
		Name string `json:"name"`
		Unit string `json:"unit"`
	} `json:"channels"`
	RateHz  float64 `json:"rate_hz"`
	Samples []struct {
		Index  int        `json:"index"`
		Values []*float64 `json:"values"` // null: no reading
	} `json:"samples"`
}

func TestGolden(t *testing.T) {
	dirs, err := filepath.Glob("testdata/*/config.json")
	if err != nil || len(dirs) == 0 {
		t.Fatalf("no golden cases: %v", err)
	}
	for _, cfgPath := range dirs {
		dir := filepath.Dir(cfgPath)
		t.Run(filepath.Base(dir), func(t *testing.T) {
			cfg, err := os.ReadFile(cfgPath)
			if err != nil {
				t.Fatal(err)
			}
			raw, err := os.ReadFile(filepath.Join(dir, "expected.json"))
			if err != nil {
				t.Fatal(err)
			}
			var want golden
			if err := json.Unmarshal(raw, &want); err != nil {
				t.Fatalf("expected.json: %v", err)
			}
			d := sim.New()
			info, err := d.Configure(context.Background(), cfg)
			if want.Error != "" {
				if !errors.Is(err, drivers.ErrBadConfig) || !strings.Contains(err.Error(), want.Error) {
					t.Fatalf("Configure: %v, want ErrBadConfig containing %q", err, want.Error)
				}
				return
			}
			if err != nil {
				t.Fatalf("Configure: %v", err)
			}
			if len(info.Channels) != len(want.Channels) || info.SampleRateHz != want.RateHz {
				t.Fatalf("info %+v, want channels %+v at %v Hz", info, want.Channels, want.RateHz)
			}
			for i, c := range want.Channels {
				if info.Channels[i].Name != c.Name || info.Channels[i].Unit != c.Unit {
					t.Errorf("channel %d: %s in %s, want %s in %s", i, info.Channels[i].Name, info.Channels[i].Unit, c.Name, c.Unit)
				}
			}
			last := 0
			for _, s := range want.Samples {
				last = max(last, s.Index)
			}
			cols := readSamples(t, d, last+1)
			for _, s := range want.Samples {
				for ch, w := range s.Values {
					got := cols[ch][s.Index]
					// One count of the channel's resolution either way.
					tol := info.Channels[ch].Resolution
					switch {
					case w == nil && !math.IsNaN(got):
						t.Errorf("sample %d channel %s: %v, want no reading", s.Index, info.Channels[ch].Name, got)
					case w != nil && !(math.Abs(got-*w) <= tol+1e-12):
						t.Errorf("sample %d channel %s: %v, want %v +- %v", s.Index, info.Channels[ch].Name, got, *w, tol)
					}
				}
			}
		})
	}
}

// readSamples streams n samples from a configured driver, in columns.
func readSamples(t *testing.T, d drivers.Driver, n int) [][]float64 {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}
	var cols [][]float64
	got := 0
	for b := range ch {
		if b.Err != nil {
			t.Fatalf("stream ended: %v", b.Err)
		}
		if cols == nil {
			cols = make([][]float64, len(b.Values))
		}
		for i := range b.Values {
			cols[i] = append(cols[i], b.Values[i]...)
		}
		got += len(b.TimeNS)
		if got >= n {
			cancel()
			for range ch {
			}
			break
		}
	}
	return cols
}
