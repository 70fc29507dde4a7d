package reference

import (
	"testing"
	"time"
)

// Month arithmetic against the end-of-month rule of SQL's interval
// arithmetic as the PostgreSQL documentation states it ("Date/Time
// Functions and Operators", section 9.9.1, Date/Time Operators): "March
// 31 plus 1 month becomes April 30, but March 31 plus 2 months becomes
// May 31". ISO 8601 weeks start on Monday: 2026-01-01 is a Thursday in
// the week that starts on Monday 2025-12-29 (ISO week 1 of 2026).
func TestMoveAndWeekStart(t *testing.T) {
	d := func(s string) time.Time {
		v, err := time.Parse("2006-01-02", s)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	for _, c := range []struct {
		from string
		s    step
		want string
	}{
		{"2026-03-31", step{1, "month"}, "2026-04-30"},  // PostgreSQL 9.9.1
		{"2026-03-31", step{2, "month"}, "2026-05-31"},  // PostgreSQL 9.9.1
		{"2026-03-31", step{-1, "month"}, "2026-02-28"}, // language.md, Time
		{"2024-02-29", step{1, "year"}, "2025-02-28"},
		{"2024-02-29", step{4, "year"}, "2028-02-29"},
		{"2025-11-30", step{1, "quarter"}, "2026-02-28"},
		{"2026-01-05", step{-1, "week"}, "2025-12-29"},
		{"2026-01-01", step{-1, "day"}, "2025-12-31"},
		{"2026-01-31", step{-13, "month"}, "2024-12-31"},
	} {
		if got := move(d(c.from), c.s).Format("2006-01-02"); got != c.want {
			t.Errorf("%s moved %+d %s: got %s, want %s", c.from, c.s.n, c.s.unit, got, c.want)
		}
	}
	if got := truncate("week", d("2026-01-01")).Format("2006-01-02"); got != "2025-12-29" {
		t.Errorf("ISO week of 2026-01-01 starts %s, want Monday 2025-12-29", got)
	}
	if y, w := d("2025-12-29").ISOWeek(); y != 2026 || w != 1 {
		t.Errorf("2025-12-29 is in ISO week %d-%d, want 2026-1", y, w)
	}
}
