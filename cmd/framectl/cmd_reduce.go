package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"
	"text/tabwriter"

	"framed/reduce"
	"framed/reduce/curvefile"
)

func init() {
	register(&command{
		name:    "reduce",
		summary: "reduce a curve file offline to the result document (--json)",
		run:     runReduce,
	})
}

func runReduce(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("reduce", flag.ContinueOnError)
	fs.SetOutput(stderr)
	geo := addGeometryFlags(fs)
	asJSON := fs.Bool("json", false, "print the result document as one JSON document")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: framectl reduce FILE.csv --shape round --d0 MM --L0 MM [--Le MM] [--Lu MM] [--Su MM2] [--json]")
		fs.PrintDefaults()
	}
	pos, err := parseInterleaved(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return fmt.Errorf("%w: want exactly one curve file, got %d arguments", errUsage, len(pos))
	}
	sp, err := geo.specimen()
	if err != nil {
		return err
	}
	opt, err := geo.options()
	if err != nil {
		return err
	}
	c, err := readCurveFile(pos[0])
	if err != nil {
		return err
	}
	res, err := reduce.Reduce(c, sp, detectOffline(c), opt)
	if err != nil {
		return fmt.Errorf("%s: %w", pos[0], err)
	}
	res.Finite()
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		return enc.Encode(res)
	}
	return printResult(stdout, res)
}

// readCurveFile opens and parses one curve file.
func readCurveFile(path string) (reduce.Curve, error) {
	f, err := os.Open(path)
	if err != nil {
		return reduce.Curve{}, err
	}
	defer f.Close()
	c, err := curvefile.Read(f)
	if err != nil {
		return reduce.Curve{}, fmt.Errorf("%s: %w", path, err)
	}
	return c, nil
}

// printResult writes the result as a table a technician can read beside a
// report: one line per quantity with its expanded uncertainty and method.
func printResult(w io.Writer, res reduce.Result) error {
	sp := res.Specimen
	fmt.Fprintf(w, "specimen %s  S0 %.4g mm2", orDash(sp.ID), sp.UsedS0MM2)
	if sp.L0MM > 0 {
		fmt.Fprintf(w, "  L0 %g mm", sp.L0MM)
	}
	if sp.LeMM > 0 {
		fmt.Fprintf(w, "  Le %g mm", sp.LeMM)
	}
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "quantity\tvalue\tU (k=2)\tunit\tmethod")
	for _, q := range res.Quantities {
		u := "-"
		if q.U != nil {
			u = formatValue(*q.U, q.Unit)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", q.Symbol, formatValue(q.Value, q.Unit), u, q.Unit, q.Method)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if f := res.Fit; f != nil {
		fmt.Fprintf(w, "elastic fit: %.0f-%.0f MPa, %d points, r2 %.5f, V1 %.3f %%", f.FromMPa, f.ToMPa, f.Points, f.R2, f.V1Pct)
		if f.Apparent {
			fmt.Fprint(w, " (apparent: crosshead strain)")
		}
		fmt.Fprintln(w)
	}
	printSteps(w, res)
	for _, e := range res.Events {
		fmt.Fprintf(w, "event %-6s at %.3f s", e.Kind, e.TimeS)
		if e.ForceN != nil {
			fmt.Fprintf(w, "  %.0f N", *e.ForceN)
		}
		fmt.Fprintln(w)
	}
	flags := "none"
	if len(res.Flags) > 0 {
		flags = strings.Join(res.Flags, ", ")
	}
	_, err := fmt.Fprintf(w, "flags: %s\n", flags)
	return err
}

func formatValue(v float64, unit string) string {
	switch unit {
	case "MPa", "N":
		return fmt.Sprintf("%.1f", v)
	case "GPa", "%", "MJ/m3":
		return fmt.Sprintf("%.2f", v)
	default:
		return fmt.Sprintf("%.4f", v)
	}
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}
