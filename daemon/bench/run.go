package bench

import (
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"time"
)

var nan = math.NaN()

// Targets of the project (issue "How fast, how small"); ratios against
// measured baselines are what count, since absolute figures drift from
// machine to machine.
const (
	targetIngestRatio     = 0.5 // whole path / direct bbolt appends, at least
	targetIngestPerS      = 1e6 // samples/s, at least
	targetReduceRatio     = 2.0 // reduce / one sequential read, at most
	targetLatencyP99MS    = 100
	targetRSSMB           = 40
	targetRSSGrowthMB     = 2 // over the window: flat
	targetCPU1kHzPct      = 5
	targetWriteAmpl       = 3
	cachedBaselineSamples = 1_000_000
)

// Run measures every figure in one run and returns the report. A phase
// that fails leaves its figures unmeasured (null) with the reason in their
// note, and the others go on; the returned error then joins the failures.
// It stops early, with ctx's error, when ctx ends.
func Run(ctx context.Context, o Options) (Report, error) {
	rep := Report{Mode: o.Mode}
	if rep.Mode == "" {
		rep.Mode = ModeDefault
	}
	p, err := o.plan()
	if err != nil {
		return rep, err
	}
	self, err := o.self()
	if err != nil {
		return rep, fmt.Errorf("%w: own binary: %w", ErrBadOptions, err)
	}
	base := o.Dir
	if base == "" {
		base = os.TempDir()
	}
	dir, err := os.MkdirTemp(base, "framed-bench-")
	if err != nil {
		return rep, err
	}
	defer os.RemoveAll(dir)
	if inMemoryFS(dir) {
		rep.Notes = append(rep.Notes, dir+" is on tmpfs: storage figures measure memory, and write amplification cannot be read; give --dir on the disk the state lives on")
	}
	var failed []error
	phaseDir := func(name string) string {
		d := filepath.Join(dir, name)
		os.MkdirAll(d, 0o700)
		return d
	}
	fail := func(phase string, err error) string {
		failed = append(failed, fmt.Errorf("%s: %w", phase, err))
		return "not measured: " + err.Error()
	}

	// Ingest: the whole path, then the same batches straight to bbolt and
	// to a plain file.
	o.progress("ingest: whole path (%v window)", p.ingestWindow)
	wp, werr := measureWholePath(ctx, self, phaseDir("ingest"), p.ingestWindow)
	if err := ctx.Err(); err != nil {
		return rep, err
	}
	o.progress("ingest: direct bbolt and plain file (%d samples each)", p.directSamples)
	direct, file := nan, nan
	var commits []time.Duration
	var berr error
	if s, err := ingestSettings(); err != nil {
		berr = err
	} else if cached, err := simCurve(ctx, s, min(cachedBaselineSamples, p.directSamples)); err != nil {
		berr = err
	} else {
		if direct, berr = bestOf3(func(i int) (float64, error) {
			return directStore(phaseDir(fmt.Sprintf("direct%d", i)), newCycler(cached), p.directSamples/3, p.commitInterval)
		}); berr == nil {
			if file, berr = bestOf3(func(i int) (float64, error) {
				return plainFile(phaseDir(fmt.Sprintf("file%d", i)), newCycler(cached), p.directSamples/3, p.commitInterval)
			}); berr == nil {
				// 100 ms of a 10 kHz board per commit, as the daemon commits.
				commits, berr = commitTimes(phaseDir("commits"), newCycler(cached), int(10000*p.commitInterval.Seconds()), 30)
			}
		}
	}
	ingest := Figure{Name: "ingest", Unit: "samples/s", Value: nan, Limit: direct, LimitKind: LimitMeasured, LimitName: "direct bbolt appends",
		Target: fmt.Sprintf("ratio >= %g and value >= %g", targetIngestRatio, targetIngestPerS)}
	switch {
	case werr != nil:
		ingest.Note = fail("ingest", werr)
	default:
		ingest.Value = wp.samplesPerS
		ingest.Pass = passIf(wp.samplesPerS/direct >= targetIngestRatio && wp.samplesPerS >= targetIngestPerS)
		ingest.Note = fmt.Sprintf("best third of %v (whole window %.3g samples/s), sim driver unpaced at 10 kHz channels; the daemon used %.0f %% and the sim driver %.0f %% of one core (%d cores); baselines best of 3", p.ingestWindow, wp.overallPerS, 100*wp.daemonCPU, 100*wp.driverCPU, numCPU())
	}
	if berr != nil {
		ingest.Note += "; baselines " + fail("ingest baselines", berr)
		ingest.Pass = nil
	}
	rep.Add(ingest)
	rep.Add(Figure{Name: "ingest_direct", Unit: "samples/s", Value: direct, Limit: file, LimitKind: LimitMeasured, LimitName: "plain file appends",
		Note: fmt.Sprintf("store.Appender, commit every %v, same batches of %d samples", p.commitInterval, batchSamples)})
	rep.Add(Figure{Name: "ingest_file", Unit: "samples/s", Value: file, Limit: nan, LimitKind: LimitInfo, LimitName: "-",
		Note: fmt.Sprintf("%d-byte rows, fsync every %v", rawBytesPerSample, p.commitInterval)})

	// Data at risk: a sample waits at most one commit interval, then its
	// commit's duration.
	risk := Figure{Name: "data_at_risk_ms", Unit: "ms", Value: nan, Limit: ms(p.commitInterval), LimitKind: LimitInfo, LimitName: "commit interval"}
	if len(commits) > 0 {
		worst := commits[len(commits)-1]
		risk.Value = ms(p.commitInterval + worst)
		risk.Note = fmt.Sprintf("interval + slowest of %d commits of 1000 samples (median commit %.1f ms)", len(commits), ms(commits[len(commits)/2]))
	}
	rep.Add(risk)

	// Reduction.
	o.progress("reduce: %d samples", p.reduceSamples)
	rt, err := measureReduce(ctx, phaseDir("reduce"), p.reduceSamples)
	if err := ctx.Err(); err != nil {
		return rep, err
	}
	red := Figure{Name: "reduce", Unit: "s", Value: nan, Limit: nan, LimitKind: LimitMeasured, LimitName: "one sequential read", Target: fmt.Sprintf("ratio <= %g", targetReduceRatio)}
	total := Figure{Name: "reduce_with_read", Unit: "s", Value: nan, Limit: nan, LimitKind: LimitInfo, LimitName: "one sequential read"}
	if err != nil {
		red.Note = fail("reduce", err)
	} else {
		red.Value, red.Limit = rt.computeS, rt.readS
		red.Pass = passIf(rt.computeS/rt.readS <= targetReduceRatio)
		red.Note = fmt.Sprintf("reduce.Reduce of one stored test of %d samples (best of 3), against store.ReadSamples of it", rt.samples)
		if !rt.broke {
			red.Note += "; the stored test holds no detected break"
		}
		total.Value, total.Limit = rt.reduceS, rt.readS
		total.Note = "what the daemon spends when a test ends: read the committed samples, then reduce them"
	}
	rep.Add(red)
	rep.Add(total)
	memory := Figure{Name: "reduce_memory", Unit: "MB", Value: nan, Limit: nan, LimitKind: LimitInfo, LimitName: "the samples as float64"}
	if err == nil {
		memory.Value, memory.Limit = rt.allocMB, float64(rt.samples*rawBytesPerSample)/(1<<20)
		memory.Note = "allocated by one read plus reduce: the daemon needs this on top of its own at the end of a test this long (it grows with the test's length there, not while acquiring)"
	}
	rep.Add(memory)

	// Latency through the embedded broker, then Mosquitto.
	o.progress("latency: embedded broker (%v)", p.latencyWindow)
	if addr, err := freeAddr(); err != nil {
		addLatency(&rep, "", latencies{}, fail("latency", err))
	} else {
		l, err := measureLatency(ctx, self, phaseDir("latency"), "embedded:"+addr, "tcp://"+addr, p.latencyWindow)
		note := ""
		if err != nil {
			note = fail("latency", err)
		}
		addLatency(&rep, "", l, note)
	}
	if err := ctx.Err(); err != nil {
		return rep, err
	}
	if bin, err := mosquittoBinary(o.Mosquitto); err != nil {
		addLatency(&rep, "_mosquitto", latencies{}, fail("latency mosquitto", err))
	} else if bin == "" {
		rep.Notes = append(rep.Notes, "mosquitto not found (or --mosquitto off): latency through it not measured")
	} else {
		o.progress("latency: mosquitto (%v)", p.latencyWindow)
		url, stop, err := startMosquitto(ctx, bin, phaseDir("mosquitto"))
		if err != nil {
			addLatency(&rep, "_mosquitto", latencies{}, fail("latency mosquitto", err))
		} else {
			l, err := measureLatency(ctx, self, phaseDir("latency-mosquitto"), url, url, p.latencyWindow)
			stop()
			note := ""
			if err != nil {
				note = fail("latency mosquitto", err)
			}
			addLatency(&rep, "_mosquitto", l, note)
		}
	}
	if err := ctx.Err(); err != nil {
		return rep, err
	}

	// CPU at 1 kHz.
	o.progress("acquire 1 kHz (%v)", p.cpu1kWindow)
	a1, err1 := measureAcquisitionIdle(ctx, self, phaseDir("acquire-1k"), 1000, p.cpu1kWindow, p.idleS)
	if err := ctx.Err(); err != nil {
		return rep, err
	}
	o.progress("acquire 10 kHz (%v)", p.acq10kWindow)
	a10, err10 := measureAcquisitionIdle(ctx, self, phaseDir("acquire-10k"), 10000, p.acq10kWindow, p.idleS)
	if err := ctx.Err(); err != nil {
		return rep, err
	}
	n1, n10 := "", ""
	if err1 != nil {
		n1 = fail("acquire 1 kHz", err1)
	}
	if err10 != nil {
		n10 = fail("acquire 10 kHz", err10)
	}
	addAcquisition(&rep, a1, n1, a10, n10, p.commitInterval)

	if len(failed) > 0 {
		return rep, errors.Join(failed...)
	}
	return rep, nil
}

// bestOf3 runs a throughput measurement three times and keeps the
// highest, discounting other work on the machine.
func bestOf3(run func(i int) (float64, error)) (float64, error) {
	best := 0.0
	for i := range 3 {
		r, err := run(i)
		if err != nil {
			return nan, err
		}
		best = max(best, r)
	}
	return best, nil
}

func ms(d time.Duration) float64 { return float64(d) / float64(time.Millisecond) }

func addLatency(rep *Report, suffix string, l latencies, note string) {
	where := "embedded broker"
	if suffix != "" {
		where = "mosquitto"
	}
	if note == "" {
		note = fmt.Sprintf("%d results through the %s", len(l.ms), where)
		if l.missing > 0 {
			note += fmt.Sprintf(", %d without a break event left out", l.missing)
		}
	}
	p50 := Figure{Name: "latency_p50" + suffix, Unit: "ms", Value: l.quantile(0.5), Limit: targetLatencyP99MS, LimitKind: LimitTarget, LimitName: "target (p99)", Note: note}
	p99 := Figure{Name: "latency_p99" + suffix, Unit: "ms", Value: l.quantile(0.99), Limit: targetLatencyP99MS, LimitKind: LimitTarget, LimitName: "target", Target: "value < limit", Note: note}
	if !math.IsNaN(p99.Value) {
		p99.Pass = passIf(p99.Value < targetLatencyP99MS)
	}
	rep.Add(p50)
	rep.Add(p99)
	if suffix == "" {
		rep.Add(Figure{Name: "latency_event_p99", Unit: "ms", Value: quantile(l.eventMS, 0.99), Limit: targetLatencyP99MS, LimitKind: LimitInfo, LimitName: "result target",
			Note: fmt.Sprintf("break sample to the break event at the subscriber (detection and transport, no reduction; median %.1f ms, %d events)", quantile(l.eventMS, 0.5), len(l.eventMS))})
	}
}

func addAcquisition(rep *Report, a1 acquisition, n1 string, a10 acquisition, n10 string, interval time.Duration) {
	measured := func(note string) bool { return note == "" }
	val := func(ok bool, v float64) float64 {
		if !ok {
			return nan
		}
		return v
	}
	ok1, ok10 := measured(n1), measured(n10)
	pass := func(ok bool, cond bool) *bool {
		if !ok {
			return nil
		}
		return passIf(cond)
	}
	note := func(n, def string) string {
		if n != "" {
			return n
		}
		return def
	}
	rep.Add(Figure{Name: "rss_idle", Unit: "MB", Value: val(ok10, a10.rssIdleMB), Limit: targetRSSMB, LimitKind: LimitTarget, LimitName: "target (acquiring)",
		Note: note(n10, "daemon process, sim streaming 10 kHz, no test yet")})
	rep.Add(Figure{Name: "rss_acquiring", Unit: "MB", Value: val(ok10, a10.rssMaxMB()), Limit: targetRSSMB, LimitKind: LimitTarget, LimitName: "target",
		Target: "value < limit", Pass: pass(ok10, a10.rssMaxMB() < targetRSSMB),
		Note: note(n10, fmt.Sprintf("largest of %d readings over %v of one test at 10 kHz (daemon process; the driver is a process of its own)", len(a10.rss), a10.window))})
	rep.Add(Figure{Name: "rss_growth", Unit: "MB", Value: val(ok10, a10.rssGrowthMB()), Limit: targetRSSGrowthMB, LimitKind: LimitTarget, LimitName: "target",
		Target: "value <= limit", Pass: pass(ok10, a10.rssGrowthMB() <= targetRSSGrowthMB),
		Note: note(n10, fmt.Sprintf("mean of the last fifth (%.1f MB) minus the first fifth (%.1f MB) of %d readings over %v", a10.rssTailMB(), a10.rssHeadMB(), len(a10.rss), a10.window))})
	rep.Add(Figure{Name: "rss_private_acquiring", Unit: "MB", Value: val(ok10, maxOf(a10.rssAnon)), Limit: targetRSSMB, LimitKind: LimitTarget, LimitName: "target",
		Target: "value < limit", Pass: pass(ok10, maxOf(a10.rssAnon) < targetRSSMB),
		Note: note(n10, "the private part of rss_acquiring (RssAnon: heap, stacks); the rest is file-backed, the binary's code and the pages of the store's memory map the daemon has read, which the kernel drops under memory pressure")})
	rep.Add(Figure{Name: "rss_private_growth", Unit: "MB", Value: val(ok10, growth(a10.rssAnon)), Limit: targetRSSGrowthMB, LimitKind: LimitTarget, LimitName: "target",
		Target: "value <= limit", Pass: pass(ok10, growth(a10.rssAnon) <= targetRSSGrowthMB),
		Note: note(n10, fmt.Sprintf("as rss_growth for the private part: last fifth %.1f MB, first fifth %.1f MB", tail(a10.rssAnon), head(a10.rssAnon)))})
	rep.Add(Figure{Name: "cpu_1khz", Unit: "% of one core", Value: val(ok1, 100*a1.cpu), Limit: targetCPU1kHzPct, LimitKind: LimitTarget, LimitName: "target",
		Target: "value < limit", Pass: pass(ok1, 100*a1.cpu < targetCPU1kHzPct),
		Note: note(n1, fmt.Sprintf("daemon process over %v of a test; the sim driver used %.1f %% more", a1.window, 100*a1.driverCPU))})
	rep.Add(Figure{Name: "cpu_10khz", Unit: "% of one core", Value: val(ok10, 100*a10.cpu), Limit: targetCPU1kHzPct, LimitKind: LimitInfo, LimitName: "1 kHz target",
		Note: note(n10, fmt.Sprintf("daemon process over %v of a test; the sim driver used %.1f %% more", a10.window, 100*a10.driverCPU))})
	// No bytes written while samples were committed means the file system
	// does not account writes to the process (tmpfs): not measured.
	wa := func(a acquisition) float64 {
		if a.samples <= 0 || a.writeBytes <= 0 {
			return nan
		}
		return float64(a.writeBytes) / float64(a.samples*rawBytesPerSample)
	}
	rep.Add(Figure{Name: "write_amplification", Unit: "bytes/raw byte", Value: val(ok10, wa(a10)), Limit: targetWriteAmpl, LimitKind: LimitTarget, LimitName: "target",
		Target: "value <= limit", Pass: pass(ok10 && !math.IsNaN(wa(a10)), wa(a10) <= targetWriteAmpl),
		Note: note(n10, fmt.Sprintf("10 kHz, commit every %v: %d bytes written for %d samples of %d raw bytes", interval, a10.writeBytes, a10.samples, rawBytesPerSample))})
	rep.Add(Figure{Name: "write_amplification_1khz", Unit: "bytes/raw byte", Value: val(ok1, wa(a1)), Limit: targetWriteAmpl, LimitKind: LimitTarget, LimitName: "target",
		Target: "value <= limit", Pass: pass(ok1 && !math.IsNaN(wa(a1)), wa(a1) <= targetWriteAmpl),
		Note: note(n1, fmt.Sprintf("1 kHz, commit every %v: %d bytes written for %d samples", interval, a1.writeBytes, a1.samples))})
}
