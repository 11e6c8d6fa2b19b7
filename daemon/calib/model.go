package calib

import "math"

// Model maps a raw reading to engineering units:
//
//	value = Offset + Gain raw + Quad raw^2
//
// The quadratic term corrects the slight non-linearity of a load cell;
// it is zero for a linear span.
type Model struct {
	Offset float64 `json:"offset"`
	Gain   float64 `json:"gain"`
	Quad   float64 `json:"quad"`
}

// Identity passes raw readings through unchanged: the starting point for
// a tare of a channel that has no span yet (a device that already reports
// N or mm).
var Identity = Model{Gain: 1}

// Apply converts one raw reading. NaN (no reading) stays NaN.
func (m Model) Apply(raw float64) float64 {
	return m.Offset + raw*(m.Gain+raw*m.Quad)
}

// ApplyColumn converts a column of raw readings in place, the way the
// acquisition loop calibrates a whole batch. NaN stays NaN.
func (m Model) ApplyColumn(col []float64) {
	if m.Quad == 0 {
		for i, x := range col {
			col[i] = m.Offset + m.Gain*x
		}
		return
	}
	for i, x := range col {
		col[i] = m.Offset + x*(m.Gain+x*m.Quad)
	}
}

func (m Model) finite() bool {
	return finite(m.Offset) && finite(m.Gain) && finite(m.Quad)
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
