package drivers_test

import (
	"context"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"framed/drivers"
	"framed/drivers/conformance"
)

// SHA-256 of "abc": the example of FIPS 180-2, appendix B.1.
const sha256ABC = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"

func TestFileSHA256(t *testing.T) {
	path := filepath.Join(t.TempDir(), "abc")
	if err := os.WriteFile(path, []byte("abc"), 0o600); err != nil {
		t.Fatal(err)
	}
	got, err := drivers.FileSHA256(path)
	if err != nil {
		t.Fatal(err)
	}
	if got != sha256ABC {
		t.Errorf("FileSHA256 = %s, want %s", got, sha256ABC)
	}
	if err := drivers.VerifySHA256(path, "  "+strings.ToUpper(sha256ABC)+"\n"); err != nil {
		t.Errorf("VerifySHA256 with upper case and spaces: %v", err)
	}
	for name, want := range map[string]string{
		"other digest": strings.Repeat("0", 64),
		"too short":    sha256ABC[:63],
		"not hex":      strings.Repeat("g", 64),
	} {
		if err := drivers.VerifySHA256(path, want); !errors.Is(err, drivers.ErrChecksumMismatch) {
			t.Errorf("%s: %v, want ErrChecksumMismatch", name, err)
		}
	}
	if err := drivers.VerifySHA256(path, ""); !errors.Is(err, drivers.ErrNoChecksum) {
		t.Errorf("empty checksum: %v, want ErrNoChecksum", err)
	}
	if _, err := drivers.FileSHA256(filepath.Join(t.TempDir(), "missing")); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing file: %v, want os.ErrNotExist", err)
	}
}

// externalCopy copies the test binary elsewhere, making it an external
// driver binary (not the running executable).
func externalCopy(t *testing.T) string {
	t.Helper()
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	src, err := os.Open(self)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	path := filepath.Join(t.TempDir(), "framed-driver-fake")
	dst, err := os.OpenFile(path, os.O_CREATE|os.O_WRONLY, 0o700)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := io.Copy(dst, src); err != nil {
		t.Fatal(err)
	}
	if err := dst.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

func externalCmd(path string) *exec.Cmd {
	cmd := exec.Command(path, "-test.run=^$")
	cmd.Env = append(os.Environ(), conformance.EnvServe+"=fake")
	return cmd
}

func TestLaunchExternalChecksumIntegration(t *testing.T) {
	path := externalCopy(t)
	ctx := context.Background()
	if _, err := drivers.Launch(ctx, drivers.LaunchConfig{Cmd: externalCmd(path)}); !errors.Is(err, drivers.ErrNoChecksum) {
		t.Errorf("external binary without checksum: %v, want ErrNoChecksum", err)
	}
	if _, err := drivers.Launch(ctx, drivers.LaunchConfig{Cmd: externalCmd(path), SHA256: sha256ABC}); !errors.Is(err, drivers.ErrChecksumMismatch) {
		t.Errorf("external binary with a wrong checksum: %v, want ErrChecksumMismatch", err)
	}
	p, err := drivers.Launch(ctx, drivers.LaunchConfig{Cmd: externalCmd(path), SHA256: mustSHA(t, path)})
	if err != nil {
		t.Fatalf("external binary with its checksum: %v", err)
	}
	t.Cleanup(p.Kill)
	info, err := p.Describe(ctx)
	if err != nil || info.Driver != "fake" {
		t.Errorf("Describe = %+v, %v", info, err)
	}
}
