package verify_test

import (
	"fmt"
	"strings"

	"framed/reduce/verify"
)

// A verification at two forces: 10 kN read 10.03, 10.04, 10.02 kN in the
// three increasing series and 10.05 kN on the way down; 5 kN read 5.01,
// 5.00, 4.99 kN. Resolution 1 N, 1 N left after unloading.
func ExampleClassifyForce() {
	csv := `series,reference_N,indicated_N
1,5000,5010
1,10000,10030
2,5000,5000
2,10000,10040
3,5000,4990
3,10000,10020
r,10000,10050
`
	readings, err := verify.ReadReadings(strings.NewReader(csv))
	if err != nil {
		fmt.Println(err)
		return
	}
	rep, err := verify.ClassifyForce(readings, 1, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range rep.Points {
		fmt.Printf("%5.0f N  q %+.2f %%  b %.2f %%  class %s\n", p.ReferenceN, *p.QPct, *p.BPct, p.Class)
	}
	fmt.Printf("f0 %.3f %%\n", rep.F0Pct)
	for _, r := range rep.Ranges {
		fmt.Printf("%.0f-%.0f N: class %s\n", r.FromN, r.ToN, r.Class)
	}
	fmt.Println("ASTM E4 accuracy:", rep.ASTME4Pass)
	// Output:
	//  5000 N  q +0.00 %  b 0.40 %  class 0.5
	// 10000 N  q +0.30 %  b 0.20 %  class 0.5
	// f0 0.010 %
	// 5000-10000 N: class 0.5
	// 10000-10000 N: class 0.5
	// ASTM E4 accuracy: true
}

func ExampleClassifyExtensometer() {
	rep, err := verify.ClassifyExtensometer([]verify.Displacement{
		{ReferenceMM: 0.1, IndicatedMM: 0.1015},
		{ReferenceMM: 1.0, IndicatedMM: 1.0015},
	}, 0.0001)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("class", rep.Class)
	// Output: class 0.5
}
