package main

import (
	"bytes"
	"strings"
	"testing"
)

// Repeated -w combine with and (issue 13, bug 1): before, the last one
// alone was kept and this query gave the rose revenue of every region
// (10 + 5 + 3 = 18.00).
func TestRepeatedWhereCombines(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", shopModel, "-m", "revenue", "-w", "stores.region = 'North'", "-w", "sales.item = 'rose'")
	expectRows(t, got, []row{
		{"revenue": "15.00"}, // North roses: 2.50*4 + 2.50*2
	})
	// An or inside one -w stays inside it: (North or South) and fern is
	// the North fern only (10.00), not North or (South and fern) = 25.00.
	got = runJSON(t, "run", shopModel, "-m", "revenue", "-w", "stores.region = 'North' or stores.region = 'South'", "-w", "sales.item = 'fern'")
	expectRows(t, got, []row{
		{"revenue": "10.00"},
	})
}

// A single-valued flag given twice is a usage error that names the flag,
// not a silent choice of the last value.
func TestRepeatedSingleFlagRefused(t *testing.T) {
	t.Parallel()
	base := []string{"run", shopModel, "-m", "revenue", "-b", "stores.region"}
	for _, c := range []struct {
		flag string
		args []string
	}{
		{"order", []string{"--order", "revenue", "--order", "revenue desc"}},
		{"totals", []string{"--totals", "grand", "--totals", "rollup"}},
		{"limit", []string{"--limit", "1", "--limit", "2"}},
		{"format", []string{"--format", "csv", "--format", "json"}},
		{"dialect", []string{"-d", "duckdb", "-d", "postgres"}},
	} {
		var out, errb bytes.Buffer
		code := Main(append(append([]string{}, base...), c.args...), strings.NewReader(""), &out, &errb)
		if code != exitUsage {
			t.Errorf("--%s twice: exit %d, want %d\n%s", c.flag, code, exitUsage, errb.String())
		}
		if !strings.Contains(errb.String(), "--"+c.flag+" is given more than once") {
			t.Errorf("--%s twice: the message does not name the flag:\n%s", c.flag, errb.String())
		}
	}
}
