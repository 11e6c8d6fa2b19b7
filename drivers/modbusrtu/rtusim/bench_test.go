package rtusim

import "testing"

// BenchmarkFeed measures requests answered per second (framing, CRC and
// register lookup, no I/O) for the two-register force read a weighing
// indicator's master polls.
func BenchmarkFeed(b *testing.B) {
	s, _ := NewSlave(1)
	s.SetHolding(0, 0x0000, 0x3039)
	req := AppendCRC([]byte{0x01, 0x03, 0x00, 0x00, 0x00, 0x02})
	for b.Loop() {
		if a, _ := s.Feed(req); len(a) != 1 {
			b.Fatal("no answer")
		}
	}
}
