package curvefile

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"

	"framed/reduce"
)

// Header is the first line of every curve file.
const Header = "time_s,force_N,extension_mm,crosshead_mm"

// MaxLineBytes bounds a line; real lines are well under 100 bytes.
const MaxLineBytes = 4096

// Read parses a curve file. Time must not decrease (equal stamps are kept:
// some recorders stamp a burst with one time). Blank lines are skipped;
// CRLF line ends and a missing final newline are accepted.
func Read(r io.Reader) (reduce.Curve, error) {
	var c reduce.Curve
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, MaxLineBytes), MaxLineBytes)
	line := 0
	header := false
	var cols [4]float64
	for sc.Scan() {
		line++
		b := bytes.TrimRight(sc.Bytes(), "\r")
		if !header {
			b = bytes.TrimPrefix(b, []byte("\xef\xbb\xbf"))
			if string(bytes.TrimSpace(b)) != Header {
				return reduce.Curve{}, fmt.Errorf("%w: line 1 is %q, want %q", ErrHeader, clip(b), Header)
			}
			header = true
			continue
		}
		if len(bytes.TrimSpace(b)) == 0 {
			continue
		}
		if err := parseLine(b, &cols); err != nil {
			return reduce.Curve{}, fmt.Errorf("line %d: %w", line, err)
		}
		if math.IsNaN(cols[0]) {
			return reduce.Curve{}, fmt.Errorf("%w: line %d has no time_s", ErrTime, line)
		}
		if k := len(c.TimeS); k > 0 && cols[0] < c.TimeS[k-1] {
			return reduce.Curve{}, fmt.Errorf("%w: line %d time_s %v after %v", ErrTime, line, cols[0], c.TimeS[k-1])
		}
		c.TimeS = append(c.TimeS, cols[0])
		c.ForceN = append(c.ForceN, cols[1])
		c.ExtensionMM = append(c.ExtensionMM, cols[2])
		c.CrossheadMM = append(c.CrossheadMM, cols[3])
	}
	if err := sc.Err(); err != nil {
		if errors.Is(err, bufio.ErrTooLong) {
			return reduce.Curve{}, fmt.Errorf("%w: line %d is over %d bytes", ErrLineTooLong, line+1, MaxLineBytes)
		}
		return reduce.Curve{}, fmt.Errorf("%w: after line %d: %w", ErrRead, line, err)
	}
	if !header {
		return reduce.Curve{}, fmt.Errorf("%w: the file is empty, want %q", ErrHeader, Header)
	}
	dropEmpty(&c)
	return c, nil
}

// dropEmpty turns a column with no reading at all into nil: the channel was
// never there.
func dropEmpty(c *reduce.Curve) {
	for _, col := range []*[]float64{&c.ForceN, &c.ExtensionMM, &c.CrossheadMM} {
		any := false
		for _, v := range *col {
			if !math.IsNaN(v) {
				any = true
				break
			}
		}
		if !any {
			*col = nil
		}
	}
}

func parseLine(b []byte, cols *[4]float64) error {
	k := 0
	for {
		j := bytes.IndexByte(b, ',')
		cell := b
		if j >= 0 {
			cell = b[:j]
		}
		if k == 4 {
			return fmt.Errorf("%w: more than 4 cells in %q", ErrColumns, clip(b))
		}
		v, err := parseCell(cell)
		if err != nil {
			return err
		}
		cols[k] = v
		k++
		if j < 0 {
			break
		}
		b = b[j+1:]
	}
	if k != 4 {
		return fmt.Errorf("%w: %d cells, want 4", ErrColumns, k)
	}
	return nil
}

func parseCell(cell []byte) (float64, error) {
	cell = bytes.TrimSpace(cell)
	if len(cell) == 0 {
		return math.NaN(), nil
	}
	v, err := strconv.ParseFloat(string(cell), 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%w: %q", ErrNumber, clip(cell))
	}
	return v, nil
}

// clip keeps quoted input short in error messages.
func clip(b []byte) string {
	if len(b) > 60 {
		return string(b[:60]) + "..."
	}
	return string(b)
}
