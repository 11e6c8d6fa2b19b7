package main

import (
	"bytes"
	"net"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"framed/drivers/builtin"
)

func TestMain(m *testing.M) {
	if builtin.ServeArgs(os.Args[1:]) {
		return
	}
	os.Exit(m.Run())
}

// Bad input on the command line ends with a clear one-line message and a
// non-zero exit, never a panic.
func TestCommandLineErrors(t *testing.T) {
	dir := t.TempDir()
	badJSON := filepath.Join(dir, "bad.json")
	os.WriteFile(badJSON, []byte("{\n \"frame\": \"f\",\n \"drivers\": [ {\"name\": \"a\" \"kind\": \"sim\"} ]\n}\n"), 0o600)
	missingDriver := filepath.Join(dir, "missing-driver.json")
	os.WriteFile(missingDriver, []byte(`{"drivers":[{"name":"bridge","path":"`+filepath.Join(dir, "no-such-driver")+`","sha256":"`+strings.Repeat("ab", 32)+`"}]}`), 0o600)

	for _, tc := range []struct {
		name string
		args []string
		code int
		want string
	}{
		{"unknown flag", []string{"--bogus"}, 2, "flag provided but not defined: -bogus"},
		{"nothing to run", []string{}, 2, "give --config FILE, or --demo"},
		{"stray argument", []string{"--demo", "now"}, 2, `unexpected argument "now"`},
		{"missing config", []string{"--config", filepath.Join(dir, "nope.json")}, 1, "no such file"},
		{"config syntax", []string{"--config", badJSON}, 1, "line 3"},
		{"bad broker", []string{"--demo", "--state", dir, "--broker", "mqtt://x:1"}, 1, "want tcp://host:port"},
		{"driver that cannot start", []string{"--config", missingDriver, "--state", dir, "--broker", "tcp://127.0.0.1:1"}, 1, `driver failed to start: driver "bridge"`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var stderr bytes.Buffer
			code := run(tc.args, &stderr)
			if code != tc.code {
				t.Errorf("exit %d, want %d; stderr:\n%s", code, tc.code, stderr.String())
			}
			msg := stderr.String()
			if !strings.Contains(msg, tc.want) {
				t.Errorf("stderr %q does not say %q", msg, tc.want)
			}
			if tc.code == 1 && strings.Count(strings.TrimSpace(lastLine(msg)), "\n") != 0 {
				t.Errorf("error is not one line: %q", msg)
			}
		})
	}
}

func lastLine(s string) string {
	lines := strings.Split(strings.TrimRight(s, "\n"), "\n")
	return lines[len(lines)-1]
}

// With the embedded broker's port taken, framed says so and how to use the
// broker that holds it.
func TestEmbeddedPortTaken(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	var stderr bytes.Buffer
	code := run([]string{"--demo", "--state", t.TempDir(), "--broker", "embedded:" + ln.Addr().String()}, &stderr)
	msg := lastLine(stderr.String())
	if code != 1 || !strings.Contains(msg, "in use") || !strings.Contains(msg, "--broker tcp://"+ln.Addr().String()) {
		t.Errorf("exit %d, message %q: want exit 1 saying the port is in use and how to use that broker", code, msg)
	}
}
