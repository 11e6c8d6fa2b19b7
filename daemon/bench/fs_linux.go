package bench

import "syscall"

// tmpfsMagic is TMPFS_MAGIC of statfs(2).
const tmpfsMagic = 0x01021994

// inMemoryFS reports whether dir is on tmpfs, where nothing reaches a disk:
// the storage figures would then measure memory, and write_bytes stays 0.
func inMemoryFS(dir string) bool {
	var st syscall.Statfs_t
	if err := syscall.Statfs(dir, &st); err != nil {
		return false
	}
	return int64(st.Type) == tmpfsMagic
}
