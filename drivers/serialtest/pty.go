package serialtest

import (
	"fmt"
	"os"
	"path/filepath"
	"sync"
	"testing"

	"github.com/creack/pty"
	"golang.org/x/sys/unix"
)

// Pty is a pseudo-terminal pair standing in for a USB serial board. The
// driver opens Path (a symlink in the test's temp dir that always points
// at the current slave, like a udev by-id link); the test plays the board
// on the master end. Unplug closes the master, which the driver sees as a
// hang-up; Replug opens a fresh pair and re-points the symlink.
type Pty struct {
	t      testing.TB
	link   string
	mu     sync.Mutex
	master *os.File
	slave  *os.File
}

// OpenPty opens a pty pair and registers its cleanup with t.
func OpenPty(t testing.TB) *Pty {
	t.Helper()
	p := &Pty{t: t, link: filepath.Join(t.TempDir(), "ttyBOARD")}
	if err := p.plug(); err != nil {
		t.Fatalf("open pty: %v", err)
	}
	t.Cleanup(p.Unplug)
	return p
}

// plug opens a new pair, puts the slave in raw mode (so bytes written
// before the driver opens it are not echoed or translated) and points the
// symlink at it.
func (p *Pty) plug() error {
	m, s, err := pty.Open()
	if err != nil {
		return fmt.Errorf("pty open: %w", err)
	}
	if err := makeRaw(s); err != nil {
		m.Close()
		s.Close()
		return err
	}
	tmp := p.link + ".new"
	os.Remove(tmp)
	if err := os.Symlink(s.Name(), tmp); err != nil {
		m.Close()
		s.Close()
		return fmt.Errorf("symlink: %w", err)
	}
	if err := os.Rename(tmp, p.link); err != nil {
		m.Close()
		s.Close()
		return fmt.Errorf("rename symlink: %w", err)
	}
	p.mu.Lock()
	p.master, p.slave = m, s
	p.mu.Unlock()
	return nil
}

func makeRaw(f *os.File) error {
	fd := int(f.Fd())
	tio, err := unix.IoctlGetTermios(fd, unix.TCGETS)
	if err != nil {
		return fmt.Errorf("tcgets: %w", err)
	}
	tio.Iflag &^= unix.IGNBRK | unix.BRKINT | unix.PARMRK | unix.ISTRIP | unix.INLCR | unix.IGNCR | unix.ICRNL | unix.IXON
	tio.Oflag &^= unix.OPOST
	tio.Lflag &^= unix.ECHO | unix.ECHONL | unix.ICANON | unix.ISIG | unix.IEXTEN
	tio.Cflag &^= unix.CSIZE | unix.PARENB
	tio.Cflag |= unix.CS8
	tio.Cc[unix.VMIN] = 1
	tio.Cc[unix.VTIME] = 0
	if err := unix.IoctlSetTermios(fd, unix.TCSETS, tio); err != nil {
		return fmt.Errorf("tcsets: %w", err)
	}
	return nil
}

// Path is the stable device path to configure the driver with.
func (p *Pty) Path() string { return p.link }

// SlaveName is the current /dev/pts/N behind Path.
func (p *Pty) SlaveName() string {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.slave == nil {
		return ""
	}
	return p.slave.Name()
}

// Master returns the board end of the current pair (nil when unplugged).
func (p *Pty) Master() *os.File {
	p.mu.Lock()
	defer p.mu.Unlock()
	return p.master
}

// Write sends firmware output to the driver.
func (p *Pty) Write(b []byte) (int, error) {
	m := p.Master()
	if m == nil {
		return 0, os.ErrClosed
	}
	return m.Write(b)
}

// Read reads what the driver wrote (e.g. Modbus requests).
func (p *Pty) Read(b []byte) (int, error) {
	m := p.Master()
	if m == nil {
		return 0, os.ErrClosed
	}
	return m.Read(b)
}

// Unplug closes both ends the helper holds and removes the symlink, as
// when the USB cable is pulled and udev drops the by-id link.
func (p *Pty) Unplug() {
	p.mu.Lock()
	m, s := p.master, p.slave
	p.master, p.slave = nil, nil
	p.mu.Unlock()
	os.Remove(p.link)
	if m != nil {
		m.Close()
	}
	if s != nil {
		s.Close()
	}
}

// Replug opens a fresh pair behind the same Path.
func (p *Pty) Replug() {
	p.t.Helper()
	if err := p.plug(); err != nil {
		p.t.Fatalf("replug pty: %v", err)
	}
}
