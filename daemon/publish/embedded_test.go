package publish

import (
	"errors"
	"net"
	"strings"
	"testing"
)

func startEmbedded(t *testing.T) *Embedded {
	t.Helper()
	e, err := StartEmbedded("127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { e.Close() })
	return e
}

func TestEmbeddedDelivers(t *testing.T) {
	e := startEmbedded(t)
	if strings.HasSuffix(e.Addr(), ":0") {
		t.Fatalf("Addr %s is not the actual address", e.Addr())
	}
	db := openStore(t, t.TempDir())
	sub := subscribe(t, e.URL(), "framed/frame-a/results/#")
	putResult(t, db, "T-1")
	putResult(t, db, "T-2")
	startPublisher(t, e.URL(), db, nil)
	if got := collectResults(t, sub, 2); got[0] != "T-1/1" || got[1] != "T-2/1" {
		t.Fatalf("arrived %v", got)
	}
	waitFor(t, "outbox to empty", func() bool { n, _ := db.OutboxLen(); return n == 0 })
}

func TestEmbeddedPortInUse(t *testing.T) {
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	_, err = StartEmbedded(l.Addr().String())
	if !errors.Is(err, ErrPortInUse) {
		t.Fatalf("err = %v, want ErrPortInUse", err)
	}
	if want := "--broker tcp://" + l.Addr().String(); !strings.Contains(err.Error(), want) {
		t.Fatalf("error %q does not say %q", err, want)
	}
}
