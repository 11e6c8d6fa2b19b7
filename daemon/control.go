package daemon

import (
	"bufio"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net"
	"os"
	"sync"
	"time"
)

// ControlSocketName is the control socket's file name in the state dir.
const ControlSocketName = "framed.sock"

// maxControlRequest bounds one request line.
const maxControlRequest = 1 << 20

// Request is one line of the control protocol: JSON with an "op" and its
// arguments. The socket is the operator's local door into the daemon; it
// is created readable and writable by the owner and group only.
type Request struct {
	Op       string          `json:"op"`
	TestID   string          `json:"test_id,omitempty"`
	Channel  string          `json:"channel,omitempty"`
	Samples  int             `json:"samples,omitempty"`
	Specimen json.RawMessage `json:"specimen,omitempty"`
	// Calibration carries a span calibration to store (op "calibrate"), or
	// a force verification report (op "verification").
	Calibration json.RawMessage `json:"calibration,omitempty"`
}

// Response is the answer line.
type Response struct {
	OK    bool            `json:"ok"`
	Error string          `json:"error,omitempty"`
	Data  json.RawMessage `json:"data,omitempty"`
}

type controlServer struct {
	d  *Daemon
	ln net.Listener
	wg sync.WaitGroup
}

func startControl(d *Daemon, path string) (*controlServer, error) {
	if fi, err := os.Lstat(path); err == nil {
		if fi.Mode()&os.ModeSocket == 0 {
			return nil, fmt.Errorf("control socket %s exists and is not a socket", path)
		}
		// A socket left by a killed daemon: refuse only if someone answers.
		if c, err := net.DialTimeout("unix", path, 200*time.Millisecond); err == nil {
			c.Close()
			return nil, fmt.Errorf("another framed is running on %s", path)
		}
		os.Remove(path)
	}
	ln, err := net.Listen("unix", path)
	if err != nil {
		return nil, fmt.Errorf("control socket: %w", err)
	}
	if err := os.Chmod(path, 0o660); err != nil {
		ln.Close()
		return nil, fmt.Errorf("control socket permissions: %w", err)
	}
	s := &controlServer{d: d, ln: ln}
	s.wg.Add(1)
	go s.serve()
	return s, nil
}

func (s *controlServer) close() {
	s.ln.Close()
	s.wg.Wait()
}

func (s *controlServer) serve() {
	defer s.wg.Done()
	for {
		c, err := s.ln.Accept()
		if err != nil {
			return
		}
		s.wg.Add(1)
		go func() {
			defer s.wg.Done()
			s.handle(c)
		}()
	}
}

func (s *controlServer) handle(c net.Conn) {
	defer c.Close()
	r := bufio.NewReaderSize(io.LimitReader(c, maxControlRequest+1), 64<<10)
	enc := json.NewEncoder(c)
	for {
		c.SetReadDeadline(time.Now().Add(10 * time.Minute))
		line, err := r.ReadBytes('\n')
		if len(line) == 0 && err != nil {
			return
		}
		var req Request
		var resp Response
		if len(line) > maxControlRequest {
			resp = Response{Error: "request too large"}
		} else if err := json.Unmarshal(line, &req); err != nil {
			resp = Response{Error: fmt.Sprintf("malformed request: %v", err)}
		} else {
			data, err := s.d.control(req)
			if err != nil {
				resp = Response{Error: err.Error()}
			} else {
				b, _ := json.Marshal(data)
				resp = Response{OK: true, Data: b}
			}
		}
		if enc.Encode(resp) != nil || err != nil {
			return
		}
	}
}

// Call sends one request to the daemon behind a state directory's control
// socket. ErrNotRunning means nobody listens there.
func Call(ctx context.Context, socket string, req Request, data any) error {
	var dialer net.Dialer
	c, err := dialer.DialContext(ctx, "unix", socket)
	if err != nil {
		return fmt.Errorf("%w (no answer on %s)", ErrNotRunning, socket)
	}
	defer c.Close()
	if dl, ok := ctx.Deadline(); ok {
		c.SetDeadline(dl)
	}
	if err := json.NewEncoder(c).Encode(req); err != nil {
		return err
	}
	var resp Response
	dec := json.NewDecoder(bufio.NewReader(c))
	if err := dec.Decode(&resp); err != nil {
		return fmt.Errorf("control answer: %w", err)
	}
	if !resp.OK {
		return errors.New(resp.Error)
	}
	if data != nil && len(resp.Data) > 0 {
		return json.Unmarshal(resp.Data, data)
	}
	return nil
}
