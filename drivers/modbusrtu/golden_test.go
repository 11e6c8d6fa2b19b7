package modbusrtu

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/simonvetter/modbus"

	"framed/drivers"
)

// fakeClient answers from register maps and fails the first attempts of
// a kind as scripted, recording every read.
type fakeClient struct {
	mu     sync.Mutex
	down   bool // every read times out, as with the device switched off
	regs   map[string]map[uint16]uint16
	faults map[string][]error
	reads  [][3]any
	closed bool
}

func (f *fakeClient) ReadRegisters(start, count uint16, input bool) ([]uint16, error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.down {
		return nil, modbus.ErrRequestTimedOut
	}
	kind := "holding"
	if input {
		kind = "input"
	}
	f.reads = append(f.reads, [3]any{kind, float64(start), float64(count)})
	if q := f.faults[kind]; len(q) > 0 {
		f.faults[kind] = q[1:]
		return nil, q[0]
	}
	out := make([]uint16, count)
	for i := range out {
		out[i] = f.regs[kind][start+uint16(i)]
	}
	return out, nil
}

func (f *fakeClient) Close() error {
	f.mu.Lock()
	defer f.mu.Unlock()
	f.closed = true
	return nil
}

func (f *fakeClient) setDown(down bool) {
	f.mu.Lock()
	f.down = down
	f.mu.Unlock()
}

var faultErrors = map[string]error{
	"crc": modbus.ErrBadCRC, "timeout": modbus.ErrRequestTimedOut,
	"exception": modbus.ErrIllegalDataAddress, "short": modbus.ErrShortFrame,
}

func loadFake(t *testing.T, path string) *fakeClient {
	var raw struct {
		Holding map[string]uint16   `json:"holding"`
		Input   map[string]uint16   `json:"input"`
		Faults  map[string][]string `json:"faults"`
		Note    string              `json:"note"`
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(data, &raw); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	f := &fakeClient{regs: map[string]map[uint16]uint16{"holding": {}, "input": {}}, faults: map[string][]error{}}
	for kind, m := range map[string]map[string]uint16{"holding": raw.Holding, "input": raw.Input} {
		for k, v := range m {
			a, err := strconv.ParseUint(k, 10, 16)
			if err != nil {
				t.Fatalf("%s: address %q", path, k)
			}
			f.regs[kind][uint16(a)] = v
		}
	}
	for kind, names := range raw.Faults {
		for _, n := range names {
			e, ok := faultErrors[n]
			if !ok {
				t.Fatalf("%s: fault %q", path, n)
			}
			f.faults[kind] = append(f.faults[kind], e)
		}
	}
	return f
}

func TestGoldenCases(t *testing.T) {
	cfgs, _ := filepath.Glob("testdata/*/config.json")
	if len(cfgs) == 0 {
		t.Fatal("no golden cases")
	}
	for _, cfgPath := range cfgs {
		dir := filepath.Dir(cfgPath)
		t.Run(filepath.Base(dir), func(t *testing.T) {
			config, err := os.ReadFile(cfgPath)
			if err != nil {
				t.Fatal(err)
			}
			if wantErr, err := os.ReadFile(filepath.Join(dir, "want_error.txt")); err == nil {
				_, err := NewWithDialer(func(Config) (Client, error) {
					t.Fatal("a bad config must fail before any I/O")
					return nil, nil
				}).Configure(context.Background(), config)
				if !errors.Is(err, drivers.ErrBadConfig) || !strings.Contains(err.Error(), strings.TrimSpace(string(wantErr))) {
					t.Fatalf("Configure: %v, want ErrBadConfig containing %q", err, wantErr)
				}
				return
			}
			var want struct {
				Values   []*float64        `json:"values"`
				Reads    [][3]any          `json:"reads"`
				Counters map[string]uint64 `json:"counters"`
			}
			data, err := os.ReadFile(filepath.Join(dir, "want.json"))
			if err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(data, &want); err != nil {
				t.Fatal(err)
			}
			c, err := ParseConfig(config)
			if err != nil {
				t.Fatal(err)
			}
			fake := loadFake(t, filepath.Join(dir, "registers.json"))
			var cnt counters
			out := make(chan drivers.Batch, 1)
			p := newPoller(c, &cnt, out, 0)
			ctx, cancel := context.WithCancel(context.Background())
			defer cancel()
			p.ctx = ctx
			if err := p.pollOnce(fake, time.Now()); err != nil {
				t.Fatalf("pollOnce: %v", err)
			}
			p.flush()
			b := <-out
			if len(b.TimeNS) != 1 || len(b.Values) != len(want.Values) {
				t.Fatalf("batch %+v, want one sample of %d channels", b, len(want.Values))
			}
			for i, w := range want.Values {
				got := b.Values[i][0]
				switch {
				case w == nil && !math.IsNaN(got):
					t.Errorf("channel %d = %v, want NaN", i, got)
				case w != nil && math.Abs(got-*w) > 1e-9*math.Max(1, math.Abs(*w)):
					t.Errorf("channel %d = %v, want %v", i, got, *w)
				}
			}
			if len(fake.reads) != len(want.Reads) {
				t.Errorf("reads %v, want %v", fake.reads, want.Reads)
			} else {
				for i := range want.Reads {
					if fake.reads[i] != want.Reads[i] {
						t.Errorf("read %d = %v, want %v", i, fake.reads[i], want.Reads[i])
					}
				}
			}
			snap := cnt.snapshot()
			for k, v := range want.Counters {
				if got, ok := snap[k]; !ok || got != v {
					t.Errorf("counter %s = %d (present %v), want %d", k, got, ok, v)
				}
			}
		})
	}
}
