// Package brokertest starts a real Mosquitto broker for integration tests
// on a free loopback port, from a config template in testdata/mosquitto.
//
// When the mosquitto binary is missing the test is skipped with a loud
// reason, unless FRAMED_REQUIRE_MOSQUITTO=1 (CI sets it), which turns the
// skip into a failure.
package brokertest

import (
	"bytes"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"sync"
	"syscall"
	"testing"
	"text/template"
	"time"
)

// RequireEnv names the variable that makes a missing broker a failure.
const RequireEnv = "FRAMED_REQUIRE_MOSQUITTO"

// Binary finds mosquitto on PATH or in /usr/sbin, where Debian puts it.
func Binary() (string, error) {
	if p, err := exec.LookPath("mosquitto"); err == nil {
		return p, nil
	}
	for _, p := range []string{"/usr/sbin/mosquitto", "/usr/local/sbin/mosquitto"} {
		if _, err := os.Stat(p); err == nil {
			return p, nil
		}
	}
	return "", exec.ErrNotFound
}

// TemplateDir is testdata/mosquitto at the repository root.
func TemplateDir() string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Join(filepath.Dir(file), "..", "..", "..", "testdata", "mosquitto")
}

// FreePort returns a loopback port that was free a moment ago.
func FreePort(t testing.TB) int {
	t.Helper()
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}

// StartMosquitto runs mosquitto with testdata/mosquitto/<configTemplateName>
// (e.g. "plain.conf") on a free loopback port and waits until it accepts.
// It returns the broker URL (tcp://127.0.0.1:PORT), stop (kills the
// broker, as an outage would) and restart (starts it again on the same
// port and waits). t.Cleanup stops it.
func StartMosquitto(t testing.TB, configTemplateName string) (url string, stop func(), restart func()) {
	t.Helper()
	return StartMosquittoWith(t, Options{Template: configTemplateName})
}

// Options for StartMosquittoWith.
type Options struct {
	// Template is the config template's file name in testdata/mosquitto.
	Template string
	// Files are written into the broker's directory ({{.Dir}}) before it
	// starts: certificates, password files.
	Files map[string][]byte
	// Scheme of the returned URL, default "tcp" ("ssl" for TLS listeners).
	Scheme string
	// Graceful makes stop end the broker with SIGTERM, as a service
	// manager restarting it would: with persistence on, it saves its
	// sessions and queued messages and restores them on restart.
	Graceful bool
}

// StartMosquittoWith is StartMosquitto with extra files and URL scheme.
func StartMosquittoWith(t testing.TB, opt Options) (url string, stop func(), restart func()) {
	t.Helper()
	configTemplateName := opt.Template
	if opt.Scheme == "" {
		opt.Scheme = "tcp"
	}
	bin, err := Binary()
	if err != nil {
		if os.Getenv(RequireEnv) == "1" {
			t.Fatalf("mosquitto binary not found and %s=1: install Debian package mosquitto", RequireEnv)
		}
		t.Skip("mosquitto binary not found: install Debian package mosquitto; CI requires it")
	}
	tmpl, err := template.ParseFiles(filepath.Join(TemplateDir(), configTemplateName))
	if err != nil {
		t.Fatalf("broker config template: %v", err)
	}
	dir := t.TempDir()
	for name, b := range opt.Files {
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o600); err != nil {
			t.Fatal(err)
		}
	}
	port := FreePort(t)
	var conf bytes.Buffer
	if err := tmpl.Execute(&conf, map[string]any{"Port": port, "Dir": dir}); err != nil {
		t.Fatalf("broker config template: %v", err)
	}
	confPath := filepath.Join(dir, "mosquitto.conf")
	if err := os.WriteFile(confPath, conf.Bytes(), 0o600); err != nil {
		t.Fatal(err)
	}
	addr := net.JoinHostPort("127.0.0.1", strconv.Itoa(port))

	var mu sync.Mutex
	var cmd *exec.Cmd
	logs := &lockedBuffer{}
	stop = func() {
		mu.Lock()
		defer mu.Unlock()
		if cmd == nil {
			return
		}
		if opt.Graceful {
			cmd.Process.Signal(syscall.SIGTERM)
		} else {
			cmd.Process.Kill()
		}
		cmd.Wait()
		cmd = nil
	}
	start := func() {
		mu.Lock()
		defer mu.Unlock()
		if cmd != nil {
			return
		}
		c := exec.Command(bin, "-c", confPath)
		c.Stdout = logs
		c.Stderr = logs
		if err := c.Start(); err != nil {
			t.Fatalf("starting mosquitto: %v", err)
		}
		cmd = c
		deadline := time.Now().Add(10 * time.Second)
		for {
			conn, err := net.DialTimeout("tcp", addr, 200*time.Millisecond)
			if err == nil {
				conn.Close()
				return
			}
			if time.Now().After(deadline) {
				t.Fatalf("mosquitto did not accept on %s: %v\n%s", addr, err, logs.String())
			}
			time.Sleep(20 * time.Millisecond)
		}
	}
	restart = func() {
		stop()
		start()
	}
	start()
	t.Cleanup(func() {
		stop()
		if t.Failed() {
			t.Logf("mosquitto log:\n%s", logs.String())
		}
	})
	return fmt.Sprintf("%s://%s", opt.Scheme, addr), stop, restart
}

// lockedBuffer collects the broker's output, readable while it runs.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}
