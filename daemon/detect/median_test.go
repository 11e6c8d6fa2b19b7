package detect

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// TestMedian3 checks the three-point median against sorting the three
// readings, on random and tied values.
func TestMedian3(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	var m median3
	var raw []float64
	for i := range 2000 {
		f := float64(r.IntN(5)) // many ties
		raw = append(raw, f)
		var out sample
		ok := m.push(&sample{t: float64(i), f: f, ext: f * 10}, &out)
		if i < 2 {
			if ok {
				t.Fatalf("output before three readings")
			}
			continue
		}
		three := []float64{raw[i-2], raw[i-1], raw[i]}
		slices.Sort(three)
		if !ok || out.f != three[1] || out.t != float64(i-1) || out.rawF != raw[i-1] || out.ext != out.f*10 {
			t.Fatalf("at %d: got %+v, want median %v of %v at t=%d", i, out, three[1], raw[i-2:i+1], i-1)
		}
	}
}
