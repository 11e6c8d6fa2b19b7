package sim_test

import (
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
