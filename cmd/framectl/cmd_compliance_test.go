package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A rigid block on a load train of 50 kN/mm: the crosshead moves F/k, so
// the compliance is 1/k = 2e-5 mm/N exactly (Hooke's law for the train,
// a mathematical fact of the construction).
func TestComplianceRigid(t *testing.T) {
	var b strings.Builder
	b.WriteString("time_s,force_N,extension_mm,crosshead_mm\n")
	for i := 0; i <= 200; i++ {
		f := float64(i) * 100
		fmt.Fprintf(&b, "%d,%g,,%g\n", i, f, f/50000)
	}
	path := filepath.Join(t.TempDir(), "rigid.csv")
	os.WriteFile(path, []byte(b.String()), 0o600)
	var out, errb bytes.Buffer
	if code := run([]string{"compliance", path, "--rigid"}, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	if !strings.Contains(out.String(), "2e-05 mm/N") {
		t.Errorf("output %q, want 2e-05 mm/N", out.String())
	}
	if code := run([]string{"compliance", path}, &out, &errb); code != 2 {
		t.Errorf("no method given: exit %d, want 2", code)
	}
}
