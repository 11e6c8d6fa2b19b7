package main

import (
	"bufio"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"

	"framed/daemon"
	"framed/reduce/verify"
)

func init() {
	register(&command{
		name:    "verify",
		summary: "class the force channel (ISO 7500-1, ASTM E4) or an extensometer (ISO 9513) from readings",
		run:     runVerify,
	})
}

// verifyStdin is where a guided verification reads the operator's answers;
// tests replace it.
var verifyStdin io.Reader = os.Stdin

// errNoDaemonForVerify: neither a readings file nor a running daemon.
var errNoDaemonForVerify = errors.New("no readings file given and no running framed reachable: use --readings FILE.csv, or start framed (with the same --state) for a guided verification")

func runVerify(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("verify", flag.ContinueOnError)
	fs.SetOutput(stderr)
	readings := fs.String("readings", "", "readings file (CSV: series,reference_N,indicated_N; with --extensometer: reference_mm,indicated_mm)")
	resN := fs.Float64("resolution-N", 0, "resolution r of the force indicator, N (required for force)")
	zeroN := fs.Float64("zero-after-N", 0, "indicated force after unloading, N (required for force)")
	ext := fs.Bool("extensometer", false, "class an extensometer (ISO 9513) instead of the force channel")
	resMM := fs.Float64("resolution-mm", 0, "extensometer resolution, mm (required with --extensometer)")
	fluctN := fs.Float64("fluctuation-N", 0, "range of the unloaded reading's fluctuation, N; when wider than --resolution-N the resolution becomes half of it plus one increment")
	asJSON := fs.Bool("json", false, "print the report as one JSON document")
	forces := fs.String("forces", "", "guided verification: reference forces in N, comma separated")
	decreasing := fs.Bool("decreasing", true, "guided verification: read the decreasing run after series 3 (reversibility)")
	state := stateFlag(fs)
	keep := fs.Bool("store", false, "with --readings: hand the report to the running framed (--state), which stores it and publishes it on framed/<frame>/verification; a guided verification always does")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: framectl verify --readings FILE.csv --resolution-N R --zero-after-N Z [--json]")
		fmt.Fprintln(stderr, "       framectl verify --extensometer --readings FILE.csv --resolution-mm R [--json]")
		fmt.Fprintln(stderr, "       framectl verify --forces F1,F2,... --resolution-N R [--state DIR]   (guided, on the running frame)")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return nil
		}
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("%w: unexpected argument %q (the readings file goes after --readings)", errUsage, fs.Arg(0))
	}
	given := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { given[f.Name] = true })

	if *ext {
		if *readings == "" {
			return fmt.Errorf("%w: --extensometer needs --readings FILE.csv", errUsage)
		}
		if !given["resolution-mm"] {
			return fmt.Errorf("%w: --extensometer needs --resolution-mm", errUsage)
		}
		d, err := readFile(*readings, verify.ReadDisplacements)
		if err != nil {
			return err
		}
		rep, err := verify.ClassifyExtensometer(d, *resMM)
		if err != nil {
			return fmt.Errorf("%s: %w", *readings, err)
		}
		if *asJSON {
			return writeJSON(stdout, rep)
		}
		return printExtensometer(stdout, rep)
	}

	if !given["resolution-N"] {
		return fmt.Errorf("%w: --resolution-N is required (the force indicator's resolution)", errUsage)
	}
	var rd []verify.Reading
	zeroAfterN := *zeroN
	storeIn := ""
	if *readings != "" {
		if given["forces"] {
			return fmt.Errorf("%w: --forces is for a guided verification; with --readings the forces come from the file", errUsage)
		}
		if !given["zero-after-N"] {
			return fmt.Errorf("%w: --zero-after-N is required (the reading after unloading)", errUsage)
		}
		var err error
		if rd, err = readFile(*readings, verify.ReadReadings); err != nil {
			return err
		}
	} else {
		plan, err := parseForces(*forces)
		if err != nil {
			return err
		}
		dir := *state
		if dir == "" {
			dir = os.Getenv("FRAMED_STATE")
		}
		src, err := dialLiveForce(ctx, dir)
		if err != nil {
			return err
		}
		if plan == nil {
			return fmt.Errorf("%w: a guided verification needs --forces F1,F2,... (reference forces in N)", errUsage)
		}
		g, err := guidedForce(ctx, src, verifyStdin, stderr, plan, *decreasing)
		if err != nil {
			return err
		}
		rd, zeroAfterN = g.Readings, g.ZeroAfterN
		storeIn = dir
	}
	r := *resN
	if given["fluctuation-N"] {
		r = verify.Resolution(*resN, *fluctN)
	}
	rep, err := verify.ClassifyForce(rd, r, zeroAfterN)
	if err != nil {
		return err
	}
	if *keep && storeIn == "" {
		if storeIn, err = stateDir(*state); err != nil {
			return err
		}
	}
	if storeIn != "" {
		b, _ := json.Marshal(rep)
		if err := callDaemon(ctx, storeIn, daemon.Request{Op: "verification", Calibration: b}, nil); err != nil {
			return fmt.Errorf("the report was not stored: %w", err)
		}
		fmt.Fprintln(stderr, "verification stored by framed and published on its verification topic")
	}
	if *asJSON {
		return writeJSON(stdout, rep)
	}
	return printForce(stdout, rep)
}

func readFile[T any](path string, parse func(io.Reader) ([]T, error)) ([]T, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	v, err := parse(bufio.NewReader(f))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return v, nil
}

func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

func parseForces(s string) ([]float64, error) {
	if strings.TrimSpace(s) == "" {
		return nil, nil
	}
	var out []float64
	for f := range strings.SplitSeq(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
			return nil, fmt.Errorf("%w: --forces: %q is not a positive force in N", errUsage, f)
		}
		out = append(out, v)
	}
	slices.Sort(out)
	return slices.Compact(out), nil
}

// printForce writes the readable report.
func printForce(w io.Writer, rep verify.ForceReport) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "Force verification (ISO 7500-1; class limits from memory, check them against the standard)")
	fmt.Fprintf(bw, "resolution %g N, zero after unloading %g N\n\n", rep.ResolutionN, rep.ZeroAfterN)
	fmt.Fprintf(bw, "%12s %9s %9s %9s %9s  %-5s  %s\n", "F N", "q %", "b %", "v %", "a %", "class", "series")
	for _, p := range rep.Points {
		fmt.Fprintf(bw, "%12g %9s %9s %9s %9.3f  %-5s  %s\n", p.ReferenceN,
			pct(p.QPct, true), pct(p.BPct, false), pct(p.VPct, true), p.APct, className(p.Class), strings.Join(p.Series, ","))
		for _, r := range p.Reasons {
			fmt.Fprintf(bw, "%12s   %s\n", "", r)
		}
	}
	fmt.Fprintf(bw, "\nf0 %+.3f %% (class %s)\n\nClass per range:\n", rep.F0Pct, className(rep.F0Class))
	for _, r := range rep.Ranges {
		fmt.Fprintf(bw, "  %12g N to %g N   %s\n", r.FromN, r.ToN, className(r.Class))
	}
	verdict := "pass"
	if !rep.ASTME4Pass {
		verdict = "FAIL"
	}
	fmt.Fprintf(bw, "\nASTM E4 accuracy (|q| <= 1 %%): %s\n", verdict)
	for _, c := range rep.ASTME4Checks {
		mark := "ok  "
		if !c.Pass {
			mark = "FAIL"
		}
		fmt.Fprintf(bw, "  %s %-24s %s\n", mark, c.Name, c.Detail)
	}
	for _, r := range rep.ASTME4Reasons {
		fmt.Fprintf(bw, "  - %s\n", r)
	}
	fmt.Fprintln(bw, "\nA self-check only: certified results need a verification by an accredited body.")
	return bw.Flush()
}

func printExtensometer(w io.Writer, rep verify.ExtensometerReport) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "Extensometer verification (ISO 9513; class limits from memory, check them against the standard)")
	fmt.Fprintf(bw, "resolution %g mm\n\n", rep.ResolutionMM)
	fmt.Fprintf(bw, "%12s %12s %10s %9s  %s\n", "ref mm", "read mm", "bias um", "bias %", "class")
	for _, p := range rep.Points {
		fmt.Fprintf(bw, "%12g %12g %+10.3f %9s  %s\n", p.ReferenceMM, p.IndicatedMM, p.BiasUM, pct(p.BiasPct, true), className(p.Class))
		for _, r := range p.Reasons {
			fmt.Fprintf(bw, "%12s   %s\n", "", r)
		}
	}
	fmt.Fprintf(bw, "\nClass over the verified range: %s\n", className(rep.Class))
	return bw.Flush()
}

func pct(v *float64, signed bool) string {
	switch {
	case v == nil:
		return "-"
	case signed:
		return fmt.Sprintf("%+.3f", *v)
	}
	return fmt.Sprintf("%.3f", *v)
}

func className(c verify.Class) string {
	if c == verify.NoClass {
		return "none"
	}
	return c.String()
}

// forceReader gives the force the running frame reads now, in N, after the
// daemon's calibration. The guided verification needs nothing else from
// the daemon, so tests drive it with a scripted reader.
type forceReader interface {
	Read(ctx context.Context) (forceN float64, err error)
}

// guided is what a guided verification collected.
type guided struct {
	Readings   []verify.Reading
	ZeroAfterN float64
}

// guidedForce walks the operator through an ISO 7500-1 verification: three
// preloads to the top force, three increasing series over forcesN, the
// decreasing run after series 3 (when decreasing), and the zero after
// unloading. Before each reading it asks the operator, on out, to set the
// reference force on the force-proving instrument and press Enter (a line
// on in); a line "q" stops the verification. forcesN must be ascending.
func guidedForce(ctx context.Context, src forceReader, in io.Reader, out io.Writer, forcesN []float64, decreasing bool) (guided, error) {
	if len(forcesN) == 0 {
		return guided{}, fmt.Errorf("%w: no reference forces to verify", errUsage)
	}
	lines := bufio.NewScanner(in)
	ask := func(format string, a ...any) error {
		if err := ctx.Err(); err != nil {
			return err
		}
		fmt.Fprintf(out, format+" [Enter, or q to stop] ", a...)
		if !lines.Scan() {
			if err := lines.Err(); err != nil {
				return fmt.Errorf("operator input: %w", err)
			}
			return errors.New("verification stopped: operator input ended")
		}
		if strings.EqualFold(strings.TrimSpace(lines.Text()), "q") {
			return errors.New("verification stopped by the operator")
		}
		return nil
	}
	read := func(s verify.Series, F float64) (verify.Reading, error) {
		if err := ask("series %s: set %g N on the reference instrument, hold it steady", s, F); err != nil {
			return verify.Reading{}, err
		}
		got, err := src.Read(ctx)
		if err != nil {
			return verify.Reading{}, fmt.Errorf("reading at %g N, series %s: %w", F, s, err)
		}
		fmt.Fprintf(out, "  frame reads %.6g N\n", got)
		return verify.Reading{Series: s, ReferenceN: F, IndicatedN: got}, nil
	}
	topN := forcesN[len(forcesN)-1]
	if err := ask("preload three times to %g N and unload (ISO 7500-1), then", topN); err != nil {
		return guided{}, err
	}
	var g guided
	for _, s := range []verify.Series{verify.Series1, verify.Series2, verify.Series3} {
		for _, F := range forcesN {
			r, err := read(s, F)
			if err != nil {
				return g, err
			}
			g.Readings = append(g.Readings, r)
		}
		if s == verify.Series3 && decreasing {
			for i := len(forcesN) - 1; i >= 0; i-- {
				r, err := read(verify.Decreasing, forcesN[i])
				if err != nil {
					return g, err
				}
				g.Readings = append(g.Readings, r)
			}
		}
	}
	if err := ask("remove all force"); err != nil {
		return g, err
	}
	z, err := src.Read(ctx)
	if err != nil {
		return g, fmt.Errorf("zero after unloading: %w", err)
	}
	fmt.Fprintf(out, "  frame reads %.6g N after unloading\n", z)
	g.ZeroAfterN = z
	return g, nil
}

// daemonForce reads the calibrated force from the running framed behind a
// state directory: the mean of its latest readings, through the control
// socket's "read" op.
type daemonForce struct {
	dir string
}

// liveSamples is how many recent samples the daemon averages per reading.
const liveSamples = 200

// dialLiveForce checks that a framed answers behind stateDir.
func dialLiveForce(ctx context.Context, stateDir string) (daemonForce, error) {
	if stateDir == "" {
		return daemonForce{}, fmt.Errorf("%w (no --state and FRAMED_STATE unset)", errNoDaemonForVerify)
	}
	if err := callDaemon(ctx, stateDir, daemon.Request{Op: "status"}, nil); err != nil {
		if errors.Is(err, daemon.ErrNotRunning) {
			return daemonForce{}, fmt.Errorf("%w (%v)", errNoDaemonForVerify, err)
		}
		return daemonForce{}, fmt.Errorf("framed in %s: %w", stateDir, err)
	}
	return daemonForce{dir: stateDir}, nil
}

func (d daemonForce) Read(ctx context.Context) (float64, error) {
	var r struct {
		CalibratedMean *float64 `json:"calibrated_mean"`
	}
	if err := callDaemon(ctx, d.dir, daemon.Request{Op: "read", Samples: liveSamples}, &r); err != nil {
		return 0, fmt.Errorf("framed: %w", err)
	}
	if r.CalibratedMean == nil || math.IsNaN(*r.CalibratedMean) || math.IsInf(*r.CalibratedMean, 0) {
		return 0, errors.New("framed answered without a calibrated force")
	}
	return *r.CalibratedMean, nil
}
