package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"time"

	"framed/drivers/lineserial"
	"framed/drivers/lineserial/boardsim"
	"framed/drivers/modbusrtu"
	"framed/drivers/modbusrtu/rtusim"
)

func init() {
	register(&command{
		name:    "simboard",
		summary: "play a bridge board (lineserial) or a Modbus weighing indicator (modbusrtu) on a pty, to try framed without hardware",
		run:     runSimboard,
	})
}

// simboardStdin is where the simulator reads the technician's load
// commands; tests replace it.
var simboardStdin io.Reader = os.Stdin

const simboardUsage = "simboard lineserial|modbusrtu [flags] (framectl simboard lineserial -h for the flags)"

func runSimboard(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 {
		return fmt.Errorf("%w: %s", errUsage, simboardUsage)
	}
	switch args[0] {
	case "lineserial":
		return simLineBoard(ctx, args[1:], stdout, stderr)
	case "modbusrtu":
		return simIndicator(ctx, args[1:], stdout, stderr)
	}
	return fmt.Errorf("%w: unknown board %q: %s", errUsage, args[0], simboardUsage)
}

// loadFlags are the flags both simulators share: where the pty appears
// and how the hung load is changed.
type loadFlags struct {
	link   *string
	script *string
	g      *float64
	seed   *uint64
}

func addLoadFlags(fs *flag.FlagSet) loadFlags {
	return loadFlags{
		link:   fs.String("link", "/tmp/framed-board", "symlink to create to the pty: the port to give the driver"),
		script: fs.String("script", "", `load script instead of typed loads, e.g. "0:5s,10:5s,122.6N:2s" (kg unless N); the simulator stops at its end`),
		g:      fs.Float64("g", boardsim.StandardGravity, "gravity in m/s2 turning hung masses into forces"),
		seed:   fs.Uint64("seed", 1, "noise seed (the same seed gives the same noise)"),
	}
}

// steps parses --script (nil without one) and checks --g.
func (lf loadFlags) steps() ([]boardsim.Step, error) {
	if g := *lf.g; math.IsNaN(g) || g < 9.7 || g > 9.9 {
		return nil, fmt.Errorf("%w: --g %v m/s2 is not a value found on Earth's surface", errUsage, g)
	}
	if *lf.script == "" {
		return nil, nil
	}
	s, err := boardsim.ParseScript(*lf.script, *lf.g)
	if err != nil {
		return nil, fmt.Errorf("%w: --script: %w", errUsage, err)
	}
	return s, nil
}

// driverEntry prints the daemon's driver entry for kind: its sample
// configuration with the port (and the keys in set) changed, checked by
// the driver's own parser first.
func driverEntry(w io.Writer, kind string, sample []byte, parse func([]byte) error, set map[string]any) error {
	var m map[string]any
	if err := json.Unmarshal(sample, &m); err != nil {
		return fmt.Errorf("sample config of %s: %w", kind, err)
	}
	for k, v := range set {
		m[k] = v
	}
	cfg, err := json.Marshal(m)
	if err != nil {
		return err
	}
	if err := parse(cfg); err != nil {
		return fmt.Errorf("the %s config for this simulator is refused: %w", kind, err)
	}
	entry := struct {
		Name   string          `json:"name"`
		Kind   string          `json:"kind"`
		Config json.RawMessage `json:"config"`
	}{"board", kind, cfg}
	b, err := json.MarshalIndent(entry, "", "  ")
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "Driver entry for framed's config (\"drivers\": [...]):\n%s\n", b)
	return nil
}

// driveLoad changes load until the simulator should stop: to the end of
// the script, or until the technician types q. It returns nil for a
// normal end; at the end of stdin without a q the loads stay as they are
// until ctx is done (the simulator run in the background).
func driveLoad(ctx context.Context, load *boardsim.Load, steps []boardsim.Step, g float64, stdout io.Writer) error {
	if steps != nil {
		err := load.Play(ctx, steps)
		if ctx.Err() != nil {
			return nil
		}
		fmt.Fprintln(stdout, "script done")
		return err
	}
	fmt.Fprintln(stdout, "Type a mass in kg (12.5) or a force (122.6N) and Enter to hang it; 0 unloads, q quits.")
	done := make(chan error, 1)
	go func() { done <- load.Control(simboardStdin, stdout, g) }()
	select {
	case <-ctx.Done():
		return nil
	case err := <-done:
		if errors.Is(err, io.EOF) {
			fmt.Fprintln(stdout, "no more load commands: the load stays; Ctrl-C stops")
			<-ctx.Done()
			return nil
		}
		return err
	}
}

// serveUntil runs serve and drive together: it stops serve when drive
// returns and returns the first error of either.
func serveUntil(ctx context.Context, serve func(context.Context) error, drive func(context.Context) error) error {
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	served := make(chan error, 1)
	go func() { served <- serve(ctx) }()
	err := drive(ctx)
	cancel()
	if e := <-served; err == nil {
		err = e
	}
	return err
}

func simLineBoard(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("simboard lineserial", flag.ContinueOnError)
	fs.SetOutput(stderr)
	lf := addLoadFlags(fs)
	d := boardsim.DefaultCell
	rateHz := fs.Float64("rate-hz", 100, "lines per second")
	countsPerN := fs.Float64("counts-per-N", d.CountsPerN, "bridge gain, ADC counts per newton")
	offset := fs.Float64("offset-counts", d.OffsetCounts, "reading with nothing hung, counts")
	noise := fs.Float64("noise-counts", d.NoiseCounts, "noise standard deviation, counts")
	nonlin := fs.Float64("nonlinearity-pct", d.NonlinearityPct, "departure from a straight line at full scale, % of reading (quadratic)")
	fullScale := fs.Float64("full-scale-N", d.FullScaleN, "the cell's rated force, N")
	crosshead := fs.Int64("crosshead-counts", 4000, "constant crosshead encoder reading (the sample config reads 0.0025 mm/count)")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("%w: unexpected %q", errUsage, fs.Args())
	}
	steps, err := lf.steps()
	if err != nil {
		return err
	}
	if math.IsNaN(*rateHz) || *rateHz <= 0 || *rateHz > 5000 {
		return fmt.Errorf("%w: --rate-hz %v: want 0 < rate <= 5000", errUsage, *rateHz)
	}
	cell := boardsim.LoadCell{OffsetCounts: *offset, CountsPerN: *countsPerN, NonlinearityPct: *nonlin, FullScaleN: *fullScale, NoiseCounts: *noise}
	var load boardsim.Load
	board, err := boardsim.NewBoard(cell, &load, *lf.seed)
	if err != nil {
		return fmt.Errorf("%w: %w", errUsage, err)
	}
	board.CrossheadCounts = *crosshead
	link, err := boardsim.OpenLink(*lf.link)
	if err != nil {
		return err
	}
	defer link.Close()
	fmt.Fprintf(stdout, "Simulated bridge board on %s (-> %s), %g lines/s, %g counts/N, offset %g counts.\n",
		link.Path(), link.SlaveName(), *rateHz, cell.CountsPerN, cell.OffsetCounts)
	err = driverEntry(stdout, lineserial.DriverName, lineserial.SampleConfig, func(b []byte) error {
		_, err := lineserial.ParseConfig(b)
		return err
	}, map[string]any{"port": link.Path(), "sample_rate_hz": *rateHz})
	if err != nil {
		return err
	}
	return serveUntil(ctx,
		func(ctx context.Context) error { return board.Run(ctx, link, *rateHz) },
		func(ctx context.Context) error { return driveLoad(ctx, &load, steps, *lf.g, stdout) })
}

// indicator is the simulated weighing indicator's display model.
type indicator struct {
	zeroN      float64
	gainErrPct float64
	noiseN     float64
	mmPerN     float64
	rng        *rand.Rand
}

// Register layout of modbusrtu's sample configuration.
const (
	indicatorForceAddr = 0   // holding, int32 in 0.1 N, high word first
	indicatorDispAddr  = 10  // input, float32 mm, low word first
	indicatorStepN     = 0.1 // one count of the force register
	indicatorUpdate    = 5 * time.Millisecond
)

// update writes the registers for forceN.
func (ind *indicator) update(s *rtusim.Slave, forceN float64) {
	shown := forceN*(1+ind.gainErrPct/100) + ind.zeroN
	if ind.noiseN > 0 {
		shown += ind.noiseN * ind.rng.NormFloat64()
	}
	counts := math.Max(math.MinInt32, math.Min(math.MaxInt32, math.Round(shown/indicatorStepN)))
	regs := make([]uint16, 2)
	modbusrtu.EncodeValue(regs, counts, modbusrtu.Int32, modbusrtu.HighWordFirst)
	s.SetHolding(indicatorForceAddr, regs...)
	modbusrtu.EncodeValue(regs, forceN*ind.mmPerN, modbusrtu.Float32, modbusrtu.LowWordFirst)
	s.SetInput(indicatorDispAddr, regs...)
}

func simIndicator(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("simboard modbusrtu", flag.ContinueOnError)
	fs.SetOutput(stderr)
	lf := addLoadFlags(fs)
	slaveID := fs.Int("slave", 1, "Modbus slave address, 1..247")
	zeroN := fs.Float64("zero-N", 0, "what the indicator shows with nothing hung, N")
	gainErr := fs.Float64("gain-error-pct", 0, "the indicator's gain error, % of reading")
	noiseN := fs.Float64("noise-N", 0, "noise standard deviation, N")
	mmPerN := fs.Float64("mm-per-N", 2e-4, "displacement register per newton (frame compliance), mm/N")
	if err := fs.Parse(args); err != nil {
		return fmt.Errorf("%w: %v", errUsage, err)
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("%w: unexpected %q", errUsage, fs.Args())
	}
	steps, err := lf.steps()
	if err != nil {
		return err
	}
	for _, v := range []float64{*zeroN, *gainErr, *noiseN, *mmPerN} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: indicator parameters must be finite", errUsage)
		}
	}
	if *noiseN < 0 {
		return fmt.Errorf("%w: --noise-N %v must not be negative", errUsage, *noiseN)
	}
	slave, err := rtusim.NewSlave(*slaveID)
	if err != nil {
		return fmt.Errorf("%w: --slave: %w", errUsage, err)
	}
	ind := &indicator{zeroN: *zeroN, gainErrPct: *gainErr, noiseN: *noiseN, mmPerN: *mmPerN, rng: rand.New(rand.NewPCG(*lf.seed, 1))}
	var load boardsim.Load
	ind.update(slave, 0)
	link, err := boardsim.OpenLink(*lf.link)
	if err != nil {
		return err
	}
	defer link.Close()
	fmt.Fprintf(stdout, "Simulated weighing indicator, Modbus RTU slave %d, on %s (-> %s): force int32 in 0.1 N in holding registers 0-1, displacement float32 mm in input registers 10-11.\n",
		*slaveID, link.Path(), link.SlaveName())
	err = driverEntry(stdout, modbusrtu.DriverName, modbusrtu.SampleConfig, func(b []byte) error {
		_, err := modbusrtu.ParseConfig(b)
		return err
	}, map[string]any{"port": link.Path(), "slave_id": *slaveID})
	if err != nil {
		return err
	}
	serve := func(ctx context.Context) error {
		go func() {
			t := time.NewTicker(indicatorUpdate)
			defer t.Stop()
			for {
				select {
				case <-ctx.Done():
					return
				case <-t.C:
					ind.update(slave, load.ForceN())
				}
			}
		}()
		if err := slave.Serve(ctx, func() rtusim.Conn { return link }); ctx.Err() == nil {
			return err
		}
		return nil
	}
	return serveUntil(ctx, serve,
		func(ctx context.Context) error { return driveLoad(ctx, &load, steps, *lf.g, stdout) })
}
