package sim_test

import (
	"testing"

	"framed/drivers"
	"framed/drivers/conformance"
	"framed/drivers/sim"
)

func TestMain(m *testing.M) {
	conformance.Main(m, map[string]func() drivers.Driver{"sim": func() drivers.Driver { return sim.New() }})
}

// The shared driver contract, directly, through the gRPC shims and in a
// driver process of its own.
func TestConformance(t *testing.T) {
	conformance.Run(t, conformance.Suite{
		Name:       "sim",
		New:        func() drivers.Driver { return sim.New() },
		GoodConfig: []byte(`{"script": "demo", "rate_hz": 500, "speed": 5, "batch_ms": 10}`),
		BadConfigs: map[string][]byte{
			"negative rate":   []byte(`{"script": "demo", "rate_hz": -1}`),
			"rate too high":   []byte(`{"script": "demo", "rate_hz": 20000}`),
			"unknown field":   []byte(`{"script": "demo", "rate": 100}`),
			"no specimens":    []byte(`{}`),
			"unknown script":  []byte(`{"script": "other"}`),
			"negative moduli": []byte(`{"specimens": [{"id": "x", "shape": "round", "d0_mm": 5, "L0_mm": 25, "material": {"E_MPa": -1, "Rp02_MPa": 300, "m": 10, "neck_pct": 10, "fracture_pct": 20}, "loading": {"mode": "rate", "crosshead_mm_per_min": 2, "stiffness_N_per_mm": 1e4}}]}`),
		},
		FaultConfig: []byte(`{"script": "demo", "rate_hz": 1000, "pace": "none", "fail_after_s": 2}`),
		Fault:       conformance.FaultEnds,
		FaultErr:    drivers.ErrDeviceGone,
	})
}
