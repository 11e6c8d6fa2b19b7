package bench

import (
	"os"
	"testing"

	"framed/drivers/builtin"
	_ "framed/drivers/sim"
)

// TestMain lets the test binary double as the sim driver and as the
// daemon under measurement, as framectl does for `framectl bench`.
func TestMain(m *testing.M) {
	if builtin.ServeArgs(os.Args[1:]) || ServeArgs(os.Args[1:]) {
		return
	}
	os.Exit(m.Run())
}
