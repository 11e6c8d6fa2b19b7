package bench

import (
	"bytes"
	"fmt"
	"os"
	"strconv"
	"strings"
)

// clockTicksPerS is USER_HZ, the unit of utime and stime in /proc/PID/stat:
// 100 on every Linux architecture framed runs on (common practice; the
// kernel exports times in USER_HZ whatever its internal HZ).
const clockTicksPerS = 100

// procSample is one reading of a process's counters.
type procSample struct {
	rssKB int64 // VmRSS: resident, private and file-backed
	// rssAnonKB is the private (heap, stacks) part of rssKB; the rest is
	// file-backed: the binary's code and the store's memory map, clean
	// pages the kernel can drop under pressure.
	rssAnonKB  int64
	cpuTicks   int64 // utime + stime
	writeBytes int64 // bytes the process caused to be sent to storage
}

func readProc(pid int) (procSample, error) {
	var s procSample
	status, err := os.ReadFile(fmt.Sprintf("/proc/%d/status", pid))
	if err != nil {
		return s, fmt.Errorf("%w: %w", ErrNoProc, err)
	}
	for line := range strings.Lines(string(status)) {
		for _, k := range []struct {
			key string
			dst *int64
		}{{"VmRSS:", &s.rssKB}, {"RssAnon:", &s.rssAnonKB}} {
			if rest, ok := strings.CutPrefix(line, k.key); ok {
				if f := strings.Fields(rest); len(f) > 0 {
					*k.dst, _ = strconv.ParseInt(f[0], 10, 64)
				}
			}
		}
	}
	if s.cpuTicks, _, err = readStat(pid); err != nil {
		return s, err
	}
	io, err := os.ReadFile(fmt.Sprintf("/proc/%d/io", pid))
	if err != nil {
		return s, fmt.Errorf("%w: %w", ErrNoProc, err)
	}
	for line := range strings.Lines(string(io)) {
		if rest, ok := strings.CutPrefix(line, "write_bytes:"); ok {
			s.writeBytes, _ = strconv.ParseInt(strings.TrimSpace(rest), 10, 64)
		}
	}
	return s, nil
}

// readStat returns utime+stime and the parent pid from /proc/PID/stat.
// The command name may hold spaces and parentheses, so fields are counted
// from the last ')'.
func readStat(pid int) (ticks int64, ppid int, err error) {
	b, err := os.ReadFile(fmt.Sprintf("/proc/%d/stat", pid))
	if err != nil {
		return 0, 0, fmt.Errorf("%w: %w", ErrNoProc, err)
	}
	ticks, ppid, err = parseStat(b)
	if err != nil {
		return 0, 0, fmt.Errorf("/proc/%d/stat: %w", pid, err)
	}
	return ticks, ppid, nil
}

// parseStat reads utime+stime and ppid from the text of /proc/PID/stat.
func parseStat(b []byte) (ticks int64, ppid int, err error) {
	i := bytes.LastIndexByte(b, ')')
	if i < 0 {
		return 0, 0, fmt.Errorf("%w: no command field in %q", ErrNoProc, b)
	}
	f := strings.Fields(string(b[i+1:]))
	// f[0] is field 3 (state): ppid is field 4, utime 14, stime 15.
	if len(f) < 13 {
		return 0, 0, fmt.Errorf("%w: %d fields in %q", ErrNoProc, len(f)+2, b)
	}
	ppid, _ = strconv.Atoi(f[1])
	ut, err1 := strconv.ParseInt(f[11], 10, 64)
	st, err2 := strconv.ParseInt(f[12], 10, 64)
	if err1 != nil || err2 != nil {
		return 0, 0, fmt.Errorf("%w: times %q %q", ErrNoProc, f[11], f[12])
	}
	return ut + st, ppid, nil
}

// childPIDs lists the processes whose parent is pid (the daemon's driver
// processes).
func childPIDs(pid int) []int {
	ents, err := os.ReadDir("/proc")
	if err != nil {
		return nil
	}
	var out []int
	for _, e := range ents {
		c, err := strconv.Atoi(e.Name())
		if err != nil {
			continue
		}
		if _, pp, err := readStat(c); err == nil && pp == pid {
			out = append(out, c)
		}
	}
	return out
}
