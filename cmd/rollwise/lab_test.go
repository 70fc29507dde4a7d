package main

import (
	"math"
	"testing"
)

// The construct lab (testdata/dialects/lab.roll) on every engine: each
// case of testdata/dialects/lab and testdata/dialects/hostile runs on
// DuckDB and, through runJSON's cross-check, on SQLite, PostgreSQL and
// MySQL/MariaDB, which must give DuckDB's rows. The values below are the
// traps of dialects.md, worked out by hand from visits.csv.
func TestLabCasesOnEveryEngine(t *testing.T) {
	for _, c := range goldenCases(t) {
		if c.set == "shop" {
			continue // the shop cases run in TestGoldenSQL
		}
		t.Run(c.set+"/"+c.name, func(t *testing.T) {
			got := runJSON(t, append(append([]string{"run"}, c.models...), c.args...)...)
			if len(got) == 0 {
				t.Error("no rows")
			}
		})
	}
}

// Integer ratios are fractional, statistics are the sample ones.
func TestLabRatiosAndStatistics(t *testing.T) {
	got := runJSON(t, "run", labModel, "-m", "visits_n,total_minutes,avg_minutes,per_visit,urgent_share,var_score,sd_score",
		"-b", "patients.ward", "--totals", "grand")
	expectRows(t, got, []row{
		{"patients.ward": "East", "per_visit": 1.0, "var_score": nil}, // one score: no sample variance
		{"patients.ward": "North", "visits_n": 4, "total_minutes": 155},
		// 15 minutes over 2 visits: 7.5, not 7; scores 0.125 and 9.75:
		// sample variance 9.625^2/2 = 46.3203125 (the population one is half).
		{"patients.ward": "South", "per_visit": 7.5, "avg_minutes": 15.0, "var_score": 46.3203125},
		{"patients.ward": nil, "visits_n": 1, "urgent_share": 0.0},
		{"patients.ward": nil, "visits_n": 8, "total_minutes": 178, "per_visit": 22.25, "avg_minutes": 178.0 / 7, // minutes NULL on one visit
			"urgent_share": 0.5, "var_score": 15.995256696428571, "sd_score": math.Sqrt(15.995256696428571)},
	})
}

// ISO weeks (2024-12-30 is in week 1 of 2025, 2021-01-03 in week 53),
// rounding half away from zero, casts that round, greatest over a NULL.
func TestLabDatesAndRounding(t *testing.T) {
	got := runJSON(t, "run", labModel, "-m", "visits_n", "-b", "visits.id,visits.iso_week,visits.seen_week", "-w", "visits.id <= 2")
	expectRows(t, got, []row{
		{"visits.id": 1, "visits.iso_week": 1, "visits.seen_week": "2024-12-30"},  // a Monday
		{"visits.id": 2, "visits.iso_week": 53, "visits.seen_week": "2020-12-28"}, // Sunday 2021-01-03
	})
	got = runJSON(t, "run", labModel, "-m", "rounded_sum,rounded2_sum,fee_ints,top_longest", "-b", "visits.id", "-w", "visits.id in (1, 2, 3, 4)")
	expectRows(t, got, []row{
		{"visits.id": 1, "rounded_sum": "3", "fee_ints": "41", "top_longest": 30.0}, // round(2.5) = 3; 40.50 -> 41
		{"visits.id": 2, "rounded_sum": "-3", "fee_ints": "60"},                     // round(-2.5) = -3
		{"visits.id": 3, "rounded2_sum": "0.13", "fee_ints": "20"},                  // round(0.125, 2) = 0.13; 20.25 -> 20
		{"visits.id": 4, "top_longest": 9.75, "fee_ints": nil},                      // greatest(9.75, NULL) = 9.75
	})
	got = runJSON(t, "run", labModel, "-m", "rounded2_sum", "-b", "visits.id", "-w", "visits.id = 8")
	expectRows(t, got, []row{{"visits.id": 8, "rounded2_sum": "-2.63"}}) // half away from zero, not to even (-2.62)
}
