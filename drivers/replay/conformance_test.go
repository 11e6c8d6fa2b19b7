package replay_test

import (
	"fmt"
	"path/filepath"
	"testing"

	"framed/drivers"
	"framed/drivers/conformance"
	"framed/drivers/replay"
)

func TestMain(m *testing.M) {
	conformance.Main(m, map[string]func() drivers.Driver{"replay": func() drivers.Driver { return replay.New() }})
}

func curvePath(t *testing.T, name string) string {
	t.Helper()
	p, err := filepath.Abs(filepath.Join("testdata", "curves", name))
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// The shared driver contract, directly, through the gRPC shims and in a
// driver process of its own.
func TestConformance(t *testing.T) {
	s355 := curvePath(t, "s355-zd2-every10th.csv")
	conformance.Run(t, conformance.Suite{
		Name:       "replay",
		New:        func() drivers.Driver { return replay.New() },
		GoodConfig: fmt.Appendf(nil, `{"path": %q, "speed": 100, "loop": true, "batch_ms": 10}`, s355),
		BadConfigs: map[string][]byte{
			"missing file":  fmt.Appendf(nil, `{"path": %q}`, curvePath(t, "no-such.csv")),
			"garbled file":  fmt.Appendf(nil, `{"path": %q}`, curvePath(t, "garbled.csv")),
			"unknown field": fmt.Appendf(nil, `{"path": %q, "sped": 2}`, s355),
			"zero-ish rate": fmt.Appendf(nil, `{"path": %q, "rate_hz": 0.5}`, s355),
		},
		FaultConfig: fmt.Appendf(nil, `{"path": %q, "pace": "none", "loop": true, "fail_after_s": 3000}`, s355),
		Fault:       conformance.FaultEnds,
		FaultErr:    drivers.ErrDeviceGone,
	})
}
