package boardsim

import (
	"errors"
	"fmt"
	"os"
	"sync/atomic"
	"time"

	"github.com/creack/pty"
	"golang.org/x/sys/unix"
)

// Link is a pty pair standing in for a USB serial board: the driver opens
// Path, a symlink to the slave (like a udev by-id link), and the
// simulator plays the board on the master end.
//
// Link keeps the slave open itself, so the line stays up while the driver
// closes and reopens the port. Writes that the driver is not reading
// fill the pty's buffer; past that they are dropped after a short wait,
// as a board's UART sends into the void, rather than stalling the board.
type Link struct {
	path    string
	master  *os.File
	slave   *os.File
	dropped atomic.Int64
}

// writeWait bounds how long a write waits for the reader before the
// bytes are dropped.
const writeWait = 100 * time.Millisecond

// OpenLink opens a pty pair in raw mode and points the symlink path at
// its slave, replacing a symlink already there (a stale one from an
// earlier run) but never another kind of file.
func OpenLink(path string) (*Link, error) {
	if fi, err := os.Lstat(path); err == nil && fi.Mode()&os.ModeSymlink == 0 {
		return nil, fmt.Errorf("%w: %s exists and is not a symlink; not replacing it", ErrLink, path)
	}
	m, s, err := pty.Open()
	if err != nil {
		return nil, fmt.Errorf("%w: open pty: %w", ErrLink, err)
	}
	l := &Link{path: path, slave: s}
	if l.master, err = pollable(m); err != nil {
		s.Close()
		return nil, err
	}
	if err := makeRaw(s); err != nil {
		l.close()
		return nil, err
	}
	tmp := path + ".new"
	os.Remove(tmp)
	if err := os.Symlink(s.Name(), tmp); err != nil {
		l.close()
		return nil, fmt.Errorf("%w: %w", ErrLink, err)
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		l.close()
		return nil, fmt.Errorf("%w: %w", ErrLink, err)
	}
	return l, nil
}

// pollable returns m as a non-blocking file in Go's poller, so reads and
// writes take deadlines; m is closed.
func pollable(m *os.File) (*os.File, error) {
	fd, err := unix.Dup(int(m.Fd()))
	m.Close()
	if err != nil {
		return nil, fmt.Errorf("%w: dup pty master: %w", ErrLink, err)
	}
	if err := unix.SetNonblock(fd, true); err != nil {
		unix.Close(fd)
		return nil, fmt.Errorf("%w: pty master non-blocking: %w", ErrLink, err)
	}
	return os.NewFile(uintptr(fd), "/dev/ptmx"), nil
}

func makeRaw(f *os.File) error {
	fd := int(f.Fd())
	tio, err := unix.IoctlGetTermios(fd, unix.TCGETS)
	if err != nil {
		return fmt.Errorf("%w: tcgets: %w", ErrLink, err)
	}
	tio.Iflag &^= unix.IGNBRK | unix.BRKINT | unix.PARMRK | unix.ISTRIP | unix.INLCR | unix.IGNCR | unix.ICRNL | unix.IXON
	tio.Oflag &^= unix.OPOST
	tio.Lflag &^= unix.ECHO | unix.ECHONL | unix.ICANON | unix.ISIG | unix.IEXTEN
	tio.Cflag &^= unix.CSIZE | unix.PARENB
	tio.Cflag |= unix.CS8
	tio.Cc[unix.VMIN] = 1
	tio.Cc[unix.VTIME] = 0
	if err := unix.IoctlSetTermios(fd, unix.TCSETS, tio); err != nil {
		return fmt.Errorf("%w: tcsets: %w", ErrLink, err)
	}
	return nil
}

// Path is the symlink to give the driver as its port.
func (l *Link) Path() string { return l.path }

// SlaveName is the /dev/pts/N behind Path.
func (l *Link) SlaveName() string { return l.slave.Name() }

// Write sends board output to the driver. Bytes the driver does not take
// within a short wait are dropped and counted (Dropped), not returned as
// an error; a closed link is an error.
func (l *Link) Write(b []byte) (int, error) {
	l.master.SetWriteDeadline(time.Now().Add(writeWait))
	n, err := l.master.Write(b)
	if errors.Is(err, os.ErrDeadlineExceeded) {
		l.dropped.Add(int64(len(b) - n))
		return len(b), nil
	}
	return n, err
}

// Dropped is how many bytes were dropped because nobody read them.
func (l *Link) Dropped() int64 { return l.dropped.Load() }

// Read reads what the driver wrote (a Modbus master's requests).
func (l *Link) Read(b []byte) (int, error) { return l.master.Read(b) }

// SetReadDeadline bounds the next Read, so a server loop can watch for
// its stop.
func (l *Link) SetReadDeadline(t time.Time) error { return l.master.SetReadDeadline(t) }

// Close removes the symlink (if it still points at this link) and closes
// both ends.
func (l *Link) Close() error {
	if dst, err := os.Readlink(l.path); err == nil && dst == l.slave.Name() {
		os.Remove(l.path)
	}
	return l.close()
}

func (l *Link) close() error {
	err := l.master.Close()
	if e := l.slave.Close(); err == nil {
		err = e
	}
	return err
}
