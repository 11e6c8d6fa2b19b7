package lineserial

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"testing"
	"time"

	"framed/drivers"
	"framed/drivers/serialtest"
)

// firmware plays a bridge board on the master end of a pty: key=value
// lines with an XOR checksum, board microseconds at 1 kHz.
type firmware struct {
	pty    *serialtest.Pty
	micros uint32
}

func (fw *firmware) good(force, x int) string {
	line := string(AppendChecksum(fmt.Appendf(nil, "t=%d f=%d x=%d", fw.micros, force, x))) + "\r\n"
	fw.micros += 1000
	return line
}

func (fw *firmware) send(t *testing.T, s string) {
	t.Helper()
	if _, err := fw.pty.Write([]byte(s)); err != nil {
		t.Fatalf("firmware write: %v", err)
	}
}

// collect reads batches until n samples arrived or the timeout passes.
func collect(t *testing.T, ch <-chan drivers.Batch, n int, timeout time.Duration) []drivers.Batch {
	t.Helper()
	var got []drivers.Batch
	count := 0
	deadline := time.After(timeout)
	for count < n {
		select {
		case b, ok := <-ch:
			if !ok {
				t.Fatalf("stream closed after %d of %d samples", count, n)
			}
			if b.Err != nil {
				t.Fatalf("stream error: %v", b.Err)
			}
			got = append(got, b)
			count += len(b.TimeNS)
		case <-deadline:
			t.Fatalf("only %d of %d samples within %v", count, n, timeout)
		}
	}
	return got
}

func ptyConfig(path string) []byte {
	return []byte(strings.Replace(string(SampleConfig), "/dev/serial/by-id/usb-bridge-board-if00", path, 1))
}

// TestStreamOverPtyIntegration runs the driver through go.bug.st/serial
// on a real pty: bad input of every kind, then an unplug and replug.
func TestStreamOverPtyIntegration(t *testing.T) {
	p := serialtest.OpenPty(t)
	d := New()
	if _, err := d.Configure(context.Background(), ptyConfig(p.Path())); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatalf("Stream on pty %s: %v", p.SlaveName(), err)
	}
	fw := &firmware{pty: p, micros: 4294967296 - 100*1000} // wraps after 100 lines

	// 200 good lines with every kind of bad input mixed in.
	var sb strings.Builder
	for i := range 200 {
		sb.WriteString(fw.good(i, 1000+i))
		switch i {
		case 20:
			sb.WriteString("\x00\xff\xfe\x1b[2J garbage\r\n")
		case 40:
			sb.WriteString(strings.Repeat("9", 1000) + "\r\n")
		case 60:
			sb.WriteString("t=1 f=5 x=6*00\r\n") // wrong checksum
		case 80:
			sb.WriteString(string(AppendChecksum([]byte("t=1 f=nan x=6"))) + "\r\n")
		case 100:
			sb.WriteString(string(AppendChecksum([]byte("t=1 f=9000000 x=6"))) + "\r\n")
		}
		if i%50 == 49 { // 50 ms bursts at 1 kHz, like a USB bridge
			fw.send(t, sb.String())
			sb.Reset()
			time.Sleep(50 * time.Millisecond)
		}
	}
	batches := collect(t, ch, 202, 5*time.Second) // 200 good + NaN + out of range lines
	var forces []float64
	var times []int64
	for _, b := range batches {
		for i, ns := range b.TimeNS {
			times = append(times, ns)
			forces = append(forces, b.Values[0][i])
		}
	}
	// The NaN and out-of-range lines carry board time 1 (a stale stamp),
	// which re-anchors the clock; check the good lines before them: the
	// board's own 1 ms spacing, unbroken across the 32-bit wrap at line 100.
	for i := 1; i <= 80; i++ {
		if dt := times[i] - times[i-1]; dt != 1_000_000 {
			t.Fatalf("sample %d: spacing %d ns, want the board's 1 ms", i, dt)
		}
	}
	nans, k := 0, 0
	for _, f := range forces {
		if f != f {
			nans++
			continue
		}
		if int(f) != k {
			t.Fatalf("good sample %d has force %v: lost or reordered", k, f)
		}
		k++
	}
	if k != 200 || nans != 2 {
		t.Errorf("%d good samples and %d NaN, want 200 and 2", k, nans)
	}
	h, _ := d.Health(ctx)
	for name, want := range map[string]uint64{"garbled_lines": 0, "checksum_errors": 2, "overlong_lines": 1, "nan_values": 1, "out_of_range": 1, "reopens": 0} {
		if h.Counters[name] != want {
			t.Errorf("counter %s = %d, want %d", name, h.Counters[name], want)
		}
	}
	if !h.OK {
		t.Errorf("health not OK while streaming: %q", h.Message)
	}

	// Unplug mid-line, stay away 150 ms, replug a rebooted board.
	fw.send(t, "t=5 f=1")
	time.Sleep(30 * time.Millisecond) // let the driver read the half line
	p.Unplug()
	unplugged := time.Now()
	time.Sleep(150 * time.Millisecond)
	if h, _ := d.Health(ctx); h.OK {
		t.Errorf("health OK while the board is unplugged: %q", h.Message)
	}
	p.Replug()
	fw.micros = 0
	for i := range 50 {
		fw.send(t, fw.good(1000+i, i))
	}
	after := collect(t, ch, 50, 5*time.Second)
	// Board times of a burst run up to 49 ms ahead of its receipt, so the
	// gap seen is at least 150 - 49 ms.
	// The gap also holds the 30 ms before the unplug; one extra second is
	// a loose sanity bound for a loaded machine.
	if after[0].GapBefore < 100*time.Millisecond || after[0].GapBefore > time.Since(unplugged)+time.Second {
		t.Errorf("first batch after replug has GapBefore %v, want the ~150 ms away", after[0].GapBefore)
	}
	if f := after[0].Values[0][0]; f != 1000 {
		t.Errorf("first force after replug %v, want 1000", f)
	}
	h, _ = d.Health(ctx)
	if h.Counters["reopens"] != 1 || !h.OK {
		t.Errorf("after replug: reopens %d, OK %v %q", h.Counters["reopens"], h.OK, h.Message)
	}
	if h.Counters["garbled_lines"] != 1 { // the line cut by the unplug
		t.Errorf("garbled_lines %d, want 1 (the partial line at unplug)", h.Counters["garbled_lines"])
	}

	cancel()
	select {
	case _, ok := <-ch:
		for ok {
			_, ok = <-ch
		}
	case <-time.After(2 * time.Second):
		t.Fatal("stream not closed within 2 s of cancel")
	}
}

func TestStreamContractErrors(t *testing.T) {
	ctx := context.Background()
	d := NewWithOpener(func(Config) (Port, error) { return nil, errors.New("no such file") })
	if _, err := d.Stream(ctx); !errors.Is(err, drivers.ErrNotConfigured) {
		t.Errorf("Stream before Configure: %v", err)
	}
	if _, err := d.Configure(ctx, SampleConfig); err != nil {
		t.Fatal(err)
	}
	if _, err := d.Stream(ctx); !errors.Is(err, drivers.ErrDeviceGone) {
		t.Errorf("Stream with a missing port: %v, want ErrDeviceGone", err)
	}
	if h, _ := d.Health(ctx); h.Counters["open_failures"] != 1 {
		t.Errorf("open_failures %d", h.Counters["open_failures"])
	}

	pb := serialtest.NewPlayback()
	d = NewWithOpener(func(Config) (Port, error) { return pb, nil })
	if _, err := d.Configure(ctx, SampleConfig); err != nil {
		t.Fatal(err)
	}
	sctx, cancel := context.WithCancel(ctx)
	ch, err := d.Stream(sctx)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := d.Stream(sctx); !errors.Is(err, drivers.ErrStreaming) {
		t.Errorf("second Stream: %v, want ErrStreaming", err)
	}
	if _, err := d.Configure(ctx, SampleConfig); !errors.Is(err, drivers.ErrStreaming) {
		t.Errorf("Configure while streaming: %v, want ErrStreaming", err)
	}
	// A bad config is refused and changes nothing, even while streaming.
	if _, err := d.Configure(ctx, []byte(`{"port":""}`)); !errors.Is(err, drivers.ErrBadConfig) {
		t.Errorf("bad Configure: %v", err)
	}
	cancel()
	for range ch {
	}
	if info, _ := d.Describe(ctx); len(info.Channels) != 2 || info.Driver != DriverName {
		t.Errorf("Describe after stream: %+v", info)
	}
}
