package rtusim

import (
	"bytes"
	"errors"
	"testing"
)

func TestCRCMatchesPublishedFrames(t *testing.T) {
	// Read-holding-registers requests with their CRCs as printed in many
	// Modbus RTU tutorials and device manuals (from memory): bytes are
	// slave, function, address, count, then CRC low byte, high byte.
	cases := []struct {
		frame []byte
		lo    byte
		hi    byte
	}{
		{[]byte{0x01, 0x03, 0x00, 0x00, 0x00, 0x0A}, 0xC5, 0xCD},
		{[]byte{0x01, 0x03, 0x00, 0x00, 0x00, 0x01}, 0x84, 0x0A},
	}
	for _, c := range cases {
		crc := CRC16(c.frame)
		if byte(crc) != c.lo || byte(crc>>8) != c.hi {
			t.Errorf("CRC16(% X) = %02X %02X, want %02X %02X", c.frame, byte(crc), byte(crc>>8), c.lo, c.hi)
		}
	}
}

func TestCRCCheckOfWholeFrameIsZero(t *testing.T) {
	// A CRC-16 register run over a frame followed by its own CRC (low byte
	// first, for this reflected CRC) ends at zero: the residue check
	// receivers use (common practice).
	f := AppendCRC([]byte{0x11, 0x04, 0x00, 0x08, 0x00, 0x01})
	if got := CRC16(f); got != 0 {
		t.Errorf("CRC16 over frame and its CRC = %04X, want 0", got)
	}
}

func mustSlave(t *testing.T, id int) *Slave {
	t.Helper()
	s, err := NewSlave(id)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestFeedAnswersReadHolding(t *testing.T) {
	s := mustSlave(t, 1)
	s.SetHolding(0, 0x0001, 0xE240)
	req := []byte{0x01, 0x03, 0x00, 0x00, 0x00, 0x0A, 0xC5, 0xCD} // published frame, see above
	answers, rest := s.Feed(req)
	if len(answers) != 1 || len(rest) != 0 {
		t.Fatalf("Feed: %d answers, %d bytes left; want 1, 0", len(answers), len(rest))
	}
	// The Modbus application protocol's answer layout: address, function,
	// byte count (2 x 10), the registers high byte first, CRC.
	want := []byte{0x01, 0x03, 20, 0x00, 0x01, 0xE2, 0x40}
	want = append(want, make([]byte, 16)...)
	want = AppendCRC(want)
	if !bytes.Equal(answers[0], want) {
		t.Errorf("answer % X\nwant   % X", answers[0], want)
	}
}

func TestFeedInputRegistersAndSplitRequests(t *testing.T) {
	s := mustSlave(t, 7)
	s.SetInput(10, 0x0000, 0x4020)
	req := AppendCRC([]byte{0x07, 0x04, 0x00, 0x0A, 0x00, 0x02})
	answers, rest := s.Feed(req[:5])
	if len(answers) != 0 || len(rest) != 5 {
		t.Fatalf("half a request answered: %d answers, %d left", len(answers), len(rest))
	}
	answers, rest = s.Feed(append(rest, req[5:]...))
	want := AppendCRC([]byte{0x07, 0x04, 4, 0x00, 0x00, 0x40, 0x20})
	if len(answers) != 1 || !bytes.Equal(answers[0], want) || len(rest) != 0 {
		t.Errorf("answers % X, rest % X; want % X", answers, rest, want)
	}
}

func TestFeedResynchronisesAfterNoise(t *testing.T) {
	s := mustSlave(t, 1)
	req := AppendCRC([]byte{0x01, 0x03, 0x00, 0x00, 0x00, 0x01})
	in := append([]byte{0xFF, 0x00, 0x13}, req...)
	answers, _ := s.Feed(in)
	if len(answers) != 1 {
		t.Fatalf("after 3 noise bytes: %d answers, want 1", len(answers))
	}
	if req, bad := s.Stats(); req != 1 || bad != 3 {
		t.Errorf("stats %d requests, %d bad; want 1, 3", req, bad)
	}
}

func TestFeedOtherAddressGetsNoAnswer(t *testing.T) {
	s := mustSlave(t, 1)
	answers, _ := s.Feed(AppendCRC([]byte{0x02, 0x03, 0x00, 0x00, 0x00, 0x01}))
	if len(answers) != 0 {
		t.Errorf("slave 1 answered a request to slave 2: % X", answers)
	}
}

func TestFaults(t *testing.T) {
	s := mustSlave(t, 1)
	s.QueueFaults(ReadHolding, BadCRC, Silent, Exception)
	req := AppendCRC([]byte{0x01, 0x03, 0x00, 0x00, 0x00, 0x01})
	a, _ := s.Feed(req)
	if len(a) != 1 || CRC16(a[0]) == 0 {
		t.Errorf("BadCRC: answer % X has a valid CRC", a)
	}
	if a, _ = s.Feed(req); len(a) != 0 {
		t.Errorf("Silent: answered % X", a)
	}
	a, _ = s.Feed(req)
	// Exception answer: function | 0x80, exception code 02 (illegal data
	// address), Modbus application protocol.
	if want := AppendCRC([]byte{0x01, 0x83, 0x02}); len(a) != 1 || !bytes.Equal(a[0], want) {
		t.Errorf("Exception: answer % X, want % X", a, want)
	}
	if n := s.PendingFaults(); n != 0 {
		t.Errorf("%d faults still pending", n)
	}
	if a, _ = s.Feed(req); len(a) != 1 || CRC16(a[0]) != 0 {
		t.Errorf("after the faults: answer % X, want a normal one", a)
	}
}

func TestFeedRefusesOversizedCount(t *testing.T) {
	s := mustSlave(t, 1)
	// 126 registers is one more than functions 3 and 4 allow (Modbus
	// application protocol: 1..125): exception 03, illegal data value.
	a, _ := s.Feed(AppendCRC([]byte{0x01, 0x03, 0x00, 0x00, 0x00, 126}))
	if want := AppendCRC([]byte{0x01, 0x83, 0x03}); len(a) != 1 || !bytes.Equal(a[0], want) {
		t.Errorf("answer % X, want % X", a, want)
	}
}

func TestNewSlaveRefusesBadID(t *testing.T) {
	for _, id := range []int{0, 248, -1} {
		if _, err := NewSlave(id); !errors.Is(err, ErrBadSlaveID) {
			t.Errorf("NewSlave(%d): %v, want ErrBadSlaveID", id, err)
		}
	}
}
