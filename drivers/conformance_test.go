package drivers_test

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"framed/drivers"
	"framed/drivers/conformance"
	"framed/drivers/internal/fakedriver"
)

func TestMain(m *testing.M) {
	conformance.Main(m, map[string]func() drivers.Driver{"fake": fakedriver.New})
}

// fakeSuite runs the fake driver through the harness; a fault file in a
// fresh temporary folder per check stands for the device failing.
func fakeSuite(onFault string) conformance.Suite {
	var faultFile string
	return conformance.Suite{
		Name:       "fake",
		New:        fakedriver.New,
		GoodConfig: []byte(`{"channels": 3, "samples_per_batch": 20, "batch_interval_us": 1000}`),
		BadConfigs: map[string][]byte{
			"zero channels":     []byte(`{"channels": 0}`),
			"unknown field":     []byte(`{"chanels": 3}`),
			"negative interval": []byte(`{"batch_interval_us": -5}`),
			"unknown error":     []byte(`{"error": "melted"}`),
			"trailing data":     []byte(`{} {}`),
			"wrong type":        []byte(`{"channels": "three"}`),
		},
		Setup: func(t *testing.T) []byte {
			faultFile = filepath.Join(t.TempDir(), "fault")
			c, err := json.Marshal(fakedriver.Config{
				Channels: 3, SamplesPerBatch: 20, BatchIntervalUS: 1000,
				FaultFile: faultFile, OnFault: onFault,
			})
			if err != nil {
				t.Fatal(err)
			}
			return c
		},
		InjectFault: func(t *testing.T) {
			if err := os.WriteFile(faultFile, nil, 0o600); err != nil {
				t.Fatal(err)
			}
		},
		Fault:      map[string]conformance.FaultMode{"end": conformance.FaultEnds, "reopen": conformance.FaultReopens}[onFault],
		FaultErr:   map[string]error{"end": drivers.ErrDeviceGone}[onFault],
		MinSamples: 50,
	}
}

func TestConformanceFaultEnds(t *testing.T) { conformance.Run(t, fakeSuite("end")) }

func TestConformanceFaultReopens(t *testing.T) { conformance.Run(t, fakeSuite("reopen")) }

// A fault scripted in the config (no device to poke) ends the stream too.
func TestConformanceFaultConfig(t *testing.T) {
	s := fakeSuite("end")
	s.Setup, s.InjectFault = nil, nil
	s.FaultConfig = []byte(`{"samples_per_batch": 5, "batches": 3, "error": "device_gone"}`)
	conformance.Run(t, s)
}
