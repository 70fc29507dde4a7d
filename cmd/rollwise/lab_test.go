package main

import (
	"bytes"
	"math"
	"strings"
	"testing"
)

// Every golden case runs: the shop cases, the construct lab
// (testdata/dialects/lab.roll), the hostile names and values and the time
// cases, each on DuckDB and, through runJSON's cross-check, on SQLite,
// PostgreSQL and MySQL/MariaDB, which must give DuckDB's rows. The golden
// text alone proves nothing (dialects/golden_test.go compares it); the
// values below are the traps of dialects.md, worked out by hand from
// visits.csv.
func TestCasesRunOnEveryEngine(t *testing.T) {
	t.Parallel()
	for _, c := range goldenCases(t) {
		t.Run(c.Set+"/"+c.Name, func(t *testing.T) {
			got := runJSON(t, append(append([]string{"run"}, c.Models...), c.Args...)...)
			if empty := noRowCases[c.Set+"/"+c.Name]; empty != (len(got) == 0) {
				t.Errorf("%d rows; a row is due: %v", len(got), !empty)
			}
		})
	}
}

// noRowCases are the cases whose filter keeps no row by design: the
// hostile values of shop/hostile_literal name no region of the shop.
var noRowCases = map[string]bool{"shop/hostile_literal": true}

// Integer ratios are fractional, statistics are the sample ones.
func TestLabRatiosAndStatistics(t *testing.T) {
	t.Parallel()
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
	t.Parallel()
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

// count(distinct visits.patient) is planned as the per-grain count of
// patients: next to avg(total_minutes per visits.patient) both come from
// one grouping by patient; narrowed (urgent visits) and pinned (ward
// North) it has its own; alone, or where the scan of visits computes
// nothing else, it stays a DISTINCT aggregate. The values are the same
// every way. Per patient: 1 (North) 30 + 45 minutes on visits 1 and 2, 2
// (South) 15 + NULL, 3 (North) 60 + 20, 4 (East) 1; visit 7 has no
// patient: its group is not counted, and its minutes average nothing.
func TestLabDistinctCountsAsPerGrain(t *testing.T) {
	t.Parallel()
	year := func(y string) string { return y + "-01-01" }
	want := []row{
		{"patients.ward": "East", "visits.seen_year": year("2024"), "visits_n": 1, "patients_seen": 1, "patient_minutes": 1.0,
			"urgent_patients": 1, "north_patients": 2}, // North in 2024: patients 1 and 3
		{"patients.ward": "East", "visits.seen_year": nil, "visits_n": 1, "patients_seen": 1, "patient_minutes": 1.0,
			"urgent_patients": 1, "north_patients": 2},
		{"patients.ward": "North", "visits.seen_year": year("2021"), "visits_n": 1, "patients_seen": 1, "patient_minutes": 45.0,
			"urgent_patients": 0, "north_patients": 1},
		{"patients.ward": "North", "visits.seen_year": year("2023"), "visits_n": 1, "patients_seen": 1, "patient_minutes": 20.0,
			"urgent_patients": 1, "north_patients": 1},
		// patient 1 (30) and 3 (60); only visit 1 (patient 1) is urgent.
		{"patients.ward": "North", "visits.seen_year": year("2024"), "visits_n": 2, "patients_seen": 2, "patient_minutes": 45.0,
			"urgent_patients": 1, "north_patients": 2},
		// the subtotal regroups: patient 1 75, patient 3 80; urgent visits 1 and 6.
		{"patients.ward": "North", "visits.seen_year": nil, "visits_n": 4, "patients_seen": 2, "patient_minutes": 77.5,
			"urgent_patients": 2, "north_patients": 2},
		// visit 4's urgent is NULL: only visit 3 counts.
		{"patients.ward": "South", "visits.seen_year": year("2024"), "visits_n": 2, "patients_seen": 1, "patient_minutes": 15.0,
			"urgent_patients": 1, "north_patients": 2},
		{"patients.ward": "South", "visits.seen_year": nil, "visits_n": 2, "patients_seen": 1, "patient_minutes": 15.0,
			"urgent_patients": 1, "north_patients": 2},
		// visit 7 alone: a NULL patient is no patient.
		{"patients.ward": nil, "visits.seen_year": year("2024"), "visits_n": 1, "patients_seen": 0, "patient_minutes": nil,
			"urgent_patients": 0, "north_patients": 2},
		{"patients.ward": nil, "visits.seen_year": nil, "visits_n": 1, "patients_seen": 0, "patient_minutes": nil,
			"urgent_patients": 0, "north_patients": 2, "rolled_up": []string{"visits.seen_year"}},
		// patients 1 to 4, not the NULL one: (75 + 15 + 80 + 1) / 4.
		{"patients.ward": nil, "visits.seen_year": nil, "visits_n": 8, "patients_seen": 4, "patient_minutes": 42.75,
			"urgent_patients": 4, "north_patients": 2, "rolled_up": []string{"patients.ward", "visits.seen_year"}},
	}
	// distinctAggs counts the DISTINCT aggregates of the query's SQL.
	distinctAggs := func(args ...string) int {
		t.Helper()
		var out, errb bytes.Buffer
		if code := Main(append([]string{"sql", labModel}, args...), nil, &out, &errb); code != 0 {
			t.Fatalf("rollwise sql: exit %d: %s", code, errb.String())
		}
		return strings.Count(out.String(), "count(DISTINCT")
	}
	args := []string{"-b", "patients.ward,visits.seen_year", "--totals", "rollup"}
	all := append([]string{"-m", "visits_n,patients_seen,patient_minutes,urgent_patients,north_patients"}, args...)
	if n := distinctAggs(all...); n != 0 {
		t.Errorf("%d DISTINCT aggregates beside visits_n, want 0 (three per-grain counts)", n)
	}
	got := runJSON(t, append([]string{"run", labModel}, all...)...)
	expectRows(t, got, want)
	// Without visits_n the scan of visits only forms the rows: the narrowed
	// count goes back into it as count(DISTINCT ...) FILTER (...).
	for _, w := range want {
		delete(w, "visits_n")
	}
	four := append([]string{"-m", "patients_seen,patient_minutes,urgent_patients,north_patients"}, args...)
	if n := distinctAggs(four...); n != 1 {
		t.Errorf("%d DISTINCT aggregates without visits_n, want 1 (urgent_patients)", n)
	}
	got = runJSON(t, append([]string{"run", labModel}, four...)...)
	expectRows(t, got, want)
	alone := []string{"-m", "patients_seen,urgent_patients", "-b", "patients.ward", "--totals", "grand"}
	if n := distinctAggs(alone...); n != 2 {
		t.Errorf("%d DISTINCT aggregates alone, want 2", n)
	}
	got = runJSON(t, append([]string{"run", labModel}, alone...)...)
	expectRows(t, got, []row{
		{"patients.ward": "East", "patients_seen": 1, "urgent_patients": 1},
		{"patients.ward": "North", "patients_seen": 2, "urgent_patients": 2},
		{"patients.ward": "South", "patients_seen": 1, "urgent_patients": 1},
		{"patients.ward": nil, "patients_seen": 0, "urgent_patients": 0, "rolled_up": none},
		{"patients.ward": nil, "patients_seen": 4, "urgent_patients": 4, "rolled_up": []string{"patients.ward"}},
	})
}

// Medians, worked out by hand from visits.csv: the engines without a
// median aggregate number the rows (render_median.go), so this is checked
// on SQLite and MySQL/MariaDB by runJSON's cross-check, at every total
// level. Minutes by ward: North 30, 45, 60, 20 (even: (30 + 45) / 2),
// South 15 and NULL (the NULL is skipped), East 1, no ward 7; all seven:
// 1 7 15 20 30 45 60. Urgent visits only: North 30, 20; South 15; East
// 1; visit 4's urgent is NULL, visit 7's false; all: 1 15 20 30. Per
// patient (minutes summed; the visit without a patient is skipped):
// North 75 and 80, South 15, East 1; all: 1 15 75 80.
func TestLabMedians(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", labModel, "-m", "mid_minutes,urgent_mid,patient_mid", "-b", "patients.ward", "--totals", "rollup")
	expectRows(t, got, []row{
		{"patients.ward": "East", "mid_minutes": 1.0, "urgent_mid": 1.0, "patient_mid": 1.0},
		{"patients.ward": "North", "mid_minutes": 37.5, "urgent_mid": 25.0, "patient_mid": 77.5},
		{"patients.ward": "South", "mid_minutes": 15.0, "urgent_mid": 15.0, "patient_mid": 15.0},
		{"patients.ward": nil, "mid_minutes": 7.0, "urgent_mid": nil, "patient_mid": nil, "rolled_up": none},
		{"patients.ward": nil, "mid_minutes": 20.0, "urgent_mid": 17.5, "patient_mid": 45.0, "rolled_up": []string{"patients.ward"}},
	})
}

// Nested arithmetic keeps its meaning where the SQL leaves parentheses
// out (a - b - c, a + b * c) and keeps them (a - (b - c), a * (b - c)):
// nested_arith = n - (m - n) - n * (n - 2) + coalesce(m - 100, 0) / (n - 6)
// with n visits and m minutes.
func TestLabNestedArithmetic(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", labModel, "-m", "nested_arith,visits_n,total_minutes", "-b", "patients.ward", "--totals", "grand")
	expectRows(t, got, []row{
		// East: n 1, m 1: 1 - 0 + 1 + -99 / -5 = 21.8
		{"patients.ward": "East", "visits_n": 1, "total_minutes": 1, "nested_arith": 21.8},
		// North: n 4, m 155: 4 - 151 - 8 + 55 / -2 = -182.5
		{"patients.ward": "North", "visits_n": 4, "total_minutes": 155, "nested_arith": -182.5},
		// South: n 2, m 15: 2 - 13 - 0 + -85 / -4 = 10.25
		{"patients.ward": "South", "visits_n": 2, "total_minutes": 15, "nested_arith": 10.25},
		// no ward: n 1, m 7: 1 - 6 + 1 + -93 / -5 = 14.6
		{"patients.ward": nil, "visits_n": 1, "total_minutes": 7, "nested_arith": 14.6},
		// all: n 8, m 178: 8 - 170 - 48 + 78 / 2 = -171
		{"patients.ward": nil, "visits_n": 8, "total_minutes": 178, "nested_arith": -171.0},
	})
}
