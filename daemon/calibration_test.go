package daemon

import (
	"math"
	"math/rand/v2"
	"testing"

	"framed/daemon/calib"
)

// A tare over a window in which the load changed is refused; over a quiet
// window of white noise it is taken. (For white noise the sd of successive
// differences is sqrt 2 times the noise sd: a textbook identity.)
func TestTareRefusesAChangingLoad(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	quiet := make([]float64, 500)
	for i := range quiet {
		quiet[i] = 1000 + 200*rng.NormFloat64()
	}
	if _, err := calib.Quiet(quiet, quietLimit(quiet)); err != nil {
		t.Errorf("quiet window refused: %v", err)
	}
	if lim := quietLimit(quiet); math.Abs(lim/6-200) > 20 {
		t.Errorf("noise estimate %.1f, want about 200", lim/6)
	}
	step := append([]float64(nil), quiet...)
	for i := 250; i < len(step); i++ {
		step[i] += 400000 // a weight hung half-way through
	}
	if _, err := calib.Quiet(step, quietLimit(step)); err == nil {
		t.Errorf("a window with a load change was accepted")
	}
}
