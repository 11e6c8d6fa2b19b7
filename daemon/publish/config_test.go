package publish

import (
	"errors"
	"testing"
	"time"
)

func TestConfigValidate(t *testing.T) {
	good := []Config{
		{Broker: "tcp://127.0.0.1:1883", Frame: "frame-a"},
		{Broker: "ssl://broker.lab.example:8883", Frame: "f1", Root: "lab/framed", Username: "u", Password: "p"},
	}
	for _, c := range good {
		if err := c.Validate(); err != nil {
			t.Errorf("%+v: %v", c, err)
		}
	}
	bad := map[string]Config{
		"no broker":         {Frame: "f"},
		"http scheme":       {Broker: "http://h:1883", Frame: "f"},
		"no port":           {Broker: "tcp://h", Frame: "f"},
		"no frame":          {Broker: "tcp://h:1"},
		"wildcard frame":    {Broker: "tcp://h:1", Frame: "a+"},
		"slash frame":       {Broker: "tcp://h:1", Frame: "a/b"},
		"system root":       {Broker: "tcp://h:1", Frame: "f", Root: "$SYS"},
		"empty root level":  {Broker: "tcp://h:1", Frame: "f", Root: "a//b"},
		"cert without key":  {Broker: "ssl://h:1", Frame: "f", CertFile: "c.pem"},
		"tls on tcp":        {Broker: "tcp://h:1", Frame: "f", CAFile: "ca.pem"},
		"password no user":  {Broker: "tcp://h:1", Frame: "f", Password: "p"},
		"path in broker":    {Broker: "tcp://h:1/x", Frame: "f"},
		"garbage url":       {Broker: "::", Frame: "f"},
		"wildcard in root":  {Broker: "tcp://h:1", Frame: "f", Root: "#"},
		"nul in frame name": {Broker: "tcp://h:1", Frame: "a\x00"},
	}
	for name, c := range bad {
		if err := c.Validate(); !errors.Is(err, ErrBadConfig) {
			t.Errorf("%s: err = %v, want ErrBadConfig", name, err)
		}
		if _, err := New(c, nil, nil); !errors.Is(err, ErrBadConfig) {
			t.Errorf("New %s: err = %v, want ErrBadConfig", name, err)
		}
	}
}

func TestNewReportsMissingTLSFiles(t *testing.T) {
	_, err := New(Config{Broker: "ssl://127.0.0.1:8883", Frame: "f", CAFile: "/nonexistent/ca.pem"}, nil, nil)
	if err == nil {
		t.Fatal("missing CA file accepted")
	}
}

func TestTopics(t *testing.T) {
	tp := newTopics("framed", "frame-a")
	if tp.status != "framed/frame-a/status" || tp.events != "framed/frame-a/events" ||
		tp.live != "framed/frame-a/live" || tp.specimens != "framed/frame-a/specimens" {
		t.Fatalf("topics %+v", tp)
	}
	if got := tp.result("T-2026/03+#"); got != "framed/frame-a/results/T-2026_03__" {
		t.Fatalf("result topic %q", got)
	}
}

func TestLiveThrottle(t *testing.T) {
	l := liveThrottle{minGap: 200 * time.Millisecond} // 5 Hz
	base := time.Date(2026, 3, 4, 8, 30, 0, 0, time.UTC)
	passed := 0
	// 10 kHz of readings for 1 s: at 5 Hz, 5 pass.
	for i := 0; i < 10000; i++ {
		if l.allow(base.Add(time.Duration(i) * 100 * time.Microsecond)) {
			passed++
		}
	}
	if passed != 5 {
		t.Fatalf("%d readings passed in 1 s at 5 Hz", passed)
	}
}

func TestLiveDroppedWhileOffline(t *testing.T) {
	p, err := New(Config{Broker: "tcp://127.0.0.1:1", Frame: "f"}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	p.Live(Reading{TimeS: 1, ForceN: 2})
	if s := p.Stats(); s.LiveDropped != 1 || s.LiveSent != 0 {
		t.Fatalf("stats %+v", s)
	}
}
