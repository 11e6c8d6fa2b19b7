package lineserial_test

import (
	"fmt"

	"framed/drivers/lineserial"
)

// Parsing one line of a bridge board in the embedded sample layout: board
// microseconds, 24-bit force counts, encoder counts scaled to mm.
func ExampleParser_Parse() {
	c, err := lineserial.ParseConfig(lineserial.SampleConfig)
	if err != nil {
		fmt.Println(err)
		return
	}
	p := lineserial.NewParser(c)
	line := lineserial.AppendChecksum([]byte("t=1000000 f=-8388 x=10234"))
	fmt.Printf("%s\n", line)
	var s lineserial.Sample
	if err := p.Parse(line, &s); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("t=%d us force=%v counts crosshead=%.4f mm\n", s.BoardTime, s.Values[0], s.Values[1])
	fmt.Println(p.Parse([]byte("t=1000000 f=-8388 x=10234*00"), &s))
	// Output:
	// t=1000000 f=-8388 x=10234*74
	// t=1000000 us force=-8388 counts crosshead=25.5850 mm
	// lineserial: checksum mismatch
}
