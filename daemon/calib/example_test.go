package calib_test

import (
	"fmt"
	"time"

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
