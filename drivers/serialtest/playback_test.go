package serialtest

import (
	"errors"
	"io"
	"testing"
)

func TestPlaybackReadsInOrderAndSplits(t *testing.T) {
	boom := errors.New("unplugged")
	p := NewPlayback(Op{R: []byte("abc\n")}, Op{Err: boom}, Op{R: []byte("d")})
	buf := make([]byte, 2)
	var got []byte
	var errs []error
	for range 10 {
		n, err := p.Read(buf)
		got = append(got, buf[:n]...)
		if err != nil {
			errs = append(errs, err)
		}
	}
	if string(got) != "abc\nd" {
		t.Errorf("read %q, want %q", got, "abc\nd")
	}
	if len(errs) != 1 || !errors.Is(errs[0], boom) {
		t.Errorf("errors %v, want one %v", errs, boom)
	}
	select {
	case <-p.Drained():
	default:
		t.Error("script consumed but Drained not closed")
	}
	if err := p.Close(); err != nil {
		t.Errorf("Close after full consumption: %v", err)
	}
}

func TestPlaybackCloseFailsOnUnread(t *testing.T) {
	p := NewPlayback(Op{R: []byte("t=1 f=2\n")})
	buf := make([]byte, 3)
	if _, err := p.Read(buf); err != nil {
		t.Fatal(err)
	}
	if err := p.Close(); !errors.Is(err, ErrUnread) {
		t.Errorf("Close with 5 unread bytes: %v, want ErrUnread", err)
	}
}

func TestPlaybackWritesChecked(t *testing.T) {
	p := NewPlayback(Op{W: []byte{1, 3}}, Op{R: []byte{1, 3, 0}})
	buf := make([]byte, 8)
	// A read before the expected request is a quiet line.
	if n, err := p.Read(buf); n != 0 || err != nil {
		t.Fatalf("read before request: %d, %v", n, err)
	}
	if _, err := p.Write([]byte{1, 3}); err != nil {
		t.Fatalf("expected write refused: %v", err)
	}
	if n, _ := io.ReadFull(p, buf[:3]); n != 3 {
		t.Fatalf("response: %d bytes", n)
	}
	if _, err := p.Write([]byte{9}); !errors.Is(err, ErrUnexpectedWrite) {
		t.Errorf("unscripted write: %v, want ErrUnexpectedWrite", err)
	}
	if err := p.Close(); !errors.Is(err, ErrUnexpectedWrite) {
		t.Errorf("Close after bad write: %v, want ErrUnexpectedWrite", err)
	}
	if _, err := p.Read(buf); !errors.Is(err, ErrClosed) {
		t.Errorf("read after close: %v, want ErrClosed", err)
	}
}
