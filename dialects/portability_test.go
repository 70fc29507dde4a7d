package dialects_test

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/dialects"
)

// The checks below read each golden statement, with its names and values
// blanked, for spellings its engine is known not to accept
// (docs/engine-facts.md): a failure says which piece of the renderer must
// be used instead. They are what stands in for running the statement on
// the engines that cannot run here.

// No line of a SQL Server golden is a batch separator (GO, any case, an
// optional count: learn.microsoft.com/sql/t-sql/language-elements/sql-server-utilities-statements-go),
// which sqlcmd and SSMS would act on even inside a literal.
func TestSQLServerGoldensHaveNoBatchLines(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join(root, "testdata/dialects/golden/sqlserver/*.sql"))
	if len(files) < 10 {
		t.Fatalf("%d SQL Server goldens", len(files))
	}
	sep := regexp.MustCompile(`(?i)^\s*go(\s+[0-9]+)?\s*(--.*)?$`)
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		for i, line := range strings.FieldsFunc(string(b), func(r rune) bool { return r == '\n' || r == '\r' }) {
			if sep.MatchString(line) {
				t.Errorf("%s:%d: %q is a batch separator", filepath.Base(f), i+1, line)
			}
		}
	}
}

// blank replaces every quoted identifier of dialect d by ID and every
// string literal by ” (so that names and values are never read as SQL
// by the checks below).
func blank(d *dialects.Dialect, sql string) string {
	open, close, backslash := byte('"'), byte('"'), false
	switch d.Name() {
	case "sqlite", "mysql", "spark":
		open, close = '`', '`'
	case "bigquery":
		open, close, backslash = '`', '`', true
	case "sqlserver":
		open, close = '[', ']'
	}
	strEsc := map[string]bool{"mysql": true, "snowflake": true, "spark": true, "bigquery": true}[d.Name()]
	var b strings.Builder
	for i := 0; i < len(sql); i++ {
		c := sql[i]
		switch {
		case c == open:
			for i++; i < len(sql); i++ {
				if backslash && sql[i] == '\\' {
					i++
					continue
				}
				if sql[i] == close {
					if i+1 < len(sql) && sql[i+1] == close && !backslash {
						i++
						continue
					}
					break
				}
			}
			b.WriteString("ID")
		case c == '\'':
			esc := strEsc || d.Name() == "postgres" && i > 0 && sql[i-1] == 'E'
			for i++; i < len(sql); i++ {
				if esc && sql[i] == '\\' {
					i++
					continue
				}
				if sql[i] == '\'' {
					if i+1 < len(sql) && sql[i+1] == '\'' {
						i++
						continue
					}
					break
				}
			}
			b.WriteString("''")
		default:
			b.WriteByte(c)
		}
	}
	return b.String()
}

// The spellings each engine rejects or reads otherwise (dialects.md), as
// patterns over the statement with its names and values blanked. Each says
// which piece of dialects/rewrite.go or which Dialect method the renderer
// must use instead.
var (
	multiGrouping = regexp.MustCompile(`\bGROUPING\([^()]*,`)
	boolLiteral   = regexp.MustCompile(`\b(TRUE|FALSE)\b`)
	limitClause   = regexp.MustCompile(`\bLIMIT\s+\d`)
	bareBitTest   = regexp.MustCompile(`(\b(WHEN|WHERE|AND|OR|NOT)\s+ID(\.ID)?\s*(\bTHEN|\bAND|\bOR|\)|$))|\(\s*ID(\.ID)?\s+(OR|AND)\b`)
	dottedAlias   = regexp.MustCompile("AS `[^`.]*\\.[^`]*`")
	predicateItem = regexp.MustCompile(`(?m)^\s*\((?:[^()]|\([^()]*\))*\s(=|<>|<=|>=|<|>|IS NULL|IS NOT NULL|IN)\s(?:[^()]|\([^()]*\))*\) AS ID,?$`)
)

func portabilityProblems(d *dialects.Dialect, sql string) []string {
	caps := d.Caps()
	text := blank(d, sql)
	var out []string
	add := func(ok bool, msg string) {
		if ok {
			out = append(out, msg)
		}
	}
	add(!caps.GroupingSets && strings.Contains(text, "GROUPING SETS"), "GROUPING SETS: the renderer must call dialects.GroupingSetsSQL")
	add(!caps.FilterClause && strings.Contains(text, "FILTER (WHERE"), "FILTER: the renderer must spell filtered aggregates with filteredAgg")
	add(!caps.NullsLast && strings.Contains(text, "NULLS LAST"), "NULLS LAST: the renderer must call dialects.OrderKey")
	add(strings.Contains(text, `"`) && d.Name() != "duckdb" && d.Name() != "postgres" && d.Name() != "trino" && d.Name() != "snowflake",
		`a double-quoted name: a string (MySQL, Spark, BigQuery) or a string when unresolved (SQLite); quote with d.Ident`)
	switch d.Name() {
	case "sqlite":
		add(strings.Contains(text, "DATE ''") || strings.Contains(text, "TIMESTAMP ''"), "DATE '...': SQLite has no typed literals; use d.Date")
	case "mysql":
		add(strings.Contains(text, "||"), "||: a logical OR in MySQL; the renderer must call d.Concat")
	case "sqlserver":
		add(strings.Contains(text, "||"), "||: T-SQL has no || operator; the renderer must call d.Concat")
		add(multiGrouping.MatchString(text), "GROUPING(a, b): one argument in T-SQL; GroupingSetsSQL spells GROUPING_ID")
		add(boolLiteral.MatchString(text), "TRUE/FALSE: T-SQL has no boolean literals; the renderer must call d.Bool")
		add(limitClause.MatchString(text), "LIMIT: T-SQL has TOP; use dialects.ApplyLimit")
		add(bareBitTest.MatchString(text), "a bit column used as a predicate: the renderer must call d.Truth")
		add(predicateItem.MatchString(text), "a predicate selected as a value: the renderer must call d.BoolValue")
		add(strings.Contains(text, "DATE ''"), "DATE '...': T-SQL has no typed literals; use d.Date")
	case "bigquery":
		add(multiGrouping.MatchString(text), "GROUPING(a, b): one argument in BigQuery; GroupingSetsSQL spells a sum of bits")
		// Result columns are table columns: letters, digits and _ (flexible
		// column names add more, not the dot; cloud.google.com/bigquery/docs/schemas).
		add(dottedAlias.MatchString(sql), "a column named table.column: BigQuery column names cannot hold a dot; the planner must name its columns without one")
	case "spark":
		add(multiGrouping.MatchString(text), "GROUPING(a, b): GroupingSetsSQL spells grouping_id")
	case "trino", "snowflake":
		add(strings.Contains(text, " & "), "&: no bitwise operator; the renderer must call d.BitAnd")
	}
	return out
}
