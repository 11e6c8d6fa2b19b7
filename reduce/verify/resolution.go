package verify

// Resolution is the resolution r to use in ClassifyForce for an indicator
// that steps in incrementN. When the reading of the unloaded frame
// fluctuates over more than one increment (a noisy bridge amplifier), the
// resolution is half the range of that fluctuation plus one increment
// (ISO 7500-1 clause on resolution, FROM MEMORY). fluctuationN is the
// range (highest minus lowest reading) seen with no force applied.
func Resolution(incrementN, fluctuationN float64) float64 {
	if fluctuationN > incrementN {
		return fluctuationN/2 + incrementN
	}
	return incrementN
}
