package conformance_test

import (
	"context"
	"os"
	"os/exec"
	"strings"
	"testing"
	"time"

	"framed/drivers"
	"framed/drivers/conformance"
	"framed/drivers/internal/fakedriver"
)

// envBroken selects the broken driver TestBrokenDriver runs the harness on.
const envBroken = "FRAMED_CONFORMANCE_BROKEN"

// broken wraps the fake driver and breaks one rule of the contract.
type broken struct {
	drivers.Driver
	flaw string
}

func (b *broken) Configure(ctx context.Context, config []byte) (drivers.Info, error) {
	info, err := b.Driver.Configure(ctx, config)
	if err != nil && b.flaw == "accepts_bad_config" {
		return drivers.Info{Driver: "fake", Channels: info.Channels}, nil
	}
	return info, err
}

func (b *broken) Stream(ctx context.Context) (<-chan drivers.Batch, error) {
	in, err := b.Driver.Stream(ctx)
	if err != nil {
		return nil, err
	}
	out := make(chan drivers.Batch)
	go func() {
		if b.flaw != "never_closes" {
			defer close(out)
		}
		for batch := range in {
			switch b.flaw {
			case "seq_skips":
				batch.Seq *= 2
			case "time_stands_still":
				for i := range batch.TimeNS {
					batch.TimeNS[i] = 1
				}
			case "extra_column":
				batch.Values = append(batch.Values, make([]float64, len(batch.TimeNS)))
			case "hides_error":
				if batch.Err != nil {
					return
				}
			}
			select {
			case out <- batch:
			case <-ctx.Done():
			}
		}
		if b.flaw == "leaks_goroutine" {
			go func() { select {} }()
		}
	}()
	return out, nil
}

// The harness run on a broken driver, only when a parent test asks for it.
func TestBrokenDriver(t *testing.T) {
	flaw := os.Getenv(envBroken)
	if flaw == "" {
		t.Skip("run by TestHarnessCatchesBrokenDrivers")
	}
	conformance.Run(t, conformance.Suite{
		Name:         "fake",
		New:          func() drivers.Driver { return &broken{Driver: fakedriver.New(), flaw: flaw} },
		GoodConfig:   []byte(`{"channels": 2, "samples_per_batch": 5, "batch_interval_us": 500}`),
		BadConfigs:   map[string][]byte{"zero channels": []byte(`{"channels": 0}`)},
		FaultConfig:  []byte(`{"samples_per_batch": 5, "batches": 3, "error": "device_gone"}`),
		FaultErr:     drivers.ErrDeviceGone,
		NoSubprocess: "broken drivers run in process only",
		Timeout:      2 * time.Second,
	})
}

// The harness must fail each broken driver, with a message that names the
// broken rule. A harness that passed them would pass anything.
func TestHarnessCatchesBrokenDrivers(t *testing.T) {
	if os.Getenv(envBroken) != "" {
		t.Skip("inside a broken-driver run")
	}
	exe, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	for flaw, want := range map[string]string{
		"accepts_bad_config": "want an error wrapping ErrBadConfig",
		"seq_skips":          "batch Seq 2, want 1",
		"time_stands_still":  "does not rise",
		"extra_column":       "3 columns, Info has 2 channels",
		"hides_error":        "without a batch carrying Err",
		"never_closes":       "still open",
		"leaks_goroutine":    "goroutines before the stream",
	} {
		t.Run(flaw, func(t *testing.T) {
			t.Parallel()
			cmd := exec.Command(exe, "-test.run=^TestBrokenDriver$", "-test.v", "-test.failfast")
			cmd.Env = append(os.Environ(), envBroken+"="+flaw)
			out, err := cmd.CombinedOutput()
			if err == nil {
				t.Fatalf("harness passed a driver that %s:\n%s", flaw, tail(out))
			}
			if !strings.Contains(string(out), want) {
				t.Errorf("harness failed, but without %q:\n%s", want, tail(out))
			}
		})
	}
}

func tail(out []byte) string {
	const n = 3000
	if len(out) > n {
		out = out[len(out)-n:]
	}
	return string(out)
}
