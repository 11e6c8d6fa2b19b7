package bench

import (
	"context"
	"time"

	"framed/drivers/sim"
)

// acquisition is what a daemon costs while it records one long test at a
// real-time sample rate.
type acquisition struct {
	rateHz float64
	// rssIdleMB is resident memory streaming but before any test.
	rssIdleMB float64
	// rss is resident memory sampled through the window, MB; rssAnon its
	// private part (see procSample).
	rss, rssAnon []float64
	// cpu is the daemon's share of one core; driverCPU its driver's.
	cpu, driverCPU float64
	// writeBytes the daemon wrote to disk while samples were committed.
	writeBytes int64
	samples    int
	window     time.Duration
}

func (a acquisition) rssMaxMB() float64 { return maxOf(a.rss) }

// rssGrowthMB is the mean of the last fifth of the RSS samples minus the
// mean of the first fifth: how much memory the test's length added.
func (a acquisition) rssGrowthMB() float64 { return growth(a.rss) }

func (a acquisition) rssHeadMB() float64 { return head(a.rss) }
func (a acquisition) rssTailMB() float64 { return tail(a.rss) }

func maxOf(v []float64) float64 {
	m := 0.0
	for _, x := range v {
		m = max(m, x)
	}
	return m
}

func growth(v []float64) float64 {
	if len(v) < 2 {
		return 0
	}
	return tail(v) - head(v)
}

func fifth(v []float64) int { return max(1, len(v)/5) }

func head(v []float64) float64 {
	if len(v) == 0 {
		return nan
	}
	return mean(v[:fifth(v)])
}

func tail(v []float64) float64 {
	if len(v) == 0 {
		return nan
	}
	return mean(v[len(v)-fifth(v):])
}

func mean(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x
	}
	return s / float64(len(v))
}

// idleBeforeS is the sim's pause before the first test: resident memory
// is read half way through it as the idle figure.
const idleBeforeS = 4

func measureAcquisitionIdle(ctx context.Context, self, dir string, rateHz float64, window time.Duration, idleS float64) (acquisition, error) {
	a := acquisition{rateHz: rateHz, window: window}
	s, err := longSettings(rateHz, sim.PaceRealtime, idleS)
	if err != nil {
		return a, err
	}
	addr, err := freeAddr()
	if err != nil {
		return a, err
	}
	c, err := startChild(ctx, self, dir, daemonConfig(s, "embedded:"+addr), window+3*time.Minute)
	if err != nil {
		return a, err
	}
	defer c.kill()
	// Idle: streaming, no specimen loaded yet.
	if !sleepCtx(ctx, time.Duration(idleS*float64(time.Second)/2)) {
		return a, ctx.Err()
	}
	if p, err := readProc(c.pid()); err == nil {
		a.rssIdleMB = float64(p.rssKB) / 1024
	}
	if _, err := c.waitCommitted(ctx, 1, 60*time.Second); err != nil {
		return a, err
	}
	// Settle past the test's first commits and the start's bookkeeping.
	if !sleepCtx(ctx, 2*time.Second) {
		return a, ctx.Err()
	}
	n0, err := c.committed(ctx)
	if err != nil {
		return a, err
	}
	p0, err := readProc(c.pid())
	if err != nil {
		return a, err
	}
	cpu0 := cpuOf(c.pid())
	start := time.Now()
	every := max(time.Second, window/120)
	for time.Since(start) < window {
		if !sleepCtx(ctx, min(every, window-time.Since(start))) {
			return a, ctx.Err()
		}
		if err := c.alive(); err != nil {
			return a, err
		}
		p, err := readProc(c.pid())
		if err != nil {
			return a, err
		}
		a.rss = append(a.rss, float64(p.rssKB)/1024)
		a.rssAnon = append(a.rssAnon, float64(p.rssAnonKB)/1024)
	}
	wall := time.Since(start).Seconds()
	cpu1 := cpuOf(c.pid())
	p1, err := readProc(c.pid())
	if err != nil {
		return a, err
	}
	n1, err := c.committed(ctx)
	if err != nil {
		return a, err
	}
	a.cpu = float64(cpu1.daemon-cpu0.daemon) / clockTicksPerS / wall
	a.driverCPU = float64(cpu1.drivers-cpu0.drivers) / clockTicksPerS / wall
	a.writeBytes = p1.writeBytes - p0.writeBytes
	a.samples = n1 - n0
	return a, nil
}
