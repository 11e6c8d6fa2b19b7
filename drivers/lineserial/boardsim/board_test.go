package boardsim

import (
	"bufio"
	"context"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"framed/drivers/lineserial"
)

// sampleParser is drivers/lineserial's own parser for its sample
// configuration: the board's lines must read there as the driver reads
// them.
func sampleParser(t *testing.T) *lineserial.Parser {
	t.Helper()
	c, err := lineserial.ParseConfig(lineserial.SampleConfig)
	if err != nil {
		t.Fatal(err)
	}
	return lineserial.NewParser(c)
}

func TestLinesReadThroughDriverParser(t *testing.T) {
	cell := LoadCell{OffsetCounts: 120000, CountsPerN: 1000, NonlinearityPct: 0.05, FullScaleN: 5000}
	var load Load
	load.Set(98.0665)
	b, err := NewBoard(cell, &load, 1)
	if err != nil {
		t.Fatal(err)
	}
	b.CrossheadCounts = 4000
	b.StartUS = math.MaxUint32 - 1500 // wraps between lines 1 and 2
	p := sampleParser(t)
	var s lineserial.Sample
	for i := int64(0); i < 4; i++ {
		line := b.AppendLine(nil, i, 1000)
		if !strings.HasSuffix(string(line), "\r\n") {
			t.Fatalf("line %q does not end in CRLF", line)
		}
		if err := p.Parse(line[:len(line)-2], &s); err != nil {
			t.Fatalf("driver parser refuses %q: %v", line, err)
		}
		// Board time: StartUS + i ms, modulo 2^32.
		if want := uint64(uint32(math.MaxUint32 - 1500 + uint32(i)*1000)); s.BoardTime != want {
			t.Errorf("line %d time %d, want %d", i, s.BoardTime, want)
		}
		// 120000 + 1000 x 98.0665 x (1 + 0.0005 x 98.0665/5000) = 218067.46..., rounded.
		if want := math.Round(120000 + 1000*98.0665*(1+0.0005*98.0665/5000)); s.Values[0] != want {
			t.Errorf("force counts %v, want %v", s.Values[0], want)
		}
		// The sample configuration scales the crosshead by 0.0025 mm/count.
		if s.Values[1] != 10 {
			t.Errorf("crosshead %v mm, want 10", s.Values[1])
		}
	}
}

func TestRunOverLinkIntegration(t *testing.T) {
	link, err := OpenLink(filepath.Join(t.TempDir(), "board"))
	if err != nil {
		t.Fatal(err)
	}
	defer link.Close()
	f, err := os.Open(link.Path())
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var load Load
	b, err := NewBoard(DefaultCell, &load, 7)
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error, 1)
	go func() { done <- b.Run(ctx, link, 500) }()
	p := sampleParser(t)
	sc := bufio.NewScanner(f)
	var s lineserial.Sample
	var prev uint64
	n := 0
	for n < 100 && sc.Scan() {
		line := strings.TrimSuffix(sc.Text(), "\r")
		if strings.HasPrefix(line, "#") {
			continue
		}
		if err := p.Parse([]byte(line), &s); err != nil {
			t.Fatalf("line %d %q: %v", n, line, err)
		}
		// 500 Hz is a board tick of 2000 us.
		if n > 0 && s.BoardTime-prev != 2000 {
			t.Errorf("line %d: board clock stepped %d us, want 2000", n, s.BoardTime-prev)
		}
		prev = s.BoardTime
		// Unloaded: the offset, within 6 noise sd.
		if math.Abs(s.Values[0]-DefaultCell.OffsetCounts) > 6*DefaultCell.NoiseCounts {
			t.Errorf("unloaded reading %v counts, offset %v", s.Values[0], DefaultCell.OffsetCounts)
		}
		n++
	}
	cancel()
	if err := <-done; err != nil {
		t.Errorf("Run: %v", err)
	}
	if n < 100 {
		t.Errorf("read %d lines: %v", n, sc.Err())
	}
}

func TestRunRefusesBadRate(t *testing.T) {
	b, _ := NewBoard(DefaultCell, &Load{}, 1)
	for _, r := range []float64{0, -1, math.NaN(), math.Inf(1)} {
		if err := b.Run(context.Background(), os.Stdout, r); !errors.Is(err, ErrBadRate) {
			t.Errorf("rate %v: %v, want ErrBadRate", r, err)
		}
	}
}

func TestLinkDropsWhenNobodyReads(t *testing.T) {
	link, err := OpenLink(filepath.Join(t.TempDir(), "board"))
	if err != nil {
		t.Fatal(err)
	}
	defer link.Close()
	// Far more than a pty buffers: the writes must come back (dropped),
	// not block the board forever.
	buf := make([]byte, 64<<10)
	done := make(chan error, 1)
	go func() {
		var err error
		for range 8 {
			if _, err = link.Write(buf); err != nil {
				break
			}
		}
		done <- err
	}()
	select {
	case err := <-done:
		if err != nil {
			t.Fatalf("Write: %v", err)
		}
	case <-time.After(20 * time.Second):
		t.Fatal("writes with nobody reading blocked")
	}
	if link.Dropped() == 0 {
		t.Errorf("512 KiB written with nobody reading and nothing dropped")
	}
}

func TestOpenLinkKeepsOtherFiles(t *testing.T) {
	path := filepath.Join(t.TempDir(), "notalink")
	if err := os.WriteFile(path, []byte("keep"), 0o600); err != nil {
		t.Fatal(err)
	}
	if _, err := OpenLink(path); !errors.Is(err, ErrLink) {
		t.Errorf("OpenLink over a regular file: %v, want ErrLink", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "keep" {
		t.Errorf("regular file changed to %q", b)
	}
}
