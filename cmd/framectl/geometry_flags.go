package main

import (
	"flag"
	"fmt"
	"math"
	"strconv"
	"strings"

	"framed/reduce"
)

// geometryFlags are the specimen and channel flags shared by `reduce` and
// `plot`: the geometry of the project's curve-file contract (--shape round
// --d0, --shape rect --a0 --b0, or --S0; --L0, --Le, --Lu, --Su) plus tube
// and wire shapes and the channel qualities the uncertainty needs.
type geometryFlags struct {
	shape                    string
	d0, a0, b0, outerD0, s0  float64
	massG, totalLMM, density float64
	l0, le, lu, su, du       float64
	au, bu                   float64
	id, material             string

	forceClassPct, extClassPct, dimUMM, complianceMMPerN float64
	forceUPct, extUPct                                   float64
	proof, total, nk                                     string
}

func addGeometryFlags(fs *flag.FlagSet) *geometryFlags {
	g := &geometryFlags{}
	fs.StringVar(&g.shape, "shape", "", "cross-section: round, rect, tube or wire (or give --S0)")
	fs.Float64Var(&g.d0, "d0", 0, "round: original diameter d0, mm")
	fs.Float64Var(&g.a0, "a0", 0, "rect: thickness a0, mm; tube: wall thickness a0, mm")
	fs.Float64Var(&g.b0, "b0", 0, "rect: width b0, mm")
	fs.Float64Var(&g.outerD0, "D0", 0, "tube: outer diameter D0, mm")
	fs.Float64Var(&g.massG, "mass-g", 0, "wire: mass of the length Lt, g")
	fs.Float64Var(&g.totalLMM, "Lt", 0, "wire: length weighed, mm")
	fs.Float64Var(&g.density, "density", 0, "wire: density, g/cm3")
	fs.Float64Var(&g.s0, "S0", 0, "original cross-section S0, mm2 (overrides the shape)")
	fs.Float64Var(&g.l0, "L0", 0, "original gauge length L0, mm")
	fs.Float64Var(&g.le, "Le", 0, "extensometer gauge length Le, mm (default L0)")
	fs.Float64Var(&g.lu, "Lu", 0, "final gauge length of the fitted-together pieces Lu, mm")
	fs.Float64Var(&g.su, "Su", 0, "smallest cross-section after fracture Su, mm2")
	fs.Float64Var(&g.du, "du", 0, "round: smallest diameter after fracture du, mm")
	fs.Float64Var(&g.au, "au", 0, "flat: smallest thickness after fracture au, mm")
	fs.Float64Var(&g.bu, "bu", 0, "flat: smallest width after fracture bu, mm")
	fs.StringVar(&g.id, "specimen", "", "specimen id for the result document")
	fs.StringVar(&g.material, "material", "", "material name for the result document")
	fs.Float64Var(&g.forceClassPct, "force-class", 0, "force channel class per ISO 7500-1, % (default 1)")
	fs.Float64Var(&g.extClassPct, "ext-class", 0, "extensometer class per ISO 9513, % (default 1)")
	fs.Float64Var(&g.forceUPct, "force-u", 0, "force channel relative standard uncertainty from its calibration, % (replaces the class)")
	fs.Float64Var(&g.extUPct, "ext-u", 0, "extensometer relative standard uncertainty from its calibration, % (replaces the class)")
	fs.Float64Var(&g.dimUMM, "dim-u", 0, "standard uncertainty of each measured dimension, mm (default 0.005)")
	fs.Float64Var(&g.complianceMMPerN, "compliance", 0, "machine compliance for crosshead strain, mm/N (from a stored calibration)")
	fs.StringVar(&g.proof, "proof", "", "plastic extensions for Rp, % of Le, comma-separated (default 0.2,1)")
	fs.StringVar(&g.total, "total", "", "total extensions for Rt, % of Le, comma-separated (default 0.5)")
	fs.StringVar(&g.nk, "nk-range", "", "engineering strain range for n and K, FROM-TO in % (default 10-20)")
	return g
}

// specimen checks the flags and builds the specimen; mistakes wrap errUsage.
func (g *geometryFlags) specimen() (reduce.Specimen, error) {
	sp := reduce.Specimen{
		ID: g.id, Material: g.material, Shape: reduce.Shape(g.shape),
		D0MM: g.d0, A0MM: g.a0, B0MM: g.b0, OuterD0MM: g.outerD0, S0MM2: g.s0,
		MassG: g.massG, TotalLengthMM: g.totalLMM, DensityGPerCM3: g.density,
		L0MM: g.l0, LeMM: g.le, LuMM: g.lu, SuMM2: g.su, DuMM: g.du, AuMM: g.au, BuMM: g.bu,
	}
	if g.s0 == 0 && g.shape == "" {
		return sp, fmt.Errorf("%w: give the cross-section: --shape round --d0 MM, --shape rect --a0 MM --b0 MM, --shape tube --a0 MM --D0 MM, --shape wire --mass-g G --Lt MM --density G_PER_CM3, or --S0 MM2", errUsage)
	}
	if _, err := sp.CrossSectionMM2(); err != nil {
		return sp, fmt.Errorf("%w: %w", errUsage, err)
	}
	if !(g.l0 > 0) && !(g.le > 0) {
		return sp, fmt.Errorf("%w: give the gauge length --L0 MM (and --Le MM when the extensometer's differs)", errUsage)
	}
	for name, v := range map[string]float64{"L0": g.l0, "Le": g.le, "Lu": g.lu, "Su": g.su, "du": g.du, "au": g.au, "bu": g.bu} {
		if v < 0 {
			return sp, fmt.Errorf("%w: --%s %v must not be negative", errUsage, name, v)
		}
	}
	return sp, nil
}

// options builds the reduction options; mistakes wrap errUsage.
func (g *geometryFlags) options() (reduce.Options, error) {
	opt := reduce.Options{
		ForceClassPct:        g.forceClassPct,
		ExtensometerClassPct: g.extClassPct,
		DimensionUMM:         g.dimUMM,
		ComplianceMMPerN:     g.complianceMMPerN,
		ForceRelUPct:         g.forceUPct,
		ExtensometerRelUPct:  g.extUPct,
	}
	var err error
	if opt.ProofPct, err = pctList("proof", g.proof); err != nil {
		return opt, err
	}
	if opt.TotalPct, err = pctList("total", g.total); err != nil {
		return opt, err
	}
	if g.nk != "" {
		from, to, ok := strings.Cut(g.nk, "-")
		f, err1 := strconv.ParseFloat(strings.TrimSpace(from), 64)
		t, err2 := strconv.ParseFloat(strings.TrimSpace(to), 64)
		if !ok || err1 != nil || err2 != nil || !(t > f) || f < 0 {
			return opt, fmt.Errorf("%w: --nk-range %q: want FROM-TO in %%, e.g. 10-20", errUsage, g.nk)
		}
		opt.HardeningFromPct, opt.HardeningToPct = f, t
	}
	return opt, nil
}

func pctList(name, s string) ([]float64, error) {
	if s == "" {
		return nil, nil
	}
	var out []float64
	for _, f := range strings.Split(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || !(v > 0) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%w: --%s %q: want positive percentages, comma-separated", errUsage, name, s)
		}
		out = append(out, v)
	}
	return out, nil
}

// parseInterleaved parses flags that may come before or after positional
// arguments (`framectl reduce FILE --shape rect ...`), returning the
// positionals in order. The standard flag package stops at the first
// positional, so parsing resumes after each one; "--" ends flags.
func parseInterleaved(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			return nil, fmt.Errorf("%w: %w", errUsage, err)
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, nil
		}
		// fs.Parse consumed a "--" when rest follows it: keep everything.
		if len(args) > len(rest) && args[len(args)-len(rest)-1] == "--" {
			return append(pos, rest...), nil
		}
		pos = append(pos, rest[0])
		args = rest[1:]
		if strings.HasPrefix(rest[0], "-") && rest[0] != "-" {
			return nil, fmt.Errorf("%w: unexpected %q", errUsage, rest[0])
		}
	}
}
