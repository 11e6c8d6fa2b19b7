package detectgen

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"framed/reduce"
)

// CurveHeader is the header line of a curve file.
const CurveHeader = "time_s,force_N,extension_mm,crosshead_mm"

// WriteCSV writes c as a curve file; NaN becomes an empty cell.
func WriteCSV(w io.Writer, c reduce.Curve) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, CurveHeader)
	cell := func(col []float64, i int) string {
		if col == nil || math.IsNaN(col[i]) {
			return ""
		}
		return strconv.FormatFloat(col[i], 'g', 8, 64)
	}
	for i := range c.TimeS {
		fmt.Fprintf(bw, "%s,%s,%s,%s\n", strconv.FormatFloat(c.TimeS[i], 'g', 9, 64),
			cell(c.ForceN, i), cell(c.ExtensionMM, i), cell(c.CrossheadMM, i))
	}
	return bw.Flush()
}

// ReadCSV reads a curve file. It exists for tests and tools that need
// curves without the daemon; an empty cell reads as NaN.
func ReadCSV(r io.Reader) (reduce.Curve, error) {
	var c reduce.Curve
	sc := bufio.NewScanner(r)
	line := 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(sc.Text())
		if line == 1 {
			if text != CurveHeader {
				return c, fmt.Errorf("%w: header %q, want %q", ErrBadCSV, text, CurveHeader)
			}
			continue
		}
		if text == "" {
			continue
		}
		cells := strings.Split(text, ",")
		if len(cells) != 4 {
			return c, fmt.Errorf("%w: line %d has %d cells: %q", ErrBadCSV, line, len(cells), text)
		}
		var v [4]float64
		for j, s := range cells {
			if s == "" && j > 0 {
				v[j] = math.NaN()
				continue
			}
			x, err := strconv.ParseFloat(s, 64)
			if err != nil {
				return c, fmt.Errorf("%w: line %d cell %d: %q", ErrBadCSV, line, j+1, s)
			}
			v[j] = x
		}
		c.TimeS = append(c.TimeS, v[0])
		c.ForceN = append(c.ForceN, v[1])
		c.ExtensionMM = append(c.ExtensionMM, v[2])
		c.CrossheadMM = append(c.CrossheadMM, v[3])
	}
	if err := sc.Err(); err != nil {
		return c, fmt.Errorf("%w: %w", ErrBadCSV, err)
	}
	if line == 0 {
		return c, fmt.Errorf("%w: empty", ErrBadCSV)
	}
	return c, nil
}
