package bench

import (
	"context"
	"os"
	"path/filepath"
	"testing"
	"time"

	"framed/daemon/store"
)

// The benchmarks below are the whole-path figures of `framectl bench` in
// `go test -bench` form, so regressions show in ordinary development. Each
// runs its measurement once per iteration, sized to stay well under 20 s
// at -benchtime 1x (the CI smoke). Package benchmarks of the store, the
// detector and the reduction live in those packages.

// BenchmarkWholePathIngest: samples/s committed by a daemon in a child
// process fed unpaced by the sim driver in its own process.
func BenchmarkWholePathIngest(b *testing.B) {
	var rate, cpu float64
	for b.Loop() {
		wp, err := measureWholePath(context.Background(), os.Args[0], b.TempDir(), 2*time.Second)
		if err != nil {
			b.Fatal(err)
		}
		rate, cpu = wp.samplesPerS, wp.daemonCPU
	}
	b.ReportMetric(rate, "samples/s")
	b.ReportMetric(100*cpu, "daemon-cpu-%")
}

func benchCycler(b *testing.B) *cycler {
	s, err := ingestSettings()
	if err != nil {
		b.Fatal(err)
	}
	c, err := simCurve(context.Background(), s, 200_000)
	if err != nil {
		b.Fatal(err)
	}
	return newCycler(c)
}

// BenchmarkDirectStoreIngest: the same batches appended straight to the
// store, committed every 100 ms (the limit of the ingest figure).
func BenchmarkDirectStoreIngest(b *testing.B) {
	y := benchCycler(b)
	var rate float64
	for b.Loop() {
		dir := b.TempDir()
		r, err := directStore(dir, y, 1_000_000, 100*time.Millisecond)
		if err != nil {
			b.Fatal(err)
		}
		rate = r
		os.Remove(filepath.Join(dir, "direct.db"))
	}
	b.ReportMetric(rate, "samples/s")
}

// BenchmarkPlainFileIngest: the same batches packed into a plain file,
// fsync every 100 ms.
func BenchmarkPlainFileIngest(b *testing.B) {
	y := benchCycler(b)
	var rate float64
	for b.Loop() {
		dir := b.TempDir()
		r, err := plainFile(dir, y, 1_000_000, 100*time.Millisecond)
		if err != nil {
			b.Fatal(err)
		}
		rate = r
		os.Remove(filepath.Join(dir, "plain.bin"))
	}
	b.ReportMetric(rate, "samples/s")
}

// BenchmarkCommitWrites: one commit of 100 ms of a 10 kHz board (1000
// samples) per iteration, with the bytes the process sent to disk for it
// and their ratio to the raw samples (write amplification). Fifty commits
// first fill the test's leaves, so even one iteration shows the steady
// state rather than a fresh file's.
func BenchmarkCommitWrites(b *testing.B) {
	y := benchCycler(b)
	db, err := store.Open(filepath.Join(b.TempDir(), "w.db"), store.Options{ManualCommit: true})
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() {
		if err := db.Check(); err != nil {
			b.Error(err)
		}
		db.Close()
	})
	if err := db.CreateTest(store.TestMeta{ID: "w", StartedAt: time.Now().UTC(), State: store.StateRunning}); err != nil {
		b.Fatal(err)
	}
	a := db.Appender("w")
	commit := func() {
		for k := 0; k < 1000; {
			c := y.next(1000 - k)
			if err := a.Append(c); err != nil {
				b.Fatal(err)
			}
			k += c.Len()
		}
		if err := a.Flush(); err != nil {
			b.Fatal(err)
		}
	}
	for range 50 {
		commit()
	}
	p0, perr := readProc(os.Getpid())
	n := 0
	for b.Loop() {
		commit()
		n++
	}
	if p1, err := readProc(os.Getpid()); err == nil && perr == nil {
		w := float64(p1.writeBytes - p0.writeBytes)
		b.ReportMetric(w/float64(n), "bytes/commit")
		b.ReportMetric(w/float64(n*1000*rawBytesPerSample), "write-ampl")
	}
}

// BenchmarkBreakToSubscriber: break sample to result at a subscriber,
// through the embedded broker, over 8 s of short tests.
func BenchmarkBreakToSubscriber(b *testing.B) {
	var l latencies
	for b.Loop() {
		addr, err := freeAddr()
		if err != nil {
			b.Fatal(err)
		}
		if l, err = measureLatency(context.Background(), os.Args[0], b.TempDir(), "embedded:"+addr, "tcp://"+addr, 8*time.Second); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(l.quantile(0.5), "p50-ms")
	b.ReportMetric(l.quantile(0.99), "p99-ms")
	b.ReportMetric(float64(len(l.ms)), "results")
}

// BenchmarkAcquire10kHz: the daemon's memory, CPU share and disk writes
// while it records a test at 10 kHz in real time, over 5 s.
func BenchmarkAcquire10kHz(b *testing.B) {
	var a acquisition
	for b.Loop() {
		var err error
		if a, err = measureAcquisitionIdle(context.Background(), os.Args[0], b.TempDir(), 10000, 5*time.Second, 1); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(a.rssMaxMB(), "rss-MB")
	b.ReportMetric(100*a.cpu, "cpu-%")
	if a.samples > 0 {
		b.ReportMetric(float64(a.writeBytes)/float64(a.samples*rawBytesPerSample), "write-ampl")
	}
}

// BenchmarkReduceStored1M: reduce a stored test of a million samples
// after reading it back, against the read alone (ratio = reduce/read).
func BenchmarkReduceStored1M(b *testing.B) {
	var rt reduceTiming
	for b.Loop() {
		var err error
		if rt, err = measureReduce(context.Background(), b.TempDir(), 1_000_000); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(rt.readS, "read-s")
	b.ReportMetric(rt.computeS, "reduce-s")
	b.ReportMetric(rt.computeS/rt.readS, "ratio")
}
