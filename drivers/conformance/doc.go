// Package conformance is the one harness every framed driver passes. A
// driver's test calls Run with a Suite; Run repeats the same checks three
// ways: on the driver directly, through the gRPC shims in-process
// (plugin.TestPluginGRPCConn), and through a real driver process (the test
// binary itself, re-run in driver mode). The API of this package (Suite,
// Run, Main, EnvServe, FaultMode) is stable; new Suite fields are only ever
// added with a zero value that keeps the old behaviour.
//
// Use it like this in a driver package:
//
//	func TestMain(m *testing.M) {
//		conformance.Main(m, map[string]func() drivers.Driver{"sim": sim.New})
//	}
//
//	func TestConformance(t *testing.T) {
//		conformance.Run(t, conformance.Suite{
//			Name:       "sim", // the key given to Main
//			New:        sim.New,
//			GoodConfig: []byte(`{"rate_hz": 500}`),
//			BadConfigs: map[string][]byte{"negative rate": []byte(`{"rate_hz": -1}`)},
//		})
//	}
//
// Checks, each a subtest: describe; stream before configure (ErrNotConfigured);
// bad configs (ErrBadConfig, also after a good config, which must survive);
// configure; stream (samples arrive, Seq counts from 0 by one, times rise
// strictly within and across batches, one column per channel of Info, a
// second Stream is refused with ErrStreaming, Health answers meanwhile, and
// after cancelling a new stream starts at once);
// health (answers without error before and after Configure; a health that
// is not OK carries a message); cancel (the channel closes promptly, and in the direct run no
// goroutine is left behind); restart (stream, cancel, stream again: Seq
// starts again at 0 and times go on rising); fault (when the suite can
// inject one: the stream ends with a Batch.Err, or reopens with a gap, as the
// suite declares); and, out of process only, plugin dead (the driver
// process is killed mid-stream: the stream ends with ErrPluginDead and so
// does the next call).
//
// Caveats: the time bounds (Suite.Timeout, a two-second close bound) are
// liveness checks, not speed targets; drivers whose device needs a pty or a
// simulator start it in Setup, which runs in the test process for every
// check so each check gets a fresh device.
package conformance
