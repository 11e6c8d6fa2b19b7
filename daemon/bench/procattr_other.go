//go:build !linux

package bench

import "os/exec"

// dieWithParent: only Linux can tie a child's life to its parent; the
// child's own MAX_SECONDS bound still holds elsewhere.
func dieWithParent(cmd *exec.Cmd) {}
