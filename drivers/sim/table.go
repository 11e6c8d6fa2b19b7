package sim

// table samples a material's loading curve once, finely where the curve
// bends (small strains) and geometrically coarser later, so each simulated
// sample is an interpolation found by a pointer that only moves forward:
// O(1) per sample, no root finding on the hot path.
type table struct {
	e []float64 // engineering strain, increasing, last = fracture strain
	s []float64 // engineering stress, MPa
}

const (
	tableFineStep = 2e-6  // strain step near the origin
	tableGrowth   = 0.002 // relative step further out
)

func newTable(c model) table {
	var t table
	ef := c.fractureE
	for e := 0.0; e < ef; {
		t.e = append(t.e, e)
		t.s = append(t.s, c.stress(e))
		e += max(tableFineStep, tableGrowth*e)
	}
	t.e = append(t.e, ef)
	t.s = append(t.s, c.stress(ef))
	return t
}

// last is the index of the fracture point.
func (t *table) last() int { return len(t.e) - 1 }
