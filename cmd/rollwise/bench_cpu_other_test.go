//go:build !unix

package main

import "time"

// processCPU is not measured on this system; the benchmarks then report
// CPU figures of 0.
func processCPU() time.Duration { return 0 }
