package store

import (
	"testing"
)

func BenchmarkEncodeBatch(b *testing.B) {
	c := genCurve(1_000_000, 4096)
	var buf []byte
	b.SetBytes(4096 * 32)
	b.ReportAllocs()
	for b.Loop() {
		buf = encodeChunk(buf[:0], &c, 0, 4096)
	}
	b.ReportMetric(float64(len(buf))/4096, "bytes/sample")
}

func BenchmarkDecodeBatch(b *testing.B) {
	c := genCurve(1_000_000, 4096)
	enc := encodeChunk(nil, &c, 0, 4096)
	var dst [numColumns][]float64
	for k := range dst {
		dst[k] = make([]float64, 4096)
	}
	b.SetBytes(4096 * 32)
	b.ReportAllocs()
	for b.Loop() {
		if _, _, err := decodeChunk(enc, dst, 0); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAppend measures sustained appending through an Appender with
// its background committer at the default interval, in 100-sample
// batches (10 ms of a 10 kHz driver), including the final flush.
func BenchmarkAppend(b *testing.B) {
	db, _ := openTestDB(b, Options{})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		b.Fatal(err)
	}
	a := db.Appender("T")
	batch := genCurve(0, 100)
	b.ReportAllocs()
	n := 0
	for b.Loop() {
		if err := a.Append(batch); err != nil {
			b.Fatal(err)
		}
		n += batch.Len()
	}
	if err := a.Flush(); err != nil {
		b.Fatal(err)
	}
	b.ReportMetric(float64(n)/b.Elapsed().Seconds(), "samples/s")
	b.ReportMetric(0, "ns/op")
}

// BenchmarkWriteSamplesDirect is the plain path: one bbolt transaction
// per 100 000-sample write, no buffering (the limit ingest is compared
// with).
func BenchmarkWriteSamplesDirect(b *testing.B) {
	db, _ := openTestDB(b, Options{})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		b.Fatal(err)
	}
	batch := genCurve(0, 100_000)
	n := 0
	for b.Loop() {
		if err := db.WriteSamples("T", batch); err != nil {
			b.Fatal(err)
		}
		n += batch.Len()
	}
	b.ReportMetric(float64(n)/b.Elapsed().Seconds(), "samples/s")
}

// BenchmarkReadSamples6M is one sequential read of a 6 M sample test: the
// floor the reduction of such a test is compared with.
func BenchmarkReadSamples6M(b *testing.B) {
	const total = 6_000_000
	db, _ := openTestDB(b, Options{})
	if err := db.CreateTest(TestMeta{ID: "T", StartedAt: t0}); err != nil {
		b.Fatal(err)
	}
	for from := 0; from < total; from += 500_000 {
		if err := db.WriteSamples("T", genCurve(from, 500_000)); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportAllocs()
	for b.Loop() {
		c, err := db.ReadSamples("T")
		if err != nil {
			b.Fatal(err)
		}
		if c.Len() != total {
			b.Fatalf("read %d samples", c.Len())
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/total, "ns/sample")
}
