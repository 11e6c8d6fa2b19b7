package serialtest

import (
	"bytes"
	"testing"
	"time"

	"go.bug.st/serial"
)

// TestPtyThroughSerialLibrary opens the pty slave with go.bug.st/serial,
// as the line driver does, and checks bytes flow both ways, that an
// unplug is seen as an error, and that a replug behind the same path works.
func TestPtyThroughSerialLibraryIntegration(t *testing.T) {
	p := OpenPty(t)
	mode := &serial.Mode{BaudRate: 115200, DataBits: 8, Parity: serial.NoParity, StopBits: serial.OneStopBit}
	port, err := serial.Open(p.Path(), mode)
	if err != nil {
		t.Fatalf("serial.Open on pty %s: %v", p.SlaveName(), err)
	}
	defer port.Close()
	if err := port.SetReadTimeout(50 * time.Millisecond); err != nil {
		t.Fatalf("SetReadTimeout: %v", err)
	}
	// Bytes a cooked tty would translate (CR, XON/XOFF, ^C) must pass.
	want := []byte("t=1 f=2\r\n\x11\x13\x03")
	if _, err := p.Write(want); err != nil {
		t.Fatal(err)
	}
	got := readFor(port, len(want), time.Second)
	if !bytes.Equal(got, want) {
		t.Errorf("slave read %q, want %q", got, want)
	}
	if _, err := port.Write([]byte{0x01, 0x03}); err != nil {
		t.Fatal(err)
	}
	back := make([]byte, 2)
	p.Master().SetReadDeadline(time.Now().Add(time.Second))
	if n, err := p.Read(back); n != 2 || err != nil || back[0] != 1 || back[1] != 3 {
		t.Errorf("master read %v %d %v", back, n, err)
	}

	p.Unplug()
	deadline := time.Now().Add(2 * time.Second)
	var readErr error
	for readErr == nil && time.Now().Before(deadline) {
		_, readErr = port.Read(make([]byte, 16))
	}
	if readErr == nil {
		t.Fatal("no error reading after unplug")
	}
	port.Close()

	p.Replug()
	port2, err := serial.Open(p.Path(), mode)
	if err != nil {
		t.Fatalf("reopen after replug: %v", err)
	}
	defer port2.Close()
	port2.SetReadTimeout(50 * time.Millisecond)
	p.Write([]byte("x"))
	if got := readFor(port2, 1, time.Second); string(got) != "x" {
		t.Errorf("after replug read %q", got)
	}
}

func readFor(port serial.Port, n int, d time.Duration) []byte {
	var got []byte
	buf := make([]byte, 64)
	deadline := time.Now().Add(d)
	for len(got) < n && time.Now().Before(deadline) {
		k, err := port.Read(buf)
		got = append(got, buf[:k]...)
		if err != nil {
			break
		}
	}
	return got
}
