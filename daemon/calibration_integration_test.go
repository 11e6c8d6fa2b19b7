package daemon_test

import (
	"os"

	"context"
	"encoding/json"
	"fmt"
	"math"
	"testing"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/daemon"
	"framed/daemon/calib"
	"framed/daemon/publish/brokertest"
)

// Tare through the control socket on an unloaded frame: by definition the
// quiet readings it averaged then read zero, so the calibrated mean of the
// next readings sits within the noise of zero. A stored span is named by
// the next result document.
func TestTareAndSpanThroughControlIntegration(t *testing.T) {
	specs := e2eSpecimens(t)[:1]
	addr := fmt.Sprintf("127.0.0.1:%d", brokertest.FreePort(t))
	cfg := daemon.Config{
		Frame: "e2e", StateDir: t.TempDir(), Broker: "embedded:" + addr,
		Drivers: []daemon.DriverConfig{{Name: "sim", Kind: "sim", Config: simConfig(t, specs, true)}},
	}
	next, restart := specimenOrder(specs, true)
	_, socket := runDaemon(t, cfg, daemon.Options{SpecimenFallback: next, OnDriverRestart: restart})
	results := subscribe(t, "tcp://"+addr)
	ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
	defer cancel()

	// The sim idles unloaded for its pre-test pause.
	waitFor(t, 10*time.Second, "readings", func() bool { return status(t, socket)["readings"].(float64) > 300 })
	// The sim stamps samples with the wall clock and sends a batch every
	// 25 ms, so the measured transport lag is positive and well under a
	// second.
	if lag := driverField(status(t, socket), "lag_ms"); lag <= 0 || lag > 1000 {
		t.Errorf("driver lag %.1f ms: want 0 < lag < 1000", lag)
	}
	var tare calib.Calibration
	if err := daemon.Call(ctx, socket, daemon.Request{Op: "tare", Samples: 200}, &tare); err != nil {
		t.Fatalf("tare: %v", err)
	}
	var rd struct {
		RawSD          float64 `json:"raw_sd"`
		CalibratedMean float64 `json:"calibrated_mean"`
	}
	if err := daemon.Call(ctx, socket, daemon.Request{Op: "read", Samples: 100}, &rd); err != nil {
		t.Fatalf("read: %v", err)
	}
	if math.Abs(rd.CalibratedMean) > 3*rd.RawSD+1e-9 {
		t.Errorf("after the tare the unloaded frame reads %.4g N (noise sd %.3g N)", rd.CalibratedMean, rd.RawSD)
	}

	// A span whose references equal the readings (a channel already in N)
	// keeps the readings, and the result names it.
	span, err := calib.NewSpan("force", "N", time.Now().UTC(), []calib.Reference{{Reference: 0, Indicated: 0}, {Reference: 1000, Indicated: 1000}, {Reference: 2000, Indicated: 2000}}, 1)
	if err != nil {
		t.Fatal(err)
	}
	body, _ := json.Marshal(span)
	if err := daemon.Call(ctx, socket, daemon.Request{Op: "calibrate", Calibration: body}, nil); err != nil {
		t.Fatalf("calibrate: %v", err)
	}
	var list []calib.Calibration
	if err := daemon.Call(ctx, socket, daemon.Request{Op: "calibrations", Channel: "force"}, &list); err != nil || len(list) != 2 {
		t.Fatalf("calibrations: %d stored, err %v; want the tare and the span", len(list), err)
	}
	// A verification report handed in is stored and published retained: a
	// lab system subscribing afterwards still gets it.
	report, err := os.ReadFile("../testdata/verify/class05-five-forces/expected.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := daemon.Call(ctx, socket, daemon.Request{Op: "verification", Calibration: report}, nil); err != nil {
		t.Fatalf("verification: %v", err)
	}
	if err := daemon.Call(ctx, socket, daemon.Request{Op: "verification", Calibration: []byte(`{"not":"a report"}`)}, nil); err == nil {
		t.Errorf("a document without points was stored as a verification")
	}
	late := mqtt.NewClient(mqtt.NewClientOptions().AddBroker("tcp://" + addr).SetClientID("late-lab"))
	if tok := late.Connect(); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		t.Fatalf("late subscriber: %v", tok.Error())
	}
	defer late.Disconnect(100)
	got := make(chan []byte, 1)
	late.Subscribe("framed/e2e/verification", 1, func(_ mqtt.Client, m mqtt.Message) {
		select {
		case got <- m.Payload():
		default:
		}
	})
	select {
	case b := <-got:
		var doc struct {
			Ranges []struct {
				Class *string `json:"class"`
			} `json:"ranges"`
			Frame string `json:"frame"`
		}
		if err := json.Unmarshal(b, &doc); err != nil || doc.Frame != "e2e" || len(doc.Ranges) == 0 || doc.Ranges[0].Class == nil || *doc.Ranges[0].Class != "0.5" {
			t.Errorf("retained verification %s (%v)", b, err)
		}
	case <-time.After(10 * time.Second):
		t.Errorf("no retained verification for a late subscriber")
	}

	select {
	case r := <-results:
		found := false
		for _, ref := range r.Calibration {
			if ref.Channel == "force" && ref.ID == span.ID {
				found = true
			}
		}
		if !found {
			t.Errorf("result %s names calibrations %+v, not the span %s", r.TestID, r.Calibration, span.ID)
		}
	case <-ctx.Done():
		t.Fatalf("no result within 60 s")
	}
}
