// Package detect recognises, from the force and displacement readings of a
// tension test, what the operator and the specimen do: the test starts, a
// load step settles into a hold, the specimen is unloaded and keeps a
// permanent set, the specimen breaks, the test ends.
//
// The Detector is a state machine fed one sample batch at a time (Step). It
// keeps bounded memory (fixed-size buffers allocated in New), uses no
// clocks and no goroutines, and looks ahead by exactly one sample: a
// three-point median removes single-sample spikes, so the decision about a
// sample is taken when the next one arrives (LookaheadSamples). Detection
// of a settled hold by nature lags the moment of settling by up to
// 1.25 SettleMinS. A start is dated back to where the force began rising,
// at most PreTriggerS before the trigger sample; the daemon keeps at least
// that much history so that the stored test begins there.
//
// The same detector runs offline over a recorded curve (Offline), so
// `framectl reduce` reports the holds, unloads and elastic limit the daemon
// would have published.
//
// Caveats: the noise floor of the force channel is estimated from the idle
// samples before the start unless Config.NoiseFloorN is given; a test that
// starts with no idle period gets a rough estimate. A fast fall of force is
// taken for an unloading rather than a break when the displacement channel
// shows elastic recovery at the same time; an extensometer that reads a
// falling extension as the specimen breaks would hide that break until the
// unloaded force has rested EndHoldS (the test then ends as an unload).
package detect
