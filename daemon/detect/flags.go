package detect

// Flags the detector adds to the result document (kebab-case codes).
const (
	// FlagForceNotTared: the idle force reading was well off zero.
	FlagForceNotTared = "force-not-tared"
	// FlagSetUnknown: an unload had no extension or crosshead reading to
	// measure the permanent set with.
	FlagSetUnknown = "set-unknown"
	// FlagHoldExtensionUnknown: a hold settled with no extension reading.
	FlagHoldExtensionUnknown = "hold-extension-unknown"
	// FlagDetectBadConfig: Offline was given a config New refused, or a
	// curve with no positive force to size the range from.
	FlagDetectBadConfig = "detect-bad-config"
)
