package sim_test

import (
	"context"
	"fmt"

	"framed/drivers/sim"
)

// The ground truth a reduction of the demo's aluminium bar must find.
func ExampleMaterial_Truth() {
	sp := sim.DemoScript()[0]
	tr := sp.Material.Truth()
	fmt.Printf("%s: Rp0.2 %.0f MPa, Rm %.0f MPa, A %.1f %%, Fm %.0f N\n",
		sp.ID, tr.Rp02MPa, tr.RmMPa, tr.APct, sp.FmN())
	// Output:
	// OWF-2611-AL01: Rp0.2 276 MPa, Rm 310 MPa, A 12.0 %, Fm 8771 N
}

// Stream a simulated test as fast as it is taken: the demo series,
// without noise, from its first sample (specimen gripped, no load yet).
func ExampleNew() {
	d := sim.New()
	info, err := d.Configure(context.Background(), []byte(`{"script": "demo", "pace": "none", "noise": 0, "pause_s": 0}`))
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
		fmt.Printf("%s (%s): %v %s\n", c.Name, c.Quantity, b.Values[k][0], c.Unit)
	}
	// Output:
	// force (force): 0 N
	// ext (extension): 0 mm
	// crosshead (crosshead): 0 mm
}
