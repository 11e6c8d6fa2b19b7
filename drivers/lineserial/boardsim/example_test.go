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
