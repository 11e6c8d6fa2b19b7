package bench

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// The /proc readings agree with what the kernel reports through another
// door, getrusage(2): resident memory is positive and at most the peak
// (ru_maxrss, KiB on Linux), and utime+stime match ru_utime+ru_stime to
// within a few clock ticks (both count the same process's time; /proc in
// USER_HZ ticks, proc(5)).
func TestProcAgreesWithGetrusage(t *testing.T) {
	// Burn some CPU so the times are not both zero.
	x := 0.0
	for i := range 30_000_000 {
		x += float64(i % 7)
	}
	p, err := readProc(os.Getpid())
	if errors.Is(err, ErrNoProc) {
		t.Skipf("no /proc here: %v", err)
	}
	if err != nil {
		t.Fatal(err)
	}
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		t.Fatal(err)
	}
	if p.rssKB <= 0 || p.rssKB > ru.Maxrss {
		t.Errorf("VmRSS %d KiB, want 0 < rss <= ru_maxrss %d KiB", p.rssKB, ru.Maxrss)
	}
	// VmRSS = RssAnon + RssFile + RssShmem (proc(5)).
	if p.rssAnonKB <= 0 || p.rssAnonKB > p.rssKB {
		t.Errorf("RssAnon %d KiB, want 0 < RssAnon <= VmRSS %d KiB", p.rssAnonKB, p.rssKB)
	}
	ruTicks := (ru.Utime.Sec+ru.Stime.Sec)*clockTicksPerS + (int64(ru.Utime.Usec)+int64(ru.Stime.Usec))*clockTicksPerS/1e6
	if d := p.cpuTicks - ruTicks; d < -5 || d > 5 {
		t.Errorf("utime+stime %d ticks, getrusage %d ticks (x=%g)", p.cpuTicks, ruTicks, x)
	}
}

// Writing and syncing a megabyte shows up in write_bytes: the counter
// write amplification is built on (proc(5): bytes this process caused to
// be sent to the storage layer). Skipped where the file system does not
// account writes (tmpfs).
func TestWriteBytesCountsFileWrites(t *testing.T) {
	p0, err := readProc(os.Getpid())
	if err != nil {
		t.Skipf("no /proc here: %v", err)
	}
	f, err := os.Create(filepath.Join(t.TempDir(), "w"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	buf := make([]byte, 1<<20)
	if _, err := f.Write(buf); err != nil {
		t.Fatal(err)
	}
	if err := f.Sync(); err != nil {
		t.Fatal(err)
	}
	p1, err := readProc(os.Getpid())
	if err != nil {
		t.Fatal(err)
	}
	d := p1.writeBytes - p0.writeBytes
	if d == 0 {
		t.Skip("this file system does not account writes to the process")
	}
	if d < 1<<20 {
		t.Errorf("write_bytes grew by %d after writing 1 MiB", d)
	}
}

// /proc/PID/stat's second field is the command in parentheses, which may
// itself hold spaces and parentheses (proc(5)); fields are counted from
// the last ')'. Field 4 is ppid, 14 utime, 15 stime.
func TestParseStat(t *testing.T) {
	line := "4242 (a (b) c) S 17 4242 4242 0 -1 4194560 120 0 0 0 31 9 0 0 20 0 3 0 100 1000 50\n"
	ticks, ppid, err := parseStat([]byte(line))
	if err != nil {
		t.Fatal(err)
	}
	if ticks != 40 || ppid != 17 {
		t.Errorf("ticks %d ppid %d, want 31+9=40 and 17", ticks, ppid)
	}
	for _, bad := range []string{"", "12 (x", "12 (x) S 1 2", "1 (x) S 1 1 1 0 -1 0 0 0 0 0 ab 9 0"} {
		if _, _, err := parseStat([]byte(bad)); !errors.Is(err, ErrNoProc) {
			t.Errorf("parseStat(%q) = %v, want ErrNoProc", bad, err)
		}
	}
}

// inMemoryFS agrees with the kernel's mount table (/proc/mounts, proc(5))
// for the root and /dev/shm, where it lists them as tmpfs or ext4.
func TestInMemoryFSAgreesWithMounts(t *testing.T) {
	raw, err := os.ReadFile("/proc/mounts")
	if err != nil {
		t.Skipf("no /proc/mounts: %v", err)
	}
	checked := 0
	for line := range strings.Lines(string(raw)) {
		f := strings.Fields(line)
		if len(f) < 3 || (f[1] != "/" && f[1] != "/dev/shm") || (f[2] != "tmpfs" && f[2] != "ext4") {
			continue
		}
		if _, err := os.Stat(f[1]); err != nil {
			continue
		}
		if got := inMemoryFS(f[1]); got != (f[2] == "tmpfs") {
			t.Errorf("%s (%s): inMemoryFS = %v", f[1], f[2], got)
		}
		checked++
	}
	if checked == 0 {
		t.Skip("no tmpfs or ext4 mounts to check")
	}
}
