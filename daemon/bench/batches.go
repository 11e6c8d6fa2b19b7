package bench

import (
	"context"
	"fmt"

	"framed/drivers/sim"
	"framed/reduce"
)

// simCurve runs the sim in this process, unpaced, and returns the first n
// samples as a curve on the recording's own time axis (seconds from the
// first sample), columns force, extension, crosshead.
func simCurve(ctx context.Context, s simSettings, n int) (reduce.Curve, error) {
	d := sim.New()
	if _, err := d.Configure(ctx, s.config()); err != nil {
		return reduce.Curve{}, err
	}
	ctx, cancel := context.WithCancel(ctx)
	defer func() {
		cancel()
	}()
	ch, err := d.Stream(ctx)
	if err != nil {
		return reduce.Curve{}, err
	}
	c := reduce.Curve{TimeS: make([]float64, 0, n), ForceN: make([]float64, 0, n), ExtensionMM: make([]float64, 0, n), CrossheadMM: make([]float64, 0, n)}
	var t0 int64
	for c.Len() < n {
		b, ok := <-ch
		if !ok {
			break
		}
		if b.Err != nil {
			return c, fmt.Errorf("sim stream: %w", b.Err)
		}
		if len(b.Values) < 3 {
			return c, fmt.Errorf("%w: sim batch of %d channels, want force, extension, crosshead", ErrBadOptions, len(b.Values))
		}
		if c.Len() == 0 && len(b.TimeNS) > 0 {
			t0 = b.TimeNS[0]
		}
		k := min(len(b.TimeNS), n-c.Len())
		for i := range k {
			c.TimeS = append(c.TimeS, float64(b.TimeNS[i]-t0)/1e9)
		}
		c.ForceN = append(c.ForceN, b.Values[0][:k]...)
		c.ExtensionMM = append(c.ExtensionMM, b.Values[1][:k]...)
		c.CrossheadMM = append(c.CrossheadMM, b.Values[2][:k]...)
	}
	cancel()
	for range ch {
	}
	return c, nil
}

// batchSamples is the size of the batches the baselines append: the sim's
// own batch size when unpaced, so both sides see the same batches.
const batchSamples = 1024

// cycler hands out batches of a cached curve again and again, each time
// shifted on in time so the stream stays steady.
type cycler struct {
	src     reduce.Curve
	i       int
	offsetS float64
	spanS   float64
	tmp     reduce.Curve
}

func newCycler(c reduce.Curve) *cycler {
	span := 0.0
	if n := c.Len(); n > 1 {
		span = c.TimeS[n-1] + (c.TimeS[n-1]-c.TimeS[0])/float64(n-1)
	}
	return &cycler{src: c, spanS: span}
}

// next returns the next batch of at most max samples; it is reused by the
// following call.
func (y *cycler) next(max int) reduce.Curve {
	if y.i >= y.src.Len() {
		y.i = 0
		y.offsetS += y.spanS
	}
	j := min(y.i+max, y.src.Len())
	y.tmp.TimeS = y.tmp.TimeS[:0]
	for _, t := range y.src.TimeS[y.i:j] {
		y.tmp.TimeS = append(y.tmp.TimeS, t+y.offsetS)
	}
	y.tmp.ForceN = y.src.ForceN[y.i:j]
	y.tmp.ExtensionMM = y.src.ExtensionMM[y.i:j]
	y.tmp.CrossheadMM = y.src.CrossheadMM[y.i:j]
	y.i = j
	return y.tmp
}
