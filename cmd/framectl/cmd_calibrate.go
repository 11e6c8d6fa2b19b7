package main

import (
	"bufio"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"framed/daemon"
	"framed/daemon/calib"
)

func init() {
	register(&command{name: "tare", summary: "zero the force channel of the running daemon (frame unloaded, nothing moving)", run: runTare})
	register(&command{name: "span", summary: "calibrate the force channel with reference weights or forces, guided step by step", run: runSpan})
	register(&command{name: "calibrations", summary: "list the stored calibrations of a channel", run: runCalibrations})
}

func runTare(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("tare", flag.ContinueOnError)
	fs.SetOutput(stderr)
	state := stateFlag(fs)
	samples := fs.Int("samples", 500, "how many of the latest readings to average")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	dir, err := stateDir(*state)
	if err != nil {
		return err
	}
	var c calib.Calibration
	if err := callDaemon(ctx, dir, daemon.Request{Op: "tare", Channel: "force", Samples: *samples}, &c); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "tared force: %s (mean of %d readings %.6g raw, sd %.3g)\n", c.ID, c.Tare.N, c.Tare.MeanRaw, c.Tare.SDRaw)
	return nil
}

// readingRaw asks the daemon for the mean of the latest raw force readings.
func readingRaw(ctx context.Context, dir string, samples int) (mean, sd float64, n int, err error) {
	var r struct {
		RawMean float64 `json:"raw_mean"`
		RawSD   float64 `json:"raw_sd"`
		Samples int     `json:"samples"`
	}
	err = callDaemon(ctx, dir, daemon.Request{Op: "read", Samples: samples}, &r)
	return r.RawMean, r.RawSD, r.Samples, err
}

// runSpan walks the operator through the reference loads: for each one it
// waits for Enter (the weight hung and the swinging died out), reads the
// daemon's latest raw readings, then fits and stores the calibration.
func runSpan(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("span", flag.ContinueOnError)
	fs.SetOutput(stderr)
	state := stateFlag(fs)
	refsFlag := fs.String("references", "", "comma-separated reference loads, e.g. 0,5,10,20 (required)")
	unit := fs.String("unit", "kg", "unit of --references: kg (reference weights) or N (reference forces)")
	g := fs.Float64("g", calib.StandardGravity, "local gravity in m/s2 for weights (standard gravity by default; use your site's value)")
	degree := fs.Int("degree", 1, "1 for a linear span, 2 to correct a load cell's curvature")
	samples := fs.Int("samples", 500, "readings averaged at each reference")
	dryRun := fs.Bool("dry-run", false, "show the fit without storing it")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	dir, err := stateDir(*state)
	if err != nil {
		return err
	}
	loads, err := parseFloats(*refsFlag)
	if err != nil || len(loads) < 2 {
		return fmt.Errorf("%w: --references needs at least two loads, e.g. 0,10,20", errUsage)
	}
	if *unit != "kg" && *unit != "N" {
		return fmt.Errorf("%w: --unit %q: kg or N", errUsage, *unit)
	}
	in := bufio.NewReader(os.Stdin)
	raw := make([]float64, len(loads))
	for i, l := range loads {
		what := fmt.Sprintf("%g N", l)
		if *unit == "kg" {
			what = fmt.Sprintf("%g kg (%.2f N)", l, calib.WeightN(l, *g))
		}
		fmt.Fprintf(stdout, "Load %s, wait until it hangs still, then press Enter: ", what)
		if _, err := in.ReadString('\n'); err != nil {
			return fmt.Errorf("span cancelled: %w", err)
		}
		mean, sd, n, err := readingRaw(ctx, dir, *samples)
		if err != nil {
			return err
		}
		raw[i] = mean
		fmt.Fprintf(stdout, "  read %.6g raw (sd %.3g over %d readings)\n", mean, sd, n)
	}
	var refs []calib.Reference
	if *unit == "kg" {
		refs, err = calib.ReferencesFromMasses(loads, raw, *g)
		if err != nil {
			return err
		}
	} else {
		for i := range loads {
			refs = append(refs, calib.Reference{Reference: loads[i], Indicated: raw[i]})
		}
	}
	c, err := calib.NewSpan("force", "N", time.Now().UTC(), refs, *degree)
	if err != nil {
		return err
	}
	printCalibration(stdout, c)
	if *dryRun {
		fmt.Fprintln(stdout, "dry run: not stored")
		return nil
	}
	body, _ := json.Marshal(c)
	if err := callDaemon(ctx, dir, daemon.Request{Op: "calibrate", Calibration: body}, nil); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "stored %s; results from now on name it\n", c.ID)
	return nil
}

func parseFloats(s string) ([]float64, error) {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		if f == "" {
			continue
		}
		v, err := strconv.ParseFloat(f, 64)
		if err != nil {
			return nil, err
		}
		out = append(out, v)
	}
	return out, nil
}

func printCalibration(w io.Writer, c calib.Calibration) {
	fmt.Fprintf(w, "%s  %s  %s  model: %.6g + %.6g raw", c.ID, c.Kind, c.At.Local().Format(time.DateTime), c.Model.Offset, c.Model.Gain)
	if c.Model.Quad != 0 {
		fmt.Fprintf(w, " + %.6g raw^2", c.Model.Quad)
	}
	fmt.Fprintln(w)
	if len(c.Residuals) == 0 {
		return
	}
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "  reference\tresidual\t% of reading")
	for _, r := range c.Residuals {
		pct := "-"
		if r.Pct != nil {
			pct = fmt.Sprintf("%+.3f", *r.Pct)
		}
		fmt.Fprintf(tw, "  %.4g\t%+.4g\t%s\n", r.Reference, r.Residual, pct)
	}
	tw.Flush()
	if c.StdErr != nil {
		fmt.Fprintf(w, "  standard error of the fit: %.4g\n", *c.StdErr)
	}
}

func runCalibrations(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("calibrations", flag.ContinueOnError)
	fs.SetOutput(stderr)
	state := stateFlag(fs)
	channel := fs.String("channel", "force", "force, extension or crosshead")
	asJSON := fs.Bool("json", false, "print JSON")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	dir, err := stateDir(*state)
	if err != nil {
		return err
	}
	var list []calib.Calibration
	if err := callDaemon(ctx, dir, daemon.Request{Op: "calibrations", Channel: *channel}, &list); err != nil {
		return err
	}
	if *asJSON {
		return json.NewEncoder(stdout).Encode(list)
	}
	if len(list) == 0 {
		fmt.Fprintf(stdout, "no calibration stored for %s\n", *channel)
	}
	for _, c := range list {
		printCalibration(stdout, c)
	}
	return nil
}
