package detect_test

import (
	"fmt"
	"strings"

	"framed/daemon/detect"
	"framed/daemon/detect/detectgen"
)

// A wire loaded by dead weights in load-unload cycles, run through the
// detector the way `framectl reduce` does.
func ExampleOffline() {
	curve, _ := detectgen.Wire(50, 1).Generate()
	got := detect.Offline(curve, detect.Config{ForceRangeN: 1000})
	kinds := make([]string, len(got.Events))
	for i, e := range got.Events {
		kinds[i] = e.Kind
	}
	fmt.Println(strings.Join(kinds, " "))
	fmt.Printf("elastic limit between %.0f N and %.0f N\n", *got.ElasticLimit.NoSetUpToN, *got.ElasticLimit.SetFromN)
	// Output:
	// start hold hold unload hold hold unload hold unload hold hold hold break end
	// elastic limit between 400 N and 500 N
}

// Feeding the detector live, one batch at a time.
func ExampleDetector_Step() {
	curve, _ := detectgen.Wire(100, 1).Generate()
	d, err := detect.New(detect.Config{ForceRangeN: 1000})
	if err != nil {
		panic(err)
	}
	for i := 0; i < curve.Len(); i += 10 { // 100 ms batches
		for _, em := range d.Step(curve.Slice(i, min(i+10, curve.Len()))) {
			if em.Hold != nil {
				fmt.Printf("%s %.0f N\n", em.Event.Kind, em.Hold.ForceN)
			}
		}
	}
	fmt.Println(d.State())
	// Output:
	// hold 100 N
	// hold 200 N
	// hold 300 N
	// hold 400 N
	// hold 500 N
	// hold 550 N
	// hold 600 N
	// hold 650 N
	// ended
}
