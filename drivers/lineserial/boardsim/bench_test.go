package boardsim

import "testing"

// BenchmarkAppendLine measures how many simulated lines per second one
// core formats (noise, counts, checksum): the ceiling of --rate-hz.
func BenchmarkAppendLine(b *testing.B) {
	var load Load
	load.Set(500)
	board, err := NewBoard(DefaultCell, &load, 1)
	if err != nil {
		b.Fatal(err)
	}
	buf := make([]byte, 0, 64)
	for i := 0; b.Loop(); i++ {
		buf = board.AppendLine(buf[:0], int64(i), 1000)
	}
	b.SetBytes(int64(len(buf)))
}
