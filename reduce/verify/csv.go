package verify

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// ForceHeader is the header a force readings file must start with.
var ForceHeader = []string{"series", "reference_N", "indicated_N"}

// DisplacementHeader is the header an extensometer readings file must
// start with.
var DisplacementHeader = []string{"reference_mm", "indicated_mm"}

// maxLines bounds how many lines a readings file may hold. A verification
// has tens of readings; a file far larger is a mistake (a curve file given
// by accident), and refusing it early keeps memory bounded.
const maxLines = 100000

// ReadReadings parses a force readings file: a CSV with the header
// series,reference_N,indicated_N, then one reading per line. Blank lines
// are skipped. Errors name the line and wrap ErrBadHeader, ErrBadLine,
// ErrBadSeries or ErrBadNumber; an empty file gives ErrNoReadings.
func ReadReadings(r io.Reader) ([]Reading, error) {
	var out []Reading
	err := readCSV(r, ForceHeader, func(line int, f []string) error {
		s, err := ParseSeries(strings.TrimSpace(f[0]))
		if err != nil {
			return fmt.Errorf("line %d: %w", line, err)
		}
		ref, err := parseNumber(f[1], "reference_N")
		if err != nil {
			return fmt.Errorf("line %d: %w", line, err)
		}
		ind, err := parseNumber(f[2], "indicated_N")
		if err != nil {
			return fmt.Errorf("line %d: %w", line, err)
		}
		rd := Reading{Series: s, ReferenceN: ref, IndicatedN: ind}
		if err := rd.check(); err != nil {
			return fmt.Errorf("line %d: %w", line, err)
		}
		out = append(out, rd)
		return nil
	})
	if err != nil {
		return nil, err
	}
	if len(out) == 0 {
		return nil, ErrNoReadings
	}
	return out, nil
}

// readCSV checks the header and hands each non-blank record to row with
// its 1-based line number.
func readCSV(r io.Reader, header []string, row func(line int, fields []string) error) error {
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = -1 // checked here, to give our own message
	cr.ReuseRecord = true
	first := true
	for n := 0; ; n++ {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			if first {
				return fmt.Errorf("%w: empty file, want %q", ErrBadHeader, strings.Join(header, ","))
			}
			return nil
		}
		if err != nil {
			// FieldPos panics after a failed Read; the parse error carries
			// its own line.
			line := 0
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				line = pe.Line
			}
			return fmt.Errorf("line %d: %w: %v", line, ErrBadLine, err)
		}
		line, _ := cr.FieldPos(0)
		if n >= maxLines {
			return fmt.Errorf("line %d: %w: more than %d lines", line, ErrBadLine, maxLines)
		}
		if first {
			first = false
			if !headerMatches(rec, header) {
				return fmt.Errorf("line %d: %w: got %q, want %q", line, ErrBadHeader,
					strings.Join(rec, ","), strings.Join(header, ","))
			}
			continue
		}
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue // blank line
		}
		if len(rec) != len(header) {
			return fmt.Errorf("line %d: %w: %d fields, want %d", line, ErrBadLine, len(rec), len(header))
		}
		if err := row(line, rec); err != nil {
			return err
		}
	}
}

func headerMatches(rec, header []string) bool {
	if len(rec) != len(header) {
		return false
	}
	for i := range rec {
		got := strings.TrimSpace(rec[i])
		if i == 0 {
			got = strings.TrimPrefix(got, "\ufeff") // spreadsheet byte-order mark
		}
		if got != header[i] {
			return false
		}
	}
	return true
}

// parseNumber reads a finite decimal number.
func parseNumber(s, column string) (float64, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return 0, fmt.Errorf("%w: %s is empty", ErrBadNumber, column)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%w: %s %q is not a finite number", ErrBadNumber, column, s)
	}
	return v, nil
}
