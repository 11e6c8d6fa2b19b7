package bench

import (
	"os/exec"
	"syscall"
)

// dieWithParent makes the kernel stop the child when the measuring process
// dies, so an interrupted bench leaves no daemon behind.
func dieWithParent(cmd *exec.Cmd) {
	cmd.SysProcAttr = &syscall.SysProcAttr{Pdeathsig: syscall.SIGTERM}
}
