package bench

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"text/tabwriter"
)

// LimitKind says what a figure's limit is.
const (
	// LimitMeasured: the limit is a baseline measured in the same run.
	LimitMeasured = "measured"
	// LimitTarget: the limit is the project's target.
	LimitTarget = "target"
	// LimitInfo: the limit is a reference for reading the value, with no
	// pass or fail (the configured commit interval beside data at risk).
	LimitInfo = "info"
)

// Figure is one measured value with the limit it is compared with.
// Ratio = Value / Limit. Pass is nil when the figure has no target.
type Figure struct {
	Name      string  `json:"name"`
	Value     float64 `json:"value"`
	Unit      string  `json:"unit"`
	Limit     float64 `json:"limit"`
	Ratio     float64 `json:"ratio"`
	LimitKind string  `json:"limit_kind"`
	// LimitName says what the limit is ("direct bbolt appends").
	LimitName string `json:"limit_name"`
	// Target is the pass condition in words ("ratio >= 0.5").
	Target string `json:"target,omitempty"`
	Pass   *bool  `json:"pass,omitempty"`
	Note   string `json:"note,omitempty"`
}

// Report is the output of a bench run: the contract of
// `framectl bench --json` is {"figures": [{name, value, unit, limit,
// ratio}]}, the other fields are extensions.
type Report struct {
	Figures []Figure `json:"figures"`
	// Mode is "quick", "default" or "long".
	Mode string `json:"mode"`
	// Notes are remarks that apply to the whole run (skipped phases).
	Notes []string `json:"notes,omitempty"`
}

// Figure returns the named figure.
func (r *Report) Figure(name string) (Figure, bool) {
	for _, f := range r.Figures {
		if f.Name == name {
			return f, true
		}
	}
	return Figure{}, false
}

// Add appends f with its ratio computed as Value / Limit (NaN when
// either is unknown or the limit is 0).
func (r *Report) Add(f Figure) {
	f.Ratio = ratio(f.Value, f.Limit)
	r.Figures = append(r.Figures, f)
}

func ratio(v, limit float64) float64 {
	if limit == 0 || math.IsNaN(v) || math.IsNaN(limit) {
		return math.NaN()
	}
	return v / limit
}

func passIf(ok bool) *bool { return &ok }

// MarshalJSON writes NaN (not measured) as null, which plain float64
// fields cannot carry.
func (f Figure) MarshalJSON() ([]byte, error) {
	type plain Figure
	type out struct {
		plain
		Value *float64 `json:"value"`
		Limit *float64 `json:"limit"`
		Ratio *float64 `json:"ratio"`
	}
	num := func(v float64) *float64 {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil
		}
		return &v
	}
	return json.Marshal(out{plain: plain(f), Value: num(f.Value), Limit: num(f.Limit), Ratio: num(f.Ratio)})
}

// WriteTable prints the report as an aligned table, one figure a line.
func (r *Report) WriteTable(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "FIGURE\tVALUE\tUNIT\tLIMIT\tLIMIT IS\tRATIO\tTARGET\tPASS")
	for _, f := range r.Figures {
		pass := "-"
		if f.Pass != nil {
			pass = map[bool]string{true: "yes", false: "NO"}[*f.Pass]
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n", f.Name, num(f.Value), f.Unit, num(f.Limit), f.LimitName, num(f.Ratio), f.Target, pass)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	for _, f := range r.Figures {
		if f.Note != "" {
			fmt.Fprintf(w, "  %s: %s\n", f.Name, f.Note)
		}
	}
	for _, n := range r.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
	return nil
}

func num(v float64) string {
	switch {
	case math.IsNaN(v):
		return "n/a"
	case math.Abs(v) >= 1e5:
		return fmt.Sprintf("%.3g", v)
	case math.Abs(v) >= 100:
		return fmt.Sprintf("%.0f", v)
	case math.Abs(v) >= 1:
		return fmt.Sprintf("%.2f", v)
	default:
		return fmt.Sprintf("%.3g", v)
	}
}
