package verify

// ForceLimit holds the maximum permissible values, in percent, of one
// ISO 7500-1 class of force measuring system. Q, V and F0 are limits on the
// magnitude (the standard writes them with ±); B and A are limits on
// non-negative values.
type ForceLimit struct {
	Class Class
	// QPct: relative accuracy error q.
	QPct float64
	// BPct: relative repeatability error b.
	BPct float64
	// VPct: relative reversibility error v.
	VPct float64
	// F0Pct: relative zero error f0.
	F0Pct float64
	// APct: relative resolution a.
	APct float64
}

// ForceLimits is the ISO 7500-1:2018 table of maximum permissible values,
// best class first.
//
// FROM MEMORY: these values were not read at source here. Check them
// against ISO 7500-1 Table 2 before relying on a class.
var ForceLimits = [...]ForceLimit{
	{Class: Class05, QPct: 0.5, BPct: 0.5, VPct: 0.75, F0Pct: 0.05, APct: 0.25},
	{Class: Class1, QPct: 1.0, BPct: 1.0, VPct: 1.5, F0Pct: 0.1, APct: 0.5},
	{Class: Class2, QPct: 2.0, BPct: 2.0, VPct: 3.0, F0Pct: 0.2, APct: 1.0},
	{Class: Class3, QPct: 3.0, BPct: 3.0, VPct: 4.5, F0Pct: 0.3, APct: 1.5},
}

// ExtensometerLimit holds one ISO 9513 class: each limit is the larger of
// a percentage of the reading and an absolute value in micrometres.
type ExtensometerLimit struct {
	Class Class
	// ResolutionPct and ResolutionUM bound the resolution.
	ResolutionPct float64
	ResolutionUM  float64
	// BiasPct and BiasUM bound the magnitude of the bias (indicated minus
	// reference).
	BiasPct float64
	BiasUM  float64
}

// ExtensometerLimits is the ISO 9513:2012 class table, best class first.
//
// FROM MEMORY: these values were not read at source here. Check them
// against ISO 9513 Table 2 before relying on a class.
var ExtensometerLimits = [...]ExtensometerLimit{
	{Class: Class02, ResolutionPct: 0.1, ResolutionUM: 0.2, BiasPct: 0.2, BiasUM: 0.6},
	{Class: Class05, ResolutionPct: 0.25, ResolutionUM: 0.5, BiasPct: 0.5, BiasUM: 1.5},
	{Class: Class1, ResolutionPct: 0.5, ResolutionUM: 1, BiasPct: 1, BiasUM: 3},
	{Class: Class2, ResolutionPct: 1, ResolutionUM: 2, BiasPct: 2, BiasUM: 6},
}
