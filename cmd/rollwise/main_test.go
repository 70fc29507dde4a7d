package main

import (
	"flag"
	"os"
	"runtime"
	"strconv"
	"testing"
)

// TestMain runs twice as many tests at once as the machine has cores
// (unless -parallel is given): many of them wait rather than compute, on
// the live servers, on a browser or a child process, or on a timeout.
func TestMain(m *testing.M) {
	flag.Parse()
	given := false
	flag.Visit(func(f *flag.Flag) { given = given || f.Name == "test.parallel" })
	if !given {
		flag.Set("test.parallel", strconv.Itoa(2*runtime.GOMAXPROCS(0)))
	}
	os.Exit(m.Run())
}
