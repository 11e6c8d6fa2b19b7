package replay_test

import (
	"context"
	"fmt"
	"path/filepath"

	"framed/drivers/replay"
)

// Play a recording as fast as it is taken and look at its first sample.
func Example() {
	path, _ := filepath.Abs("testdata/curves/s355-zd2-every10th.csv")
	d := replay.New()
	info, err := d.Configure(context.Background(), fmt.Appendf(nil, `{"path": %q, "pace": "none"}`, path))
	if err != nil {
		fmt.Println(err)
		return
	}
	ctx, cancel := context.WithCancel(context.Background())
	ch, _ := d.Stream(ctx)
	b := <-ch
	cancel()
	for range ch {
	}
	for k, c := range info.Channels {
		fmt.Printf("%s %v %s\n", c.Name, b.Values[k][0], c.Unit)
	}
	// Output:
	// force 279.44 N
	// ext 0.04851 mm
	// crosshead -0.00044 mm
}
