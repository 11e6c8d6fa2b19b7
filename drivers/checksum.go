package drivers

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"
	"os"
	"strings"
)

// FileSHA256 returns the hex SHA-256 of the file at path, the form an
// operator puts in the daemon's configuration beside an external driver
// (the same as `sha256sum` prints).
func FileSHA256(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", fmt.Errorf("driver binary: %w", err)
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", fmt.Errorf("driver binary %q: %w", path, err)
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// VerifySHA256 checks that the file at path has the hex SHA-256 want
// (case and surrounding space ignored). It returns an error wrapping
// ErrNoChecksum when want is empty and ErrChecksumMismatch when it differs.
func VerifySHA256(path, want string) error {
	want = strings.ToLower(strings.TrimSpace(want))
	if want == "" {
		return fmt.Errorf("%w: %q", ErrNoChecksum, path)
	}
	if _, err := hex.DecodeString(want); err != nil || len(want) != sha256.Size*2 {
		return fmt.Errorf("%w: configured sha256 %q is not 64 hex digits", ErrChecksumMismatch, want)
	}
	got, err := FileSHA256(path)
	if err != nil {
		return err
	}
	if got != want {
		return fmt.Errorf("%w: %q has %s, configured %s", ErrChecksumMismatch, path, got, want)
	}
	return nil
}
