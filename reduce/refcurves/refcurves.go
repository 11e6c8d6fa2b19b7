// Package refcurves finds the real, published tension-test curves the
// project's tests check against (CC BY 4.0; sources in the folder's README
// and the project README). They live in the shared folder beside the
// repository, data/reference-curves, so a curve dropped in there is checked
// by every table-driven test over the folder.
package refcurves

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"testing"
)

// EnvDir overrides where the curves are.
const EnvDir = "FRAMED_REFERENCE_CURVES"

// EnvRequire makes missing curves a test failure instead of a skip (CI).
const EnvRequire = "FRAMED_REQUIRE_REFERENCE_CURVES"

// ErrNotFound: no reference-curve folder was found.
var ErrNotFound = errors.New("reference curves not found")

// Dir returns the reference-curve folder: $FRAMED_REFERENCE_CURVES, else
// ../shared/data/reference-curves beside the repository root.
func Dir() (string, error) {
	if d := os.Getenv(EnvDir); d != "" {
		if st, err := os.Stat(d); err == nil && st.IsDir() {
			return d, nil
		}
		return "", fmt.Errorf("%w: %s=%q is not a folder", ErrNotFound, EnvDir, d)
	}
	_, file, _, ok := runtime.Caller(0)
	if !ok {
		return "", ErrNotFound
	}
	root := filepath.Join(filepath.Dir(file), "..", "..")
	d := filepath.Join(root, "..", "shared", "data", "reference-curves")
	if st, err := os.Stat(d); err == nil && st.IsDir() {
		return filepath.Clean(d), nil
	}
	return "", fmt.Errorf("%w: looked in %s (set %s)", ErrNotFound, filepath.Clean(d), EnvDir)
}

// Require returns the folder or skips the test loudly; with
// FRAMED_REQUIRE_REFERENCE_CURVES=1 a missing folder fails the test.
func Require(t testing.TB) string {
	t.Helper()
	d, err := Dir()
	if err == nil {
		return d
	}
	if os.Getenv(EnvRequire) == "1" {
		t.Fatalf("%v and %s=1", err, EnvRequire)
	}
	t.Skipf("SKIPPING reference-curve checks: %v", err)
	return ""
}
