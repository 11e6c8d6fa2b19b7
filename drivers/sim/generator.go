package sim

import (
	"fmt"
	"math"

	"framed/drivers"
)

// generator produces batches from the script through the sensor model.
// It knows nothing of wall time: sample k is at start + k/rate, whatever
// the pace, so realtime and unpaced streams carry the same values.
type generator struct {
	cfg       *settings
	sc        *script
	sens      *sensorModel
	emitted   int64
	seq       uint64
	failAt    int64 // sample count at which the fault fires; -1 never
	failed    bool
	periodNS  float64
	failAfter float64
}

func newGenerator(s *settings) *generator {
	g := &generator{
		cfg:      s,
		sc:       newScript(s.specs, s.Loop, s.RateHz, s.Speed, s.pauseS),
		sens:     newSensorModel(s.Sensors, s.noise, s.Seed),
		failAt:   -1,
		periodNS: 1e9 / s.RateHz,
	}
	if s.FailAfterS > 0 {
		g.failAt = int64(math.Round(s.FailAfterS * s.RateHz))
	}
	return g
}

// batch returns the next n samples, or fewer and then the fault batch.
func (g *generator) batch(startNS int64, n int) drivers.Batch {
	b := drivers.Batch{Seq: g.seq}
	g.seq++
	if g.failAt >= 0 {
		left := g.failAt - g.emitted
		if left <= 0 {
			b.Err = fmt.Errorf("sim: injected fault after %v s of stream: %w", g.cfg.FailAfterS, drivers.ErrDeviceGone)
			return b
		}
		n = int(min(int64(n), left))
	}
	b.TimeNS = make([]int64, n)
	cols := make([]float64, 3*n)
	b.Values = [][]float64{cols[:n:n], cols[n : 2*n : 2*n], cols[2*n:]}
	var v [3]float64
	for i := range n {
		g.sens.read(g.sc.next(), &v)
		b.TimeNS[i] = startNS + int64(float64(g.emitted)*g.periodNS)
		b.Values[0][i], b.Values[1][i], b.Values[2][i] = v[0], v[1], v[2]
		g.emitted++
	}
	return b
}
