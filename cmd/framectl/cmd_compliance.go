package main

import (
	"context"
	"flag"
	"fmt"
	"io"

	"framed/reduce"
)

func init() {
	register(&command{name: "compliance", summary: "measure the load train's compliance from a curve file (rigid specimen or a bar of known modulus)", run: runCompliance})
}

// runCompliance works out the machine compliance for frames without an
// extensometer: the crosshead's travel per newton that is not the
// specimen's. The figure goes into framed's config as compliance_mm_per_N,
// where every reduction takes it off the crosshead extension.
func runCompliance(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("compliance", flag.ContinueOnError)
	fs.SetOutput(stderr)
	rigid := fs.Bool("rigid", false, "the test was on a rigid block: all crosshead travel is the machine's")
	eGPa := fs.Float64("E", 0, "modulus of the reference bar, GPa (with --S0 and --L)")
	s0 := fs.Float64("S0", 0, "cross-section of the reference bar, mm2")
	l := fs.Float64("L", 0, "free length of the reference bar between the grips, mm")
	pos, err := parseInterleaved(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return fmt.Errorf("%w: want one curve file (time_s,force_N,extension_mm,crosshead_mm)", errUsage)
	}
	bar := *eGPa > 0 || *s0 > 0 || *l > 0
	if *rigid == bar {
		return fmt.Errorf("%w: give either --rigid, or --E, --S0 and --L of a reference bar", errUsage)
	}
	if bar && !(*eGPa > 0 && *s0 > 0 && *l > 0) {
		return fmt.Errorf("%w: a reference bar needs --E GPa, --S0 mm2 and --L mm, all positive", errUsage)
	}
	c, err := readCurveFile(pos[0])
	if err != nil {
		return err
	}
	var cMMPerN float64
	if *rigid {
		cMMPerN, err = reduce.ComplianceRigid(c)
	} else {
		cMMPerN, err = reduce.ComplianceKnownBar(c, *eGPa*1000, *s0, *l)
	}
	if err != nil {
		return fmt.Errorf("%s: %w", pos[0], err)
	}
	fmt.Fprintf(stdout, "load train compliance %.6g mm/N (stiffness %.4g kN/mm)\n", cMMPerN, 1/cMMPerN/1000)
	fmt.Fprintf(stdout, "put \"compliance_mm_per_N\": %.6g in framed's config; results from crosshead extension are then corrected (and still flagged: E is only apparent)\n", cMMPerN)
	return nil
}
