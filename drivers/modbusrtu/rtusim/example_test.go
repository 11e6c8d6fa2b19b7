package rtusim_test

import (
	"fmt"

	"framed/drivers/modbusrtu/rtusim"
)

// A weighing indicator at address 1 showing 1234.5 N as an int32 in
// 0.1 N (12345 = 0x00003039), high word first, answers a poll.
func ExampleSlave_Feed() {
	s, _ := rtusim.NewSlave(1)
	s.SetHolding(0, 0x0000, 0x3039)
	answers, _ := s.Feed(rtusim.AppendCRC([]byte{0x01, 0x03, 0x00, 0x00, 0x00, 0x02}))
	fmt.Printf("% X\n", answers[0])
	// Output: 01 03 04 00 00 30 39 2E 21
}
