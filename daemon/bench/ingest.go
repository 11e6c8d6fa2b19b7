package bench

import (
	"context"
	"fmt"
	"time"

	"framed/drivers/sim"
)

// ingestSettings is the sim of the ingest figures: 10 kHz channels,
// unpaced (as fast as the daemon takes them), one long test.
func ingestSettings() (simSettings, error) {
	return longSettings(10000, sim.PaceNone, 0)
}

// wholePath is the ingest figure: samples per second committed to the
// store by a daemon fed as fast as it takes samples, over a window of
// steady state (the first test under way). The count is read from the
// store's committed totals, so every sample counted went through the
// driver process, the gRPC stream, calibration, detection and a bbolt
// commit at the configured interval.
type wholePath struct {
	samplesPerS float64 // best third of the window
	overallPerS float64 // the whole window
	daemonCPU   float64 // share of one core
	driverCPU   float64
}

func measureWholePath(ctx context.Context, self, dir string, window time.Duration) (wholePath, error) {
	var out wholePath
	s, err := ingestSettings()
	if err != nil {
		return out, err
	}
	addr, err := freeAddr()
	if err != nil {
		return out, err
	}
	c, err := startChild(ctx, self, dir, daemonConfig(s, "embedded:"+addr), window+3*time.Minute)
	if err != nil {
		return out, err
	}
	defer c.kill()
	if _, err := c.waitCommitted(ctx, 1, 30*time.Second); err != nil {
		return out, err
	}
	if !sleepCtx(ctx, 300*time.Millisecond) {
		return out, ctx.Err()
	}
	// Counts change once per commit: each rate spans whole commits, from
	// the first change in a stretch of the window to its last.
	var pts []point
	n0, err := c.committed(ctx)
	if err != nil {
		return out, err
	}
	cpu0 := cpuOf(c.pid())
	start := time.Now()
	prev := n0
	for time.Since(start) < window {
		if !sleepCtx(ctx, 5*time.Millisecond) {
			return out, ctx.Err()
		}
		n, err := c.committed(ctx)
		if err != nil {
			return out, err
		}
		if n != prev {
			pts = append(pts, point{time.Now(), n})
			prev = n
		}
	}
	cpu1 := cpuOf(c.pid())
	wall := time.Since(start).Seconds()
	out.overallPerS = rateOver(pts, start, start.Add(window))
	if !(out.overallPerS > 0) {
		return out, fmt.Errorf("%w: committed count did not advance in %v", ErrDaemon, window)
	}
	// Best third of the window: other work on the machine (two processes
	// must share its cores here) is discounted as in a best-of-three.
	for k := range 3 {
		from := start.Add(time.Duration(k) * window / 3)
		out.samplesPerS = max(out.samplesPerS, rateOver(pts, from, from.Add(window/3)))
	}
	out.daemonCPU = float64(cpu1.daemon-cpu0.daemon) / clockTicksPerS / wall
	out.driverCPU = float64(cpu1.drivers-cpu0.drivers) / clockTicksPerS / wall
	return out, nil
}

// cpuTicks of the daemon process and of its drivers together.
type cpuTicks struct{ daemon, drivers int64 }

func cpuOf(pid int) cpuTicks {
	var t cpuTicks
	t.daemon, _, _ = readStat(pid)
	for _, p := range childPIDs(pid) {
		if v, _, err := readStat(p); err == nil {
			t.drivers += v
		}
	}
	return t
}

// point is a committed count and when it was seen.
type point struct {
	at time.Time
	n  int
}

// rateOver is the committed rate between the first and the last change of
// the count within [from, to); NaN with fewer than two changes.
func rateOver(pts []point, from, to time.Time) float64 {
	var first, last *point
	for i := range pts {
		p := &pts[i]
		if p.at.Before(from) || !p.at.Before(to) {
			continue
		}
		if first == nil {
			first = p
		}
		last = p
	}
	if first == nil || last == first || !last.at.After(first.at) {
		return nan
	}
	return float64(last.n-first.n) / last.at.Sub(first.at).Seconds()
}
