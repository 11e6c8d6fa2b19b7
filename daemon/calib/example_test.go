package calib_test

import (
	"fmt"
	"os"
	"path/filepath"
	"time"

	"go.etcd.io/bbolt"

	"framed/daemon/calib"
)

// Span a load cell with reference weights of 0, 20 and 50 kg hung at a
// site where g = 9.8105 m/s2, then tare it.
func ExampleNewSpan() {
	refs, err := calib.ReferencesFromMasses(
		[]float64{0, 20, 50},
		[]float64{1200, 9200, 21200}, // raw counts read with each weight
		9.8105)
	if err != nil {
		fmt.Println(err)
		return
	}
	at := time.Date(2026, 5, 4, 9, 30, 0, 0, time.UTC) // the caller's clock
	c, err := calib.NewSpan("force", "N", at, refs, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	// By hand: 20 kg x 9.8105 m/s2 = 196.21 N over 8000 counts is
	// 0.02452625 N per count; 16000 counts is 14800 above zero: 362.9885 N.
	fmt.Printf("%s: %.8f N per count\n", c.ID, c.Model.Gain)
	fmt.Printf("16000 counts = %.4f N\n", c.Apply(16000))

	w, err := calib.Quiet([]float64{1210, 1212, 1211, 1209}, 5)
	if err != nil {
		fmt.Println(err)
		return
	}
	tare, err := calib.NewTare("force", at.Add(time.Hour), c.Model, w)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("after tare, 1210.5 counts = %.1f N\n", tare.Apply(1210.5))
	// Output:
	// force-20260504T093000.000000000Z: 0.02452625 N per count
	// 16000 counts = 362.9885 N
	// after tare, 1210.5 counts = 0.0 N
}

// Keep calibrations in the daemon's bbolt file and flag a stale one.
func ExampleHistory() {
	dir, err := os.MkdirTemp("", "calib-example")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	db, err := bbolt.Open(filepath.Join(dir, "state.db"), 0o600, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	defer db.Close()
	h, err := calib.NewHistory(db)
	if err != nil {
		fmt.Println(err)
		return
	}
	at := time.Date(2026, 1, 5, 8, 0, 0, 0, time.UTC)
	span, err := calib.NewSpan("force", "N", at, []calib.Reference{
		{Reference: 0, Indicated: 1200}, {Reference: 1000, Indicated: 41200}}, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := h.Save(span); err != nil {
		fmt.Println(err)
		return
	}
	w, _ := calib.Quiet([]float64{1300, 1302, 1298}, 10)
	tare, err := calib.TareOn(span, at.Add(30*24*time.Hour), w)
	if err != nil {
		fmt.Println(err)
		return
	}
	if err := h.Save(tare); err != nil {
		fmt.Println(err)
		return
	}
	// By hand: gain 1000 N / 40000 counts = 0.025, offset -30 N; the tare
	// window reads 2.5 N, so the offset becomes -32.5 N and 21300 counts
	// read 532.5 - 32.5 = 500 N.
	cur, _, _ := h.Current("force")
	fmt.Printf("current: %s, 21300 counts = %.1f %s\n", cur.Kind, cur.Apply(21300), cur.Unit)
	for _, now := range []time.Time{at.Add(100 * 24 * time.Hour), at.Add(400 * 24 * time.Hour)} {
		flag, _, _ := h.Flag("force", now, 365*24*time.Hour)
		fmt.Printf("day %.0f: %q\n", now.Sub(at).Hours()/24, flag)
	}
	flag, _, _ := h.Flag("extension", at, 365*24*time.Hour)
	fmt.Printf("extension: %q\n", flag)
	// Output:
	// current: tare, 21300 counts = 500.0 N
	// day 100: ""
	// day 400: "calibration-stale"
	// extension: "calibration-missing"
}
