package dialects

import (
	"errors"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/model"
)

// spelling is one dialect's expected spelling of each construct; the
// comments in the dialects' files say why each differs.
type spelling struct {
	ident, str, date, ts, divide, stddev, variance, avg, median    string
	truncMonth, truncWeekTS, extractWeek, bitAnd, nullSafe, concat string
	grouping2, greatest2, roundFloat, castFloatInt, count, limit   string
}

var spellings = map[string]spelling{
	"duckdb": {
		ident: `"a""b"`, str: `'it''s \ ok'`, date: `DATE '2026-03-01'`, ts: `TIMESTAMP '2026-03-01 10:00:00'`,
		divide: `x / NULLIF(y, 0)`, stddev: `stddev_samp(x)`, variance: `var_samp(x)`, avg: `avg(x)`, median: `median(CAST(x AS DOUBLE))`,
		truncMonth: `CAST(date_trunc('month', d) AS DATE)`, truncWeekTS: `date_trunc('week', d)`,
		extractWeek: `EXTRACT(WEEK FROM d)`, bitAnd: `(g & 1)`, nullSafe: `a IS NOT DISTINCT FROM b`,
		concat: `(a || b)`, grouping2: `GROUPING("a", "b")`, greatest2: `greatest(a, b)`, roundFloat: `round(x)`,
		castFloatInt: `CAST(x AS BIGINT)`, count: `count(x)`, limit: `|LIMIT 5`,
	},
	"postgres": {
		ident: `"a""b"`, str: `E'it''s \\ ok'`, date: `DATE '2026-03-01'`, ts: `TIMESTAMP '2026-03-01 10:00:00'`,
		divide: `CAST(x AS DOUBLE PRECISION) / NULLIF(y, 0)`, stddev: `stddev_samp(CAST(x AS DOUBLE PRECISION))`,
		variance: `var_samp(CAST(x AS DOUBLE PRECISION))`, avg: `avg(CAST(x AS DOUBLE PRECISION))`,
		median:     `percentile_cont(0.5) WITHIN GROUP (ORDER BY CAST(x AS DOUBLE PRECISION))`,
		truncMonth: `CAST(date_trunc('month', CAST(d AS TIMESTAMP)) AS DATE)`, truncWeekTS: `date_trunc('week', d)`,
		extractWeek: `CAST(EXTRACT(WEEK FROM d) AS BIGINT)`, bitAnd: `(g & 1)`, nullSafe: `a IS NOT DISTINCT FROM b`,
		concat: `(a || b)`, grouping2: `GROUPING("a", "b")`, greatest2: `greatest(a, b)`,
		roundFloat: `CAST(round(CAST(x AS NUMERIC)) AS DOUBLE PRECISION)`, castFloatInt: `CAST(x AS BIGINT)`,
		count: `count(x)`, limit: `|LIMIT 5`,
	},
	"sqlite": {
		ident: "`a\"b`", str: `'it''s \ ok'`, date: `'2026-03-01'`, ts: `'2026-03-01 10:00:00'`,
		divide: `CAST(x AS REAL) / NULLIF(y, 0)`, stddev: `error`, variance: `error`, avg: `avg(x)`, median: `error`,
		truncMonth: `date(d, 'start of month')`, truncWeekTS: `datetime(d, 'start of day', '-6 days', 'weekday 1')`,
		extractWeek: `CAST(strftime('%V', d) AS INTEGER)`, bitAnd: `(g & 1)`, nullSafe: `a IS b`,
		concat: `(a || b)`, grouping2: "GROUPING(`a`, `b`)", greatest2: `max(COALESCE(a, b), COALESCE(b, a))`,
		roundFloat: `round(x)`, castFloatInt: `CAST(round(x) AS INTEGER)`, count: `count(x)`, limit: `|LIMIT 5`,
	},
	"mysql": {
		ident: "`a\"b`", str: `'it''s \\ ok'`, date: `DATE '2026-03-01'`, ts: `TIMESTAMP '2026-03-01 10:00:00'`,
		divide: `CAST(x AS DOUBLE) / NULLIF(y, 0)`, stddev: `stddev_samp(CAST(x AS DOUBLE))`,
		variance: `var_samp(CAST(x AS DOUBLE))`, avg: `avg(CAST(x AS DOUBLE))`, median: `error`,
		truncMonth:  `DATE_SUB(CAST(d AS DATE), INTERVAL DAYOFMONTH(d) - 1 DAY)`,
		truncWeekTS: `CAST(DATE_SUB(CAST(d AS DATE), INTERVAL WEEKDAY(d) DAY) AS DATETIME(6))`,
		extractWeek: `WEEK(d, 3)`, bitAnd: `(g & 1)`, nullSafe: `a <=> b`, concat: `CONCAT(a, b)`,
		grouping2: "GROUPING(`a`, `b`)", greatest2: `GREATEST(COALESCE(a, b), COALESCE(b, a))`,
		roundFloat:   `CASE WHEN ABS(x) < 1e30 THEN CAST(ROUND(CAST(x AS DECIMAL(65, 30))) AS DOUBLE) ELSE ROUND(x) END`,
		castFloatInt: `CAST(x AS SIGNED)`, count: `count(x)`, limit: `|LIMIT 5`,
	},
	"sqlserver": {
		ident: `[a"b]`, str: `N'it''s \ ok'`, date: `CAST('2026-03-01' AS DATE)`, ts: `CAST('2026-03-01 10:00:00' AS DATETIME2)`,
		divide: `CAST(x AS FLOAT) / NULLIF(y, 0)`, stddev: `STDEV(CAST(x AS FLOAT))`, variance: `VAR(CAST(x AS FLOAT))`,
		avg: `AVG(CAST(x AS FLOAT))`, median: `error`,
		truncMonth: `DATETRUNC(month, d)`, truncWeekTS: `DATETRUNC(iso_week, d)`,
		extractWeek: `DATEPART(iso_week, d)`, bitAnd: `(g & 1)`, nullSafe: `a IS NOT DISTINCT FROM b`,
		concat:    `(CAST(a AS NVARCHAR(MAX)) + CAST(b AS NVARCHAR(MAX)))`,
		grouping2: `GROUPING_ID([a], [b])`, greatest2: `GREATEST(a, b)`, roundFloat: `ROUND(x, 0)`,
		castFloatInt: `CAST(ROUND(x, 0) AS BIGINT)`, count: `COUNT_BIG(x)`, limit: `TOP (5)|`,
	},
	"snowflake": {
		ident: `"a""b"`, str: `'it''s \\ ok'`, date: `CAST('2026-03-01' AS DATE)`, ts: `CAST('2026-03-01 10:00:00' AS TIMESTAMP_NTZ)`,
		divide: `CAST(x AS FLOAT) / NULLIF(y, 0)`, stddev: `stddev_samp(CAST(x AS FLOAT))`,
		variance: `var_samp(CAST(x AS FLOAT))`, avg: `avg(CAST(x AS FLOAT))`, median: `median(x)`,
		truncMonth: `DATE_TRUNC('MONTH', d)`, truncWeekTS: `DATE_TRUNC('WEEK', d)`,
		extractWeek: `EXTRACT(WEEKISO FROM d)`, bitAnd: `BITAND(g, 1)`, nullSafe: `a IS NOT DISTINCT FROM b`,
		concat: `(a || b)`, grouping2: `GROUPING("A", "B")`, greatest2: `GREATEST_IGNORE_NULLS(a, b)`,
		roundFloat: `round(x)`, castFloatInt: `CAST(x AS NUMBER(38, 0))`, count: `count(x)`, limit: `|LIMIT 5`,
	},
	"bigquery": {
		ident: "`a\"b`", str: `'it\'s \\ ok'`, date: `DATE '2026-03-01'`, ts: `DATETIME '2026-03-01 10:00:00'`,
		divide: `CAST(x AS FLOAT64) / NULLIF(y, 0)`, stddev: `stddev_samp(CAST(x AS FLOAT64))`,
		variance: `var_samp(CAST(x AS FLOAT64))`, avg: `avg(CAST(x AS FLOAT64))`, median: `error`,
		truncMonth: `DATE_TRUNC(d, MONTH)`, truncWeekTS: `DATETIME_TRUNC(d, ISOWEEK)`,
		extractWeek: `EXTRACT(ISOWEEK FROM d)`, bitAnd: `(g & 1)`, nullSafe: `a IS NOT DISTINCT FROM b`,
		concat: `(a || b)`, grouping2: "(GROUPING(`a`) * 2 + GROUPING(`b`))",
		greatest2: `GREATEST(COALESCE(a, b), COALESCE(b, a))`, roundFloat: `round(x)`,
		castFloatInt: `CAST(x AS INT64)`, count: `count(x)`, limit: `|LIMIT 5`,
	},
	"trino": {
		ident: `"a""b"`, str: `'it''s \ ok'`, date: `DATE '2026-03-01'`, ts: `TIMESTAMP '2026-03-01 10:00:00'`,
		divide: `CAST(x AS DOUBLE) / NULLIF(y, 0)`, stddev: `stddev_samp(CAST(x AS DOUBLE))`,
		variance: `var_samp(CAST(x AS DOUBLE))`, avg: `avg(CAST(x AS DOUBLE))`, median: `error`,
		truncMonth: `date_trunc('month', d)`, truncWeekTS: `date_trunc('week', d)`,
		extractWeek: `EXTRACT(WEEK FROM d)`, bitAnd: `bitwise_and(g, 1)`, nullSafe: `a IS NOT DISTINCT FROM b`,
		concat: `(a || b)`, grouping2: `grouping("a", "b")`, greatest2: `greatest(COALESCE(a, b), COALESCE(b, a))`,
		roundFloat: `round(x)`, castFloatInt: `CAST(x AS BIGINT)`, count: `count(x)`, limit: `|LIMIT 5`,
	},
	"spark": {
		ident: "`a\"b`", str: `'it\'s \\ ok'`, date: `DATE '2026-03-01'`, ts: `TIMESTAMP_NTZ '2026-03-01 10:00:00'`,
		divide: `CAST(x AS DOUBLE) / NULLIF(y, 0)`, stddev: `stddev_samp(CAST(x AS DOUBLE))`,
		variance: `var_samp(CAST(x AS DOUBLE))`, avg: `avg(CAST(x AS DOUBLE))`, median: `percentile(CAST(x AS DOUBLE), 0.5)`,
		truncMonth: `CAST(date_trunc('MONTH', d) AS DATE)`, truncWeekTS: `CAST(date_trunc('WEEK', d) AS TIMESTAMP_NTZ)`,
		extractWeek: `EXTRACT(WEEK FROM d)`, bitAnd: `(g & 1)`, nullSafe: `a <=> b`,
		concat: `(a || b)`, grouping2: "grouping_id(`a`, `b`)", greatest2: `greatest(a, b)`, roundFloat: `round(x)`,
		castFloatInt: `CAST(round(x) AS BIGINT)`, count: `count(x)`, limit: `|LIMIT 5`,
	},
}

func aggOrError(d *Dialect, fn string, distinct bool, arg string) string {
	s, err := d.Agg(fn, distinct, arg)
	if err != nil {
		var ue *UnsupportedError
		if !errors.As(err, &ue) || ue.Dialect != d.Name() {
			return "bad error: " + err.Error()
		}
		return "error"
	}
	return s
}

func callOrError(d *Dialect, name string, args []string, types []model.Type) string {
	s, err := d.Call(name, args, types)
	if err != nil {
		return "error: " + err.Error()
	}
	return s
}

func TestSpellings(t *testing.T) {
	if len(spellings) != len(Names()) {
		t.Fatalf("spellings cover %d dialects; the registry has %v", len(spellings), Names())
	}
	for _, name := range Names() {
		d, _ := Get(name)
		w, ok := spellings[name]
		if !ok {
			t.Errorf("no spellings for %s", name)
			continue
		}
		top, tail := d.Limit(5)
		got := spelling{
			ident: d.Ident(`a"b`), str: d.String(`it's \ ok`), date: d.Date("2026-03-01"), ts: d.Timestamp("2026-03-01 10:00:00"),
			divide: d.Divide("x", "y"), stddev: aggOrError(d, "stddev", false, "x"), variance: aggOrError(d, "variance", false, "x"),
			avg: aggOrError(d, "avg", false, "x"), median: aggOrError(d, "median", false, "x"),
			truncMonth: d.DateTrunc("month", "d", model.TypeDate), truncWeekTS: d.DateTrunc("week", "d", model.TypeTimestamp),
			extractWeek: d.Extract("week", "d"), bitAnd: d.BitAnd("g", "1"), nullSafe: d.NullSafeEqual("a", "b"),
			concat: d.Concat("a", "b"), grouping2: d.GroupingID([]string{d.Ident("a"), d.Ident("b")}),
			greatest2:    callOrError(d, "greatest", []string{"a", "b"}, []model.Type{model.TypeInteger, model.TypeInteger}),
			roundFloat:   callOrError(d, "round", []string{"x"}, []model.Type{model.TypeFloat}),
			castFloatInt: d.Cast("x", model.TypeFloat, model.TypeInteger),
			count:        aggOrError(d, "count", false, "x"), limit: top + "|" + tail,
		}
		if got != w {
			t.Errorf("%s spells:\n%+v\nwant:\n%+v", name, got, w)
		}
	}
}

// Ratios are fractional and statistics are sample statistics on every
// dialect: dialects.md's generator hazards 1 and 3.
func TestRatiosFractionalAndStatisticsSampleEverywhere(t *testing.T) {
	for _, name := range Names() {
		d, _ := Get(name)
		div := d.Divide("a", "b")
		if name != "duckdb" && !strings.HasPrefix(div, "CAST(a AS ") {
			t.Errorf("%s: %s does not make the dividend fractional", name, div)
		}
		if !strings.Contains(div, "NULLIF(b, 0)") {
			t.Errorf("%s: %s is not NULL on a zero divisor", name, div)
		}
		for _, fn := range []string{"stddev", "variance"} {
			s, err := d.Agg(fn, false, "x")
			if err != nil {
				if _, refused := d.refused[fn]; !refused {
					t.Errorf("%s refuses %s without a refusal in its description: %v", name, fn, err)
				}
				continue
			}
			low := strings.ToLower(s)
			sample := strings.Contains(low, "_samp(") || strings.HasPrefix(s, "STDEV(") || strings.HasPrefix(s, "VAR(")
			if !sample || strings.Contains(low, "pop") {
				t.Errorf("%s: %s is not the sample statistic (%s)", name, fn, s)
			}
		}
	}
}

func TestMedianRefusalNamesDialectAndConstruct(t *testing.T) {
	for _, name := range Names() {
		d, _ := Get(name)
		_, err := d.Agg("median", false, "x")
		if d.exactMedian() != (err == nil) {
			t.Errorf("%s: exactMedian() = %v but Agg(median) gives error %v", name, d.exactMedian(), err)
		}
		if err != nil && (!strings.Contains(err.Error(), name) || !strings.Contains(err.Error(), "median")) {
			t.Errorf("%s: refusal %q does not name the dialect and the construct", name, err)
		}
	}
}

// --approximate is a render option: the dialect stays as described, and
// the renderer uses the approximate median aggregate only where the
// dialect has no exact one, noting it.
func TestApproximate(t *testing.T) {
	cases := map[string]string{
		"trino":     "approx_percentile(CAST(x AS DOUBLE), 0.5)",
		"bigquery":  "APPROX_QUANTILES(x, 2)[OFFSET(1)]",
		"sqlserver": "APPROX_PERCENTILE_CONT(0.5) WITHIN GROUP (ORDER BY x)",
	}
	for name, want := range cases {
		d := mustGet(t, name)
		if !(&renderer{d: d}).windowMedians() {
			t.Errorf("%s without --approximate should number the rows for a median", name)
		}
		r := &renderer{d: d, approximate: true}
		if r.windowMedians() {
			t.Errorf("%s with --approximate still numbers the rows", name)
		}
		if len(r.notes) > 0 {
			t.Errorf("%s: approximation noted before any median was rendered", name)
		}
		got, err := r.agg("median", false, "x")
		if err != nil || got != want {
			t.Errorf("%s approximate median = %q, %v; want %q", name, got, err, want)
		}
		if note := strings.Join(r.notes, "; "); !strings.Contains(note, "approximate") || !strings.Contains(note, name) {
			t.Errorf("%s: note %q", name, note)
		}
		if s, _ := r.agg("sum", false, "x"); s != "sum(x)" && s != "SUM(x)" {
			t.Errorf("%s: --approximate changed sum: %s", name, s)
		}
	}
	for _, name := range []string{"duckdb", "postgres", "snowflake", "spark", "mysql"} {
		d := mustGet(t, name)
		r := &renderer{d: d, approximate: true}
		exact, _ := d.Agg("median", false, "x")
		got, _ := r.agg("median", false, "x")
		if r.windowMedians() != (&renderer{d: d}).windowMedians() || got != exact || len(r.notes) > 0 {
			t.Errorf("%s: --approximate should change nothing (exact median, or none to approximate): %q, %v", name, got, r.notes)
		}
	}
	// SQLite: no median even approximately; upper and lower for ASCII only.
	lite := &renderer{d: mustGet(t, "sqlite"), approximate: true}
	if _, err := lite.agg("median", false, "x"); err == nil {
		t.Error("sqlite has no median, not even an approximate one")
	}
	if _, err := mustGet(t, "sqlite").Call("upper", []string{"x"}, nil); err == nil || !strings.Contains(err.Error(), "ASCII") {
		t.Errorf("sqlite upper without --approximate: %v", err)
	}
	if s, err := lite.call("upper", []string{"x"}, nil); err != nil || s != "upper(x)" {
		t.Errorf("sqlite upper with --approximate: %q, %v", s, err)
	}
	if note := strings.Join(lite.notes, "; "); !strings.Contains(note, "ASCII") {
		t.Errorf("sqlite note %q", note)
	}
}

func TestGetUnknownListsDialects(t *testing.T) {
	_, err := Get("oracle")
	if err == nil || !strings.Contains(err.Error(), "duckdb, mysql, postgres") {
		t.Fatalf("error %v does not list the dialects", err)
	}
	for _, n := range []string{"DuckDB", "Postgres", "SQLServer"} {
		if _, err := Get(n); err != nil {
			t.Errorf("Get(%q): %v", n, err)
		}
	}
}

// SQL Server has no boolean values: predicates become 1/0/NULL where a
// value is due, and are read back with = 1.
func TestSQLServerBooleans(t *testing.T) {
	d, _ := Get("sqlserver")
	if got := d.BoolValue(`([a] = 1)`); got != `CASE WHEN ([a] = 1) THEN 1 WHEN NOT (([a] = 1)) THEN 0 END` {
		t.Errorf("BoolValue = %s", got)
	}
	if got := d.Truth(`[f]`); got != `([f] = 1)` {
		t.Errorf("Truth = %s", got)
	}
	if d.Bool(true) != "(1 = 1)" || d.Bool(false) != "(1 = 0)" {
		t.Errorf("Bool = %s, %s", d.Bool(true), d.Bool(false))
	}
	pg, _ := Get("postgres")
	if pg.BoolValue("p") != "p" || pg.Truth("v") != "v" {
		t.Error("postgres should keep predicates as values")
	}
}

// count(*), count(DISTINCT x) and the float casts are spelled once, by
// Agg, from each description: the description only names the function.
func TestCountDistinctAndFloatArgs(t *testing.T) {
	star := map[string]string{"sqlserver": "COUNT_BIG(*)"}
	distinct := map[string]string{"sqlserver": "COUNT_BIG(DISTINCT x)"}
	for _, d := range all {
		if got, want := aggOrError(d, "count", true, ""), or(star[d.name], "count(*)"); got != want {
			t.Errorf("%s: count(*) = %s, want %s", d.name, got, want)
		}
		if got, want := aggOrError(d, "count", true, "x"), or(distinct[d.name], "count(DISTINCT x)"); got != want {
			t.Errorf("%s: count(distinct x) = %s, want %s", d.name, got, want)
		}
		// Where the description casts avg's argument, it is cast to the
		// dialect's own float type.
		if avg := aggOrError(d, "avg", false, "x"); strings.Contains(avg, "CAST(") &&
			!strings.Contains(avg, "CAST(x AS "+d.TypeName(model.TypeFloat)+")") {
			t.Errorf("%s: avg = %s, not over its float type %s", d.name, avg, d.TypeName(model.TypeFloat))
		}
	}
}
