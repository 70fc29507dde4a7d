package main

import (
	"bytes"
	"context"
	"strings"
	"testing"
)

func TestRunUsage(t *testing.T) {
	for _, c := range []struct {
		args []string
		code int
		says string
	}{
		{nil, 2, "usage: tpchgen"},
		{[]string{"-sf", "0.01"}, 2, "usage: tpchgen"},
		{[]string{"-out", t.TempDir(), "extra"}, 2, "usage: tpchgen"},
		{[]string{"-sf", "x", "-out", t.TempDir()}, 2, "invalid value"},
		{[]string{"-h"}, 0, "usage: tpchgen"},
		{[]string{"-sf", "1.5", "-out", t.TempDir()}, 1, "whole numbers"},
		{[]string{"-sf", "0.0001", "-out", t.TempDir()}, 1, "multiples of 0.001"},
	} {
		var stderr bytes.Buffer
		code := run(context.Background(), c.args, &stderr)
		if code != c.code || !strings.Contains(stderr.String(), c.says) {
			t.Errorf("tpchgen %q: exit %d, want %d; stderr:\n%s", c.args, code, c.code, stderr.String())
		}
	}
}
