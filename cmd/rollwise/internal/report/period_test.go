package report

import (
	"testing"
	"time"
)

// A value shows as a period only when it starts one; otherwise in full.
func TestPeriodLabel(t *testing.T) {
	d := func(y int, m time.Month, day, h int) time.Time { return time.Date(y, m, day, h, 0, 0, 0, time.UTC) }
	cases := []struct {
		t      time.Time
		period string
		want   string
		ok     bool
	}{
		{d(2026, 3, 1, 0), "month", "2026-03", true},
		{d(2026, 4, 1, 0), "quarter", "2026-Q2", true},
		{d(2026, 10, 1, 0), "quarter", "2026-Q4", true},
		{d(2026, 1, 1, 0), "year", "2026", true},
		{d(2026, 2, 1, 0), "quarter", "", false}, // not a quarter's start
		{d(2026, 3, 1, 0), "year", "", false},
		{d(2026, 3, 2, 0), "month", "", false},
		{d(2026, 3, 1, 10), "month", "", false}, // not midnight
		{d(2026, 3, 1, 0), "", "", false},
	}
	for _, c := range cases {
		if got, ok := periodLabel(c.t, c.period); got != c.want || ok != c.ok {
			t.Errorf("periodLabel(%v, %q) = %q, %v; want %q, %v", c.t, c.period, got, ok, c.want, c.ok)
		}
	}
}
