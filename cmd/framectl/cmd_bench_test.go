package main

import (
	"bytes"
	"context"
	"errors"
	"testing"
)

// Bad command lines are usage errors and start no measurement.
func TestBenchRefusesBadArguments(t *testing.T) {
	for _, args := range [][]string{
		{"--quick", "--long"},
		{"--no-such-flag"},
		{"extra"},
	} {
		var out, errOut bytes.Buffer
		err := runBench(context.Background(), args, &out, &errOut)
		if !errors.Is(err, errUsage) {
			t.Errorf("bench %q: %v, want a usage error", args, err)
		}
		if out.Len() > 0 {
			t.Errorf("bench %q printed %q", args, out.String())
		}
	}
}
