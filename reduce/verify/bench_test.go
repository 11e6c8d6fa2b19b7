package verify

import (
	"bytes"
	"fmt"
	"testing"
)

// A large verification: 20 forces, three series and the decreasing run.
func benchReadings() []byte {
	var b bytes.Buffer
	b.WriteString("series,reference_N,indicated_N\n")
	for _, s := range []string{"1", "2", "3", "r"} {
		for i := 1; i <= 20; i++ {
			F := 500 * float64(i)
			fmt.Fprintf(&b, "%s,%g,%g\n", s, F, F*1.002)
		}
	}
	return b.Bytes()
}

func BenchmarkReadAndClassifyForce(b *testing.B) {
	in := benchReadings()
	b.SetBytes(int64(len(in)))
	for b.Loop() {
		rd, err := ReadReadings(bytes.NewReader(in))
		if err != nil {
			b.Fatal(err)
		}
		if _, err := ClassifyForce(rd, 0.1, 0.5); err != nil {
			b.Fatal(err)
		}
	}
}
