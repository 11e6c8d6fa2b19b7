package curvefile_test

import (
	"fmt"
	"strings"

	"framed/reduce/curvefile"
)

// A curve file whose extensometer came off after the second sample.
func ExampleRead() {
	c, err := curvefile.Read(strings.NewReader(
		"time_s,force_N,extension_mm,crosshead_mm\n" +
			"0,0,0,0\n" +
			"0.1,1200,0.006,0.02\n" +
			"0.2,1350,,0.05\n"))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(c.Len(), c.ForceN[2], c.ExtensionMM[2])
	// Output: 3 1350 NaN
}
