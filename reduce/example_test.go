package reduce_test

import (
	"fmt"

	"framed/reduce"
)

// Reducing a recorded test: a steel bar with an elastic line to 276 MPa and
// linear hardening to a break, recorded by force and extensometer. The
// values can be checked by hand: Rp0.2 is where 200 GPa x (e - 0.002)
// meets 276 + 1000 (e - 0.00138), e = 0.00339, 278.0 MPa; Rm is the last
// stress, 276 + 1000 x 0.09862; A from Lu is 100 x 4.9 / 50.
func ExampleReduce() {
	var c reduce.Curve
	const s0, le = 20.0, 50.0 // mm2, mm
	for i := 0; i <= 1000; i++ {
		e := 0.1 * float64(i) / 1000 // engineering strain
		s := 200000 * e              // MPa
		if s > 276 {
			s = 276 + 1000*(e-276.0/200000)
		}
		c.TimeS = append(c.TimeS, float64(i)*0.1)
		c.ForceN = append(c.ForceN, s*s0)
		c.ExtensionMM = append(c.ExtensionMM, e*le)
	}
	res, err := reduce.Reduce(c, reduce.Specimen{S0MM2: s0, L0MM: le, LuMM: 54.9}, reduce.Detected{}, reduce.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, q := range res.Quantities {
		switch q.Symbol {
		case "E", "Rp0.2", "Rm", "A":
			fmt.Printf("%s %.1f %s\n", q.Symbol, q.Value, q.Unit)
		}
	}
	// Output:
	// E 200.0 GPa
	// Rp0.2 278.0 MPa
	// Rm 374.6 MPa
	// A 9.8 %
}
