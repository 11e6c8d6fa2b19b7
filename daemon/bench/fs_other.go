//go:build !linux

package bench

// inMemoryFS cannot tell outside Linux.
func inMemoryFS(dir string) bool { return false }
