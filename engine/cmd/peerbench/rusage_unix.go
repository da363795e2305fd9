//go:build unix

package main

import "syscall"

// maxRSSMB is the process's peak resident memory (Linux reports kilobytes).
func maxRSSMB() float64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return float64(ru.Maxrss) / 1024
}
