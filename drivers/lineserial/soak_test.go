package lineserial

import (
	"context"
	"fmt"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"
	"time"

	"framed/drivers/serialtest"
)

// TestRandomBadInputIntegration streams lines with random bad input mixed
// in through a pty and checks that every good line arrives, in order, and
// every bad one is counted exactly once. It sends 3000 lines by default;
// FRAMED_SERIAL_SOAK_LINES=1000000 makes it a soak run (a few seconds,
// some 100 MB of memory for the pre-built stream).
func TestRandomBadInputIntegration(t *testing.T) {
	lines := 3000
	if s := os.Getenv("FRAMED_SERIAL_SOAK_LINES"); s != "" {
		n, err := strconv.Atoi(s)
		if err != nil || n < 1 {
			t.Fatalf("FRAMED_SERIAL_SOAK_LINES=%q: want a positive count", s)
		}
		lines = n
	}
	p := serialtest.OpenPty(t)
	d := New()
	if _, err := d.Configure(context.Background(), ptyConfig(p.Path())); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		t.Fatal(err)
	}

	rng := rand.New(rand.NewPCG(6892, 1))
	fw := &firmware{pty: p, micros: rng.Uint32()}
	var want struct{ samples, badLines, overlong, nan, outOfRange int }
	var forces []float64 // expected force column, NaN as -1e300 marker
	noise := func(n int) string {
		b := make([]byte, n)
		for i := range b {
			for b[i] = byte(rng.IntN(256)); b[i] == '\n' || b[i] == '\r' || b[i] == '#'; b[i] = byte(rng.IntN(256)) {
			}
		}
		return string(b)
	}
	var burst []byte
	for i := range lines {
		switch r := rng.IntN(100); {
		case r < 2:
			burst = append(burst, noise(1+rng.IntN(40))+"\n"...)
			want.badLines++
		case r < 3:
			burst = append(burst, noise(300+rng.IntN(300))+"\n"...)
			want.overlong++
		case r < 5:
			burst = append(burst, fmt.Sprintf("t=%d f=%d x=1*00\r\n", fw.micros, i)...) // wrong checksum
			want.badLines++
		case r < 6:
			line := string(AppendChecksum(fmt.Appendf(nil, "t=%d f=NaN x=%d", fw.micros, i)))
			fw.micros += 1000
			burst = append(burst, line+"\r\n"...)
			want.nan++
			want.samples++
			forces = append(forces, -1e300)
		case r < 7:
			big := 8388608 + rng.IntN(1000)
			if rng.IntN(2) == 0 {
				big = -big - 1
			}
			line := string(AppendChecksum(fmt.Appendf(nil, "t=%d f=%d x=%d", fw.micros, big, i)))
			fw.micros += 1000
			burst = append(burst, line+"\r\n"...)
			want.outOfRange++
			want.samples++
			forces = append(forces, -1e300)
		}
		force := rng.IntN(16777216) - 8388608
		burst = append(burst, fw.good(force, i)...)
		want.samples++
		forces = append(forces, float64(force))
	}
	// The board writes while the test reads: a pty blocks the writer when
	// the driver falls behind, as a USB link would.
	writeErr := make(chan error, 1)
	go func() {
		for len(burst) > 0 {
			n := min(len(burst), 4096)
			if _, err := p.Write(burst[:n]); err != nil {
				writeErr <- err
				return
			}
			burst = burst[n:]
		}
		writeErr <- nil
	}()

	got := 0
	deadline := time.After(time.Duration(lines/1000+10) * time.Second)
	for got < want.samples {
		select {
		case b := <-ch:
			for _, f := range b.Values[0] {
				w := forces[got]
				if w == -1e300 && f == f || w != -1e300 && f != w {
					t.Fatalf("sample %d force %v, want %v (NaN if -1e300)", got, f, w)
				}
				got++
			}
		case <-deadline:
			t.Fatalf("%d of %d samples arrived", got, want.samples)
		}
	}
	if err := <-writeErr; err != nil {
		t.Fatalf("board write: %v", err)
	}
	h, _ := d.Health(ctx)
	c := h.Counters
	if int(c["samples"]) != want.samples || int(c["overlong_lines"]) != want.overlong ||
		int(c["nan_values"]) != want.nan || int(c["out_of_range"]) != want.outOfRange ||
		int(c["garbled_lines"]+c["checksum_errors"]) != want.badLines {
		t.Errorf("counters %v, want %+v", c, want)
	}
}
