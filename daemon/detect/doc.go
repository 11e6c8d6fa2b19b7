// Package detect recognises, from the force and displacement readings of a
// tension test, what the operator and the specimen do: the test starts, a
// load step settles into a hold, the specimen is unloaded and keeps a
// permanent set, the specimen breaks, the test ends.
//
// The Detector is a state machine (Idle, Running, Ended) fed one sample
// batch at a time (Step). It keeps bounded memory (fixed buffers allocated
// in New), uses no clocks and no goroutines, allocates only when something
// happens, and looks ahead by exactly one sample: a three-point median
// removes single-sample spikes, so the decision about a sample is taken
// when the next one arrives (LookaheadSamples).
//
//   - Start: the force stands StartFraction of the range (or StartNoiseK
//     noise floors, if more) above the idle baseline for StartSustainS. The
//     start is dated back to the last reading still at rest, at most
//     PreTriggerS before the newest sample; the daemon keeps that much
//     history. An idle reading well off zero is flagged force-not-tared.
//   - Hold: over SettleMinS, in two windows in a row, the force scatters
//     by no more than SettleNoiseK noise floors (widened for the chance
//     scatter of few readings) and stops drifting (a drift up to the hold
//     band is relaxation, allowed only when the crosshead is read and
//     stands still; without a crosshead the hold must also follow a quick
//     load step, its extension slowed well below the step's pace). Found
//     at most 1.5 SettleMinS after settling, reported once, then followed
//     until the force leaves the hold band; its creep and relaxation
//     rates are line fits over the hold.
//   - Unload: a settled reading back at the baseline (plus HangerN) after
//     a load; the set is the extension (else crosshead) against its reading
//     at rest before the start. The elastic limit is bracketed between the
//     highest load whose unload left no set and the first that did.
//   - Break: a fall of BreakDropFraction of the peak within BreakWindowS
//     that is final (the force down to nothing, or the extensometer off and
//     the crosshead not springing back) and without elastic recovery of the
//     displacement (which marks an operator unloading). Proved by the sample
//     after the first fallen one. The test then ends; it also ends when the
//     force has rested unloaded for EndHoldS after a deliberate unload.
//
// Forces in the results are readings on the channel's own scale, not
// corrected by the idle baseline.
//
// The same detector runs offline over a recorded curve (Offline), so
// `framectl reduce` reports the holds, unloads and elastic limit the daemon
// would have published. The package detectgen generates curves with known
// truth for tests and benchmarks.
//
// Caveats. The force noise floor is learnt from the idle readings unless
// Config.NoiseFloorN is given; a recording with little or no idle period
// gets a rough, widened estimate, which makes the settle test lenient. A
// swing sampled fewer than about four times a period cannot be told from
// a fall: a slow board on a fast-bouncing weight may see a false break when
// the swing carries the specimen past its elastic limit between readings.
// A break read by an extensometer that springs back with the broken halves
// looks like an unload until the force has rested EndHoldS (the test then
// ends as an unload). Without a crosshead or extension reading, a flat
// top of a continuous test reached by a quick rise (a serration, a yield
// drop) could pass for a hold.
package detect
