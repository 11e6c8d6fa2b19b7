package boardsim_test

import (
	"fmt"

	"framed/drivers/lineserial/boardsim"
)

// A noise-free board with 10 kg hung prints the line the lineserial
// driver's sample configuration reads.
func ExampleBoard_AppendLine() {
	cell := boardsim.LoadCell{OffsetCounts: 120000, CountsPerN: 1000, FullScaleN: 5000}
	var load boardsim.Load
	f, _ := boardsim.ParseLoad("10kg", boardsim.StandardGravity)
	load.Set(f)
	b, _ := boardsim.NewBoard(cell, &load, 1)
	b.CrossheadCounts = 4000
	fmt.Printf("%q\n", b.AppendLine(nil, 3, 1000))
	// Output: "t=3000 f=218067 x=4000*5A\r\n"
}

// A load script as the simulator's --script flag takes it: masses in kg
// unless marked N, each held for its duration.
func ExampleParseScript() {
	steps, err := boardsim.ParseScript("0:5s,10:5s,122.6N:2s", boardsim.StandardGravity)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range steps {
		fmt.Printf("%.4f N for %v\n", s.ForceN, s.Hold)
	}
	// Output:
	// 0.0000 N for 5s
	// 98.0665 N for 5s
	// 122.6000 N for 2s
}
