package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"io"
	"log"
	"math"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/simonvetter/modbus"

	"framed/drivers/lineserial"
	"framed/drivers/modbusrtu"
)

// lockedBuffer is a bytes.Buffer safe to read while the command writes.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

// startSimboard runs framectl simboard in the background and waits for its
// link to appear. The returned channel yields the command's error.
func startSimboard(t *testing.T, args ...string) (link string, out *lockedBuffer, done <-chan error) {
	t.Helper()
	link = filepath.Join(t.TempDir(), "board")
	out = &lockedBuffer{}
	ch := make(chan error, 1)
	ctx, cancel := context.WithCancel(context.Background())
	go func() {
		ch <- runSimboard(ctx, append(args[:1:1], append([]string{"--link", link}, args[1:]...)...), out, io.Discard)
	}()
	t.Cleanup(cancel)
	deadline := time.Now().Add(10 * time.Second)
	for {
		if _, err := os.Lstat(link); err == nil && strings.Contains(out.String(), "Driver entry") {
			break
		}
		select {
		case err := <-ch:
			t.Fatalf("simboard ended before its link appeared: %v\n%s", err, out.String())
		default:
		}
		if time.Now().After(deadline) {
			t.Fatalf("no link %s within 10 s", link)
		}
		time.Sleep(10 * time.Millisecond)
	}
	return link, out, ch
}

// printedConfig is the driver entry's config the simulator printed.
func printedConfig(t *testing.T, out string) json.RawMessage {
	t.Helper()
	_, js, ok := strings.Cut(out, "(\"drivers\": [...]):\n")
	if !ok {
		t.Fatalf("no driver entry in %q", out)
	}
	var entry struct {
		Kind   string          `json:"kind"`
		Config json.RawMessage `json:"config"`
	}
	if err := json.NewDecoder(strings.NewReader(js)).Decode(&entry); err != nil {
		t.Fatalf("driver entry: %v in %q", err, js)
	}
	return entry.Config
}

func TestSimboardLineserialScript(t *testing.T) {
	link, out, done := startSimboard(t, "lineserial", "--rate-hz", "200", "--noise-counts", "0",
		"--nonlinearity-pct", "0", "--script", "0:400ms,12:800ms")
	cfg, err := lineserial.ParseConfig(printedConfig(t, out.String()))
	if err != nil {
		t.Fatalf("the printed config is refused by the driver: %v", err)
	}
	if cfg.Port != link {
		t.Errorf("printed port %q, want the link %q", cfg.Port, link)
	}
	f, err := os.Open(link)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	p := lineserial.NewParser(cfg)
	var s lineserial.Sample
	sc := bufio.NewScanner(f)
	// Unloaded the board reads its offset; with 12 kg at standard gravity
	// (9.80665 m/s2, 3rd CGPM) and the default 1000 counts/N it adds
	// 117679.8 counts, rounded to 117680.
	unloaded, loaded := 120000.0, 120000.0+117680
	var sawUnloaded, sawLoaded bool
	for !(sawUnloaded && sawLoaded) && sc.Scan() {
		line := strings.TrimSuffix(sc.Text(), "\r")
		if strings.HasPrefix(line, "#") {
			continue
		}
		if err := p.Parse([]byte(line), &s); err != nil {
			t.Fatalf("line %q: %v", line, err)
		}
		switch s.Values[0] {
		case unloaded:
			sawUnloaded = true
		case loaded:
			sawLoaded = true
		default:
			t.Fatalf("force %v counts: neither %v nor %v", s.Values[0], unloaded, loaded)
		}
	}
	if !sawLoaded {
		t.Fatalf("never saw the loaded reading: %v", sc.Err())
	}
	select {
	case err := <-done:
		if err != nil {
			t.Errorf("simboard: %v", err)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("simboard did not stop at the end of its script")
	}
	if _, err := os.Lstat(link); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("link left behind after the simulator stopped: %v", err)
	}
}

// The indicator answers an independent Modbus client (simonvetter/modbus)
// with the typed load, and stops on q.
func TestSimboardModbusrtuTypedLoad(t *testing.T) {
	r, w := io.Pipe()
	old := simboardStdin
	simboardStdin = r
	t.Cleanup(func() { simboardStdin = old; w.Close() })
	link, out, done := startSimboard(t, "modbusrtu", "--slave", "4", "--zero-N", "1.5")
	cfg, err := modbusrtu.ParseConfig(printedConfig(t, out.String()))
	if err != nil {
		t.Fatalf("the printed config is refused by the driver: %v", err)
	}
	if cfg.SlaveID != 4 || cfg.Port != link {
		t.Errorf("printed config names slave %d on %q, want 4 on %q", cfg.SlaveID, cfg.Port, link)
	}
	if _, err := io.WriteString(w, "50\n"); err != nil {
		t.Fatal(err)
	}
	mc, err := modbus.NewClient(&modbus.ClientConfiguration{URL: "rtu://" + link, Speed: 19200, DataBits: 8,
		Parity: modbus.PARITY_EVEN, StopBits: 1, Timeout: 300 * time.Millisecond, Logger: log.New(io.Discard, "", 0)})
	if err != nil {
		t.Fatal(err)
	}
	mc.SetUnitId(4)
	if err := mc.Open(); err != nil {
		t.Fatal(err)
	}
	// 50 kg at 9.80665 m/s2 is 490.3325 N; shown with the 1.5 N zero as
	// 491.8 N, i.e. 4918 in 0.1 N.
	var got uint32
	deadline := time.Now().Add(5 * time.Second)
	for got != 4918 && time.Now().Before(deadline) {
		got, err = mc.ReadUint32(0, modbus.HOLDING_REGISTER)
		time.Sleep(20 * time.Millisecond)
	}
	if got != 4918 {
		t.Errorf("force register %d (%v), want 4918", got, err)
	}
	mc.SetEncoding(modbus.BIG_ENDIAN, modbus.LOW_WORD_FIRST)
	// Default 2e-4 mm/N: 0.0980665 mm, as a float32.
	if d, err := mc.ReadFloat32(10, modbus.INPUT_REGISTER); err != nil || math.Abs(float64(d)-0.0980665) > 1e-7 {
		t.Errorf("displacement register %v mm (%v), want 0.0980665", d, err)
	}
	mc.Close() // before the pty goes away
	io.WriteString(w, "q\n")
	select {
	case err := <-done:
		if err != nil {
			t.Errorf("simboard: %v", err)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("simboard did not stop on q")
	}
	if !strings.Contains(out.String(), "hung 490.33") {
		t.Errorf("no echo of the hung load in %q", out.String())
	}
}

func TestSimboardUsageErrors(t *testing.T) {
	dir := t.TempDir()
	link := filepath.Join(dir, "b")
	for _, args := range [][]string{
		{},
		{"usbthing"},
		{"lineserial", "--link", link, "--rate-hz", "0"},
		{"lineserial", "--link", link, "--script", "10kg"},
		{"lineserial", "--link", link, "--counts-per-N", "0"},
		{"lineserial", "--link", link, "--g", "98.1"},
		{"lineserial", "--link", link, "extra"},
		{"modbusrtu", "--link", link, "--slave", "0"},
		{"modbusrtu", "--link", link, "--noise-N", "-1"},
	} {
		err := runSimboard(context.Background(), args, io.Discard, io.Discard)
		if !errors.Is(err, errUsage) {
			t.Errorf("simboard %q: %v, want a usage error", args, err)
		}
	}
	if _, err := os.Lstat(link); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a refused command left %s behind", link)
	}
}
