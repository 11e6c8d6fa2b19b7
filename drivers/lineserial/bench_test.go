package lineserial

import (
	"context"
	"fmt"
	"testing"
	"time"

	"framed/drivers/serialtest"
)

// BenchmarkParseLine measures lines/s through the assembler and parser on
// realistic checksummed key=value lines. Target: well above 200000
// lines/s, so parsing never limits a 1 kHz board.
func BenchmarkParseLine(b *testing.B) {
	p := mustParser(b, string(SampleConfig))
	var chunk []byte
	const lines = 1000
	for i := range lines {
		line := AppendChecksum(fmt.Appendf(nil, "t=%d f=%d x=%d", 1000000+i*1000, -8388+i*7, 10234+i))
		chunk = append(append(chunk, line...), '\r', '\n')
	}
	a := newAssembler(256)
	var s Sample
	bad := 0
	onLine := func(l []byte) {
		if p.Parse(l, &s) != nil {
			bad++
		}
	}
	onOver := func() { bad++ }
	b.SetBytes(int64(len(chunk)))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		a.feed(chunk, onLine, onOver)
	}
	b.StopTimer()
	if bad != 0 {
		b.Fatalf("%d lines refused", bad)
	}
	b.ReportMetric(float64(b.N)*lines/b.Elapsed().Seconds(), "lines/s")
}

// BenchmarkStreamOverPty measures lines/s through the whole driver: the
// kernel pty, go.bug.st/serial, the assembler, the parser and batching.
func BenchmarkStreamOverPty(b *testing.B) {
	p := serialtest.OpenPty(b)
	d := New()
	if _, err := d.Configure(context.Background(), ptyConfig(p.Path())); err != nil {
		b.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	ch, err := d.Stream(ctx)
	if err != nil {
		b.Fatal(err)
	}
	const lines = 1000
	var chunk []byte
	micros := uint32(0)
	for i := range lines {
		chunk = append(append(chunk, AppendChecksum(fmt.Appendf(nil, "t=%d f=%d x=%d", micros, -8388+i, i))...), '\r', '\n')
		micros += 1000
	}
	b.ResetTimer()
	go func() {
		for range b.N {
			// Each repeat sends the board clock 1 s back: the driver
			// takes it for a board restart, re-anchors and drops nothing.
			if _, err := p.Write(chunk); err != nil {
				return
			}
		}
	}()
	got := 0
	for got < b.N*lines {
		select {
		case bt := <-ch:
			got += len(bt.TimeNS)
		case <-time.After(5 * time.Second):
			b.Fatalf("stalled at %d of %d lines", got, b.N*lines)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(got)/b.Elapsed().Seconds(), "lines/s")
}
