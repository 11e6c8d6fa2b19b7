package lineserial

import (
	"fmt"
	"testing"
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
