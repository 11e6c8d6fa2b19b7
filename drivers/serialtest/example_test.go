package serialtest_test

import (
	"errors"
	"fmt"
	"io"

	"framed/drivers/serialtest"
)

// A playback port hands out the scripted device bytes, then the scripted
// disconnect; Close reports whether the driver read everything.
func ExamplePlayback() {
	port := serialtest.NewPlayback(
		serialtest.Op{R: []byte("t=1 f=2\r\n")},
		serialtest.Op{Err: io.ErrUnexpectedEOF}, // the cable is pulled
	)
	buf := make([]byte, 64)
	n, _ := port.Read(buf)
	fmt.Printf("%q\n", buf[:n])
	_, err := port.Read(buf)
	fmt.Println(errors.Is(err, io.ErrUnexpectedEOF))
	fmt.Println(port.Close())
	// Output:
	// "t=1 f=2\r\n"
	// true
	// <nil>
}
