package curvefile

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"

	"framed/reduce"
)

// Write writes c as a curve file. Values use the shortest decimal that
// reads back to the same float64, so Read gives back the same finite
// values; NaN, infinities and nil columns become empty cells.
func Write(w io.Writer, c reduce.Curve) error {
	n := c.Len()
	for _, col := range [][]float64{c.ForceN, c.ExtensionMM, c.CrossheadMM} {
		if col != nil && len(col) != n {
			return fmt.Errorf("curvefile: write: %w", reduce.ErrRaggedCurve)
		}
	}
	bw := bufio.NewWriter(w)
	bw.WriteString(Header)
	bw.WriteByte('\n')
	var buf []byte
	cell := func(col []float64, i int) {
		if col == nil || math.IsNaN(col[i]) || math.IsInf(col[i], 0) {
			return
		}
		buf = strconv.AppendFloat(buf, col[i], 'g', -1, 64)
	}
	for i := 0; i < n; i++ {
		buf = buf[:0]
		cell(c.TimeS, i)
		buf = append(buf, ',')
		cell(c.ForceN, i)
		buf = append(buf, ',')
		cell(c.ExtensionMM, i)
		buf = append(buf, ',')
		cell(c.CrossheadMM, i)
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return fmt.Errorf("curvefile: write: %w", err)
		}
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("curvefile: write: %w", err)
	}
	return nil
}
