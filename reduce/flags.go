package reduce

// Flags are short kebab-case codes in the result document's "flags" list.
// Each says why a value is missing, only apparent, or less certain than the
// channels alone suggest. They are a contract: add codes, never rename.
const (
	// FlagNoExtensometer: no extensometer readings at all; strain comes from
	// the crosshead (corrected by the machine compliance when given).
	FlagNoExtensometer = "no-extensometer"
	// FlagModulusApparent: E is from crosshead strain and only apparent;
	// the load train's stiffness is in it.
	FlagModulusApparent = "modulus-apparent"
	// FlagNoCompliance: crosshead strain was used without a machine
	// compliance calibration.
	FlagNoCompliance = "no-compliance-calibration"
	// FlagExtensometerRemoved: the extensometer stopped reading before the
	// break; later extensions come from the crosshead matched to it at the
	// removal point.
	FlagExtensometerRemoved = "extensometer-removed"
	// FlagFewElasticPoints: the elastic fit rests on fewer points than
	// Options.MinElasticPoints; E and what depends on it are uncertain.
	FlagFewElasticPoints = "few-elastic-points"
	// FlagPoorElasticFit: the best elastic window's r^2 or V1 fails the
	// limits in Options; E is reported but should not be trusted.
	FlagPoorElasticFit = "poor-elastic-fit"
	// FlagNoElasticFit: no elastic window could be fitted, or the best one
	// is no line (r^2 below 0.95: holds and creep of a dead-weight record,
	// a slipping grip); E, Rp, Ag and A from extension are not reported.
	FlagNoElasticFit = "no-elastic-fit"
	// FlagLoadCycles: the record loads and unloads before its maximum
	// (a stepped dead-weight test): E, proof strengths and yield values
	// are withheld; holds, unloads and the elastic limit carry the test.
	FlagLoadCycles = "load-unload-cycles"
	// FlagProofNotReached: the curve (or the extensometer record) ends
	// before a requested proof extension.
	FlagProofNotReached = "proof-not-reached"
	// FlagFlatMaximum: the force maximum is flat within noise; Ag comes from
	// a parabola fitted over the top and its uncertainty covers the width.
	FlagFlatMaximum = "flat-maximum"
	// FlagAFromExtension: A was computed from the extension at fracture
	// less the elastic recovery (no Lu given).
	FlagAFromExtension = "a-from-extension"
	// FlagBreakFromCurve: the detector gave no break event; the fracture
	// point was found by reduce from the force record.
	FlagBreakFromCurve = "break-from-curve"
	// FlagNoBreak: no fracture was found (the force never fell); At and A
	// are taken at the last sample.
	FlagNoBreak = "no-break"
	// FlagHardeningRangeShort: the n/K range had too few points or was cut
	// short by Ag; n and K are over the range actually used.
	FlagHardeningRangeShort = "hardening-range-short"
	// FlagDiscontinuousYield: a yield point was found; n and K exclude the
	// Lueders range.
	FlagDiscontinuousYield = "discontinuous-yield"
)
