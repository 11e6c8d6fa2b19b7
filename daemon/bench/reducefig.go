package bench

import (
	"context"
	"fmt"
	"path/filepath"
	"runtime"
	"slices"
	"time"

	"framed/daemon/detect"
	"framed/daemon/store"
	"framed/drivers/sim"
	"framed/reduce"
)

// st03TravelMMSPerMin is the 1018-like bar's loading time times its
// crosshead rate (mm/min x s): at 60 mm/min the sim breaks it 10.17 s
// after the loading starts. It sets the rate that fills n samples.
const st03TravelMMSPerMin = 610

// reduceCrosshead is the crosshead rate at which the bar, sampled at
// rateHz after the sim's 1 s preroll, breaks at 97 % of n samples.
func reduceCrosshead(n int, rateHz float64) float64 {
	loadS := (0.97*float64(n) - rateHz) / rateHz
	return st03TravelMMSPerMin / max(loadS, 1)
}

// reduceTiming is the reduce figure and its limit, in seconds.
type reduceTiming struct {
	samples  int
	readS    float64 // one sequential read: store.ReadSamples
	reduceS  float64 // read plus reduce.Reduce, as the daemon's reducer does
	computeS float64 // reduce.Reduce alone
	broke    bool    // the stored test holds its break
	// allocMB is what one read plus reduce allocates: the memory the
	// daemon needs, at the end of a test this long, on top of its own.
	allocMB float64
}

// measureReduce stores one long test of n samples and times, best of
// three, one sequential read of it and the reduction the daemon performs
// when a test ends (read the committed samples, reduce them). Detection
// ran online during acquisition, so its events are computed beforehand and
// not timed. Both timings read a file the page cache already holds.
func measureReduce(ctx context.Context, dir string, n int) (reduceTiming, error) {
	rt := reduceTiming{samples: n}
	sp, err := specimen("ST03", min(1000, reduceCrosshead(n, 10000)))
	if err != nil {
		return rt, err
	}
	s := simSettings{rateHz: 10000, speed: 1, pace: sim.PaceNone, specs: []sim.Specimen{sp}}
	c, err := simCurve(ctx, s, n)
	if err != nil {
		return rt, err
	}
	if c.Len() != n {
		return rt, fmt.Errorf("%w: the sim gave %d of %d samples", ErrBadOptions, c.Len(), n)
	}
	det := detect.Offline(c, detect.Config{})
	for _, e := range det.Events {
		rt.broke = rt.broke || e.Kind == reduce.EventBreak
	}
	db, err := store.Open(filepath.Join(dir, "reduce.db"), store.Options{})
	if err != nil {
		return rt, err
	}
	defer db.Close()
	const id = "reduce"
	if err := db.CreateTest(store.TestMeta{ID: id, StartedAt: time.Now().UTC(), State: store.StateEnded}); err != nil {
		return rt, err
	}
	for from := 0; from < n; from += 200_000 {
		to := min(from+200_000, n)
		part := reduce.Curve{TimeS: c.TimeS[from:to], ForceN: c.ForceN[from:to], ExtensionMM: c.ExtensionMM[from:to], CrossheadMM: c.CrossheadMM[from:to]}
		if err := db.WriteSamples(id, part); err != nil {
			return rt, err
		}
	}
	c = reduce.Curve{}
	geo := sp.Geometry()
	if _, err := db.ReadSamples(id); err != nil { // warm the page cache
		return rt, err
	}
	var reads, reduces, computes []float64
	for range 3 {
		if err := ctx.Err(); err != nil {
			return rt, err
		}
		runtime.GC()
		t0 := time.Now()
		got, err := db.ReadSamples(id)
		if err != nil {
			return rt, err
		}
		reads = append(reads, time.Since(t0).Seconds())
		if got.Len() != n {
			return rt, fmt.Errorf("%w: read %d of %d stored samples", ErrDaemon, got.Len(), n)
		}
		got = reduce.Curve{}
		runtime.GC()
		var ms0, ms1 runtime.MemStats
		runtime.ReadMemStats(&ms0)
		t0 = time.Now()
		got, err = db.ReadSamples(id)
		if err != nil {
			return rt, err
		}
		t1 := time.Now()
		if _, err := reduce.Reduce(got, geo, det, reduce.Options{}); err != nil {
			return rt, fmt.Errorf("reduce the stored test: %w", err)
		}
		reduces = append(reduces, time.Since(t0).Seconds())
		computes = append(computes, time.Since(t1).Seconds())
		runtime.ReadMemStats(&ms1)
		rt.allocMB = float64(ms1.TotalAlloc-ms0.TotalAlloc) / (1 << 20)
	}
	rt.readS, rt.reduceS, rt.computeS = slices.Min(reads), slices.Min(reduces), slices.Min(computes)
	return rt, nil
}
