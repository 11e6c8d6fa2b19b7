package publish

import (
	"encoding/json"
	"errors"
	"strings"
	"testing"
	"time"

	mqtt "github.com/eclipse/paho.mqtt.golang"

	"framed/reduce"
)

func TestDecodeSpecimen(t *testing.T) {
	ok := []struct {
		name, msg string
		want      reduce.Specimen
	}{
		{"round", `{"id":"S-104","material":"S355","shape":"round","d0_mm":10,"L0_mm":50}`,
			reduce.Specimen{ID: "S-104", Material: "S355", Shape: reduce.ShapeRound, D0MM: 10, L0MM: 50}},
		{"tube", `{"id":"TB-2","shape":"tube","a0_mm":1.5,"D0_mm":20,"L0_mm":80,"Le_mm":50}`,
			reduce.Specimen{ID: "TB-2", Shape: reduce.ShapeTube, A0MM: 1.5, OuterD0MM: 20, L0MM: 80, LeMM: 50}},
		{"area only, whitespace around", "  {\"id\":\"W-9\",\"S0_mm2\":0.785}\n",
			reduce.Specimen{ID: "W-9", S0MM2: 0.785}},
	}
	for _, c := range ok {
		got, err := DecodeSpecimen([]byte(c.msg), 64<<10)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if got != c.want {
			t.Errorf("%s: got %+v, want %+v", c.name, got, c.want)
		}
	}
	bad := []struct{ name, msg, reason string }{
		{"unknown field", `{"id":"S-1","diameter":10}`, "unknown field"},
		{"two objects", `{"id":"S-1"}{"id":"S-2"}`, "after the JSON object"},
		{"negative", `{"id":"S-1","d0_mm":-3}`, "d0_mm"},
		{"no id", `{"shape":"round","d0_mm":10}`, "no id"},
		{"unknown shape", `{"id":"S-1","shape":"hexagon"}`, "hexagon"},
		{"wrong type", `{"id":"S-1","d0_mm":"ten"}`, "d0_mm"},
		{"not JSON", `d0=10`, "invalid character"},
		{"empty", ``, "EOF"},
		{"null", `null`, "no id"},
		{"array", `[1,2]`, "cannot unmarshal"},
		{"overflow", `{"id":"S-1","d0_mm":1e999}`, "d0_mm"},
		{"too big", `{"id":"` + strings.Repeat("x", 70000) + `"}`, "limit"},
	}
	for _, c := range bad {
		_, err := DecodeSpecimen([]byte(c.msg), 64<<10)
		if !errors.Is(err, ErrBadSpecimen) {
			t.Errorf("%s: err = %v, want ErrBadSpecimen", c.name, err)
			continue
		}
		if !strings.Contains(err.Error(), c.reason) {
			t.Errorf("%s: error %q does not say %q", c.name, err, c.reason)
		}
	}
}

// The decoder never panics, refuses with ErrBadSpecimen, and what it
// accepts survives a JSON round trip unchanged.
func FuzzDecodeSpecimen(f *testing.F) {
	f.Add([]byte(`{"id":"S-1","shape":"round","d0_mm":10}`))
	f.Fuzz(func(t *testing.T, b []byte) {
		s, err := DecodeSpecimen(b, 64<<10)
		if err != nil {
			if !errors.Is(err, ErrBadSpecimen) {
				t.Fatalf("error %v does not wrap ErrBadSpecimen", err)
			}
			return
		}
		enc, err := json.Marshal(s)
		if err != nil {
			t.Fatal(err)
		}
		again, err := DecodeSpecimen(enc, 64<<10)
		if err != nil || again != s {
			t.Fatalf("round trip of %s: %+v, %v", enc, again, err)
		}
	})
}

// Specimen messages through a broker: valid ones arrive on Specimens(),
// bad ones are counted and the publisher carries on.
func TestSpecimensInbound(t *testing.T) {
	e := startEmbedded(t)
	p := startPublisher(t, e.URL(), nil, nil)
	waitFor(t, "publisher to connect", p.connected)
	// The subscription is made on connect; wait until the broker has it
	// by sending a probe until one arrives.
	c := mqtt.NewClient(mqtt.NewClientOptions().AddBroker(e.URL()).SetClientID("lab-system"))
	if tok := c.Connect(); !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
		t.Fatalf("lab client: %v", tok.Error())
	}
	defer c.Disconnect(50)
	send := func(payload string) {
		t.Helper()
		tok := c.Publish("framed/frame-a/specimens", 1, false, payload)
		if !tok.WaitTimeout(10*time.Second) || tok.Error() != nil {
			t.Fatalf("publish: %v", tok.Error())
		}
	}
	waitFor(t, "specimen subscription", func() bool {
		send(`{"id":"probe"}`)
		select {
		case s := <-p.Specimens():
			return s.ID == "probe"
		case <-time.After(100 * time.Millisecond):
			return false
		}
	})
	for len(p.Specimens()) > 0 { // late probes
		<-p.Specimens()
	}
	rejectedBefore := p.Stats().SpecimensRejected
	send(`{"id":"S-1","shape":"round","d0_mm":10,"L0_mm":50}`)
	send(`{"id":"S-x","diameter":10}`)
	send(`{"id":"` + strings.Repeat("x", 70000) + `"}`)
	send("\x00\xff garbage")
	send(`{"id":"S-2","shape":"rect","a0_mm":2,"b0_mm":12.5}`)
	var got []string
	for len(got) < 2 {
		select {
		case s := <-p.Specimens():
			if s.ID != "probe" {
				got = append(got, s.ID)
			}
		case <-time.After(10 * time.Second):
			t.Fatalf("specimens received %v", got)
		}
	}
	if got[0] != "S-1" || got[1] != "S-2" {
		t.Fatalf("specimens %v, want [S-1 S-2]", got)
	}
	// In-order delivery: the three bad ones came before S-2.
	if n := p.Stats().SpecimensRejected - rejectedBefore; n != 3 {
		t.Fatalf("rejected %d, want 3", n)
	}
}
