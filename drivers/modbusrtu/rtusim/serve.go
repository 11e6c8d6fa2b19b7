package rtusim

import (
	"context"
	"errors"
	"io"
	"os"
	"time"
)

// Conn is the slave's end of the line: the master end of a pty, a pipe.
type Conn interface {
	io.ReadWriter
	SetReadDeadline(time.Time) error
}

// pollEvery bounds how long Serve waits on a read before it looks at ctx
// and at which connection is current.
const pollEvery = 20 * time.Millisecond

// Serve answers requests until ctx is done. current returns the line to
// serve, or nil while it is unplugged; it is asked again after every read,
// so a test can pull the cable and plug in a fresh pty, and a half request
// from before the unplug is dropped. A Conn that takes read deadlines (a
// pollable file) lets Serve notice ctx within 20 ms; with one that does
// not, close the connection to end a pending read. Write errors are ignored as a real
// slave ignores a dead line; Serve returns ctx's error.
func (s *Slave) Serve(ctx context.Context, current func() Conn) error {
	var buf []byte
	chunk := make([]byte, 256)
	for ctx.Err() == nil {
		c := current()
		if c == nil {
			buf = buf[:0]
			time.Sleep(5 * time.Millisecond)
			continue
		}
		c.SetReadDeadline(time.Now().Add(pollEvery))
		n, err := c.Read(chunk)
		buf = append(buf, chunk[:n]...)
		if err != nil && n == 0 {
			if errors.Is(err, os.ErrDeadlineExceeded) {
				continue
			}
			// Closed or hung up: drop the half request and wait for the
			// next line without spinning.
			buf = buf[:0]
			time.Sleep(5 * time.Millisecond)
			continue
		}
		var answers [][]byte
		answers, buf = s.Feed(buf)
		for _, a := range answers {
			c.Write(a)
		}
	}
	return ctx.Err()
}
