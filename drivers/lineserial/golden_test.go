package lineserial

import (
	"context"
	"encoding/json"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"framed/drivers"
	"framed/drivers/serialtest"
)

// golden is testdata/<case>/want.json: samples as [time_us since the
// first sample, value per channel] with null for NaN, the batches that
// carry GapBefore (first sample index -> gap in us), and Health counters.
type golden struct {
	Samples  [][]*float64      `json:"samples"`
	GapsUS   map[string]int64  `json:"gaps_us"`
	Counters map[string]uint64 `json:"counters"`
}

// recordingPort remembers the error of Close, so a test can tell that the
// driver consumed the whole script before it closed the port.
type recordingPort struct {
	*serialtest.Playback
	mu       sync.Mutex
	closeErr error
	closed   bool
}

func (p *recordingPort) Close() error {
	err := p.Playback.Close()
	p.mu.Lock()
	p.closeErr, p.closed = err, true
	p.mu.Unlock()
	return err
}

// runPlayback streams script through a driver configured with config,
// until the script ends with a disconnect and the driver tries to reopen.
func runPlayback(t *testing.T, config []byte, ops ...serialtest.Op) ([]drivers.Batch, drivers.Health, *recordingPort) {
	t.Helper()
	port := &recordingPort{Playback: serialtest.NewPlayback(ops...)}
	reopened := make(chan struct{})
	var once sync.Once
	calls := 0
	d := NewWithOpener(func(c Config) (Port, error) {
		calls++
		if calls == 1 {
			return port, nil
		}
		once.Do(func() { close(reopened) })
		return nil, errors.New("playback: no second port")
	})
	if _, err := d.Configure(context.Background(), config); err != nil {
		t.Fatalf("Configure: %v", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatalf("Stream: %v", err)
	}
	var batches []drivers.Batch
	done := make(chan struct{})
	go func() {
		for b := range ch {
			batches = append(batches, b)
		}
		close(done)
	}()
	select {
	case <-reopened:
	case <-time.After(5 * time.Second):
		t.Fatal("driver never tried to reopen after the scripted disconnect")
	}
	h, _ := d.Health(ctx)
	cancel()
	<-done
	return batches, h, port
}

func TestGoldenCases(t *testing.T) {
	dirs, err := filepath.Glob("testdata/*/config.json")
	if err != nil || len(dirs) == 0 {
		t.Fatalf("no golden cases: %v", err)
	}
	for _, cfgPath := range dirs {
		dir := filepath.Dir(cfgPath)
		t.Run(filepath.Base(dir), func(t *testing.T) {
			config, err := os.ReadFile(cfgPath)
			if err != nil {
				t.Fatal(err)
			}
			if wantErr, err := os.ReadFile(filepath.Join(dir, "want_error.txt")); err == nil {
				_, err := NewWithOpener(func(Config) (Port, error) {
					t.Fatal("a bad config must fail before any I/O")
					return nil, nil
				}).Configure(context.Background(), config)
				if !errors.Is(err, drivers.ErrBadConfig) || !strings.Contains(err.Error(), strings.TrimSpace(string(wantErr))) {
					t.Fatalf("Configure error %v, want ErrBadConfig containing %q", err, wantErr)
				}
				return
			}
			input, err := os.ReadFile(filepath.Join(dir, "input.txt"))
			if err != nil {
				t.Fatal(err)
			}
			var want golden
			raw, err := os.ReadFile(filepath.Join(dir, "want.json"))
			if err != nil {
				t.Fatal(err)
			}
			if err := json.Unmarshal(raw, &want); err != nil {
				t.Fatalf("want.json: %v", err)
			}
			batches, health, port := runPlayback(t, config, serialtest.Op{R: input}, serialtest.Op{Err: io.ErrUnexpectedEOF})
			if port.closeErr != nil || !port.closed {
				t.Errorf("port closed=%v with %v: the driver left scripted bytes unread", port.closed, port.closeErr)
			}
			checkGolden(t, batches, health, want)
		})
	}
}

func checkGolden(t *testing.T, batches []drivers.Batch, health drivers.Health, want golden) {
	t.Helper()
	var times []int64
	var rows [][]float64
	gaps := map[string]int64{}
	for i, b := range batches {
		if b.Seq != uint64(i) {
			t.Errorf("batch %d has Seq %d", i, b.Seq)
		}
		if b.GapBefore > 0 {
			gaps[strconv.Itoa(len(times))] = b.GapBefore.Microseconds()
		}
		for j, ns := range b.TimeNS {
			times = append(times, ns)
			row := make([]float64, len(b.Values))
			for c := range b.Values {
				row[c] = b.Values[c][j]
			}
			rows = append(rows, row)
		}
	}
	if len(rows) != len(want.Samples) {
		t.Fatalf("got %d samples, want %d: %v", len(rows), len(want.Samples), rows)
	}
	for i, w := range want.Samples {
		if dt := (times[i] - times[0]) / 1000; w[0] == nil || float64(dt) != *w[0] {
			t.Errorf("sample %d at %d us, want %v", i, dt, *w[0])
		}
		for c, v := range rows[i] {
			wv := w[c+1]
			switch {
			case wv == nil && !math.IsNaN(v):
				t.Errorf("sample %d channel %d = %v, want NaN", i, c, v)
			case wv != nil && !(math.Abs(v-*wv) <= 1e-9*math.Max(1, math.Abs(*wv))):
				t.Errorf("sample %d channel %d = %v, want %v", i, c, v, *wv)
			}
		}
	}
	if len(gaps) != len(want.GapsUS) {
		t.Errorf("gaps %v, want %v", gaps, want.GapsUS)
	}
	for k, v := range want.GapsUS {
		if gaps[k] != v {
			t.Errorf("gap before sample %s = %d us, want %d", k, gaps[k], v)
		}
	}
	for k, v := range want.Counters {
		if got, ok := health.Counters[k]; !ok || got != v {
			t.Errorf("counter %s = %d (present %v), want %d", k, got, ok, v)
		}
	}
}
