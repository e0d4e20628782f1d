// Package sysmem tells how much memory this process may use: the machine's
// physical memory, or the limit of its control group (a container or a
// Slurm job) when that is lower.
package sysmem

import (
	"bufio"
	"bytes"
	"os"
	"strconv"
	"strings"
)

// Available returns the memory this process may use, bytes, or 0 when it
// cannot be read (a system without /proc).
func Available() uint64 {
	total := memTotal()
	for _, path := range []string{
		"/sys/fs/cgroup/memory.max",                   // cgroup v2
		"/sys/fs/cgroup/memory/memory.limit_in_bytes", // cgroup v1
	} {
		if limit, ok := readLimit(path); ok && (total == 0 || limit < total) {
			total = limit
		}
	}
	return total
}

// memTotal reads MemTotal from /proc/meminfo (kB), or returns 0.
func memTotal() uint64 {
	b, err := os.ReadFile("/proc/meminfo")
	if err != nil {
		return 0
	}
	return parseMemTotal(b)
}

func parseMemTotal(b []byte) uint64 {
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) >= 2 && f[0] == "MemTotal:" {
			kb, err := strconv.ParseUint(f[1], 10, 64)
			if err == nil {
				return kb << 10
			}
		}
	}
	return 0
}

// readLimit reads a control-group limit in bytes; "max" and the huge
// values that mean no limit report false.
func readLimit(path string) (uint64, bool) {
	b, err := os.ReadFile(path)
	if err != nil {
		return 0, false
	}
	v, err := strconv.ParseUint(strings.TrimSpace(string(b)), 10, 64)
	if err != nil || v >= 1<<60 {
		return 0, false
	}
	return v, true
}
