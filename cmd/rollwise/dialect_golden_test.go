package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/dialects"
)

// Golden SQL for every dialect over the same case list: the shop cases of
// testdata/sql, the construct lab (testdata/dialects/lab) and the hostile
// names and values (testdata/dialects/hostile). Each statement, or the
// dialect's refusal, is kept in testdata/dialects/golden/DIALECT/SET__CASE.sql
// for review against dialects.md; go test ./cmd/rollwise -run
// TestDialectGoldenSQL -update rewrites them. The live engines run the same
// cases (cross-checked with DuckDB's rows through runJSON); for the five
// engines that cannot run here, portabilityProblems reads each statement
// for spellings the engine is known not to accept.

const (
	labModel     = "../../testdata/dialects/lab.roll"
	hostileModel = "../../testdata/dialects/hostile.roll"
)

// goldenSets are the case folders and the models their cases run on.
var goldenSets = []struct {
	name, dir string
	models    []string
}{
	{"shop", "../../testdata/sql", []string{shopModel, editsModel}},
	{"lab", "../../testdata/dialects/lab", []string{labModel}},
	{"hostile", "../../testdata/dialects/hostile", []string{hostileModel}},
	{"time", "../../testdata/dialects/time", []string{timeModel}},
}

// goldenCase is one case: its set, name, models and arguments.
type goldenCase struct {
	set, name string
	models    []string
	args      []string
}

func goldenCases(t *testing.T) []goldenCase {
	t.Helper()
	var out []goldenCase
	for _, s := range goldenSets {
		files, _ := filepath.Glob(filepath.Join(s.dir, "*.test"))
		if len(files) == 0 {
			t.Fatalf("no cases in %s", s.dir)
		}
		for _, f := range files {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			head, _, _ := strings.Cut(string(b), "----\n")
			var args []string
			if err := json.Unmarshal([]byte(head), &args); err != nil {
				t.Fatalf("%s: the first line must be a JSON array of arguments: %v", f, err)
			}
			out = append(out, goldenCase{set: s.name, name: strings.TrimSuffix(filepath.Base(f), ".test"), models: s.models, args: args})
		}
	}
	return out
}

func TestDialectGoldenSQL(t *testing.T) {
	cases := goldenCases(t)
	for _, dialect := range dialects.Names() {
		for _, c := range cases {
			t.Run(dialect+"/"+c.set+"/"+c.name, func(t *testing.T) {
				args := append(append(append([]string{"sql"}, c.models...), c.args...), "-d", dialect)
				var out, errb bytes.Buffer
				code := Main(args, nil, &out, &errb)
				var b strings.Builder
				b.WriteString("-- rollwise " + strings.Join(displayArgs(args), " ") + "\n")
				sql := out.String()
				switch code {
				case 0:
					b.WriteString(sql)
				case exitFindings:
					msg := lastLine(errb.String())
					if !strings.Contains(msg, dialect+" cannot express") {
						t.Fatalf("exit %d: %s", code, errb.String())
					}
					b.WriteString("-- refused: " + msg + "\n")
				default:
					t.Fatalf("exit %d: %s", code, errb.String())
				}
				file := filepath.Join("../../testdata/dialects/golden", dialect, c.set+"__"+c.name+".sql")
				if *update {
					if err := os.MkdirAll(filepath.Dir(file), 0o755); err != nil {
						t.Fatal(err)
					}
					if err := os.WriteFile(file, []byte(b.String()), 0o644); err != nil {
						t.Fatal(err)
					}
				} else {
					want, err := os.ReadFile(file)
					if err != nil {
						t.Fatalf("%v (write it with -update)", err)
					}
					if string(want) != b.String() {
						t.Errorf("SQL changed (review, then go test ./cmd/rollwise -run TestDialectGoldenSQL -update):\n%s", lineDiff(string(want), b.String()))
					}
				}
				if code == 0 {
					d, _ := dialects.Get(dialect)
					if problems := portabilityProblems(d, sql); len(problems) > 0 {
						t.Skipf("%s cannot run this statement yet:\n  %s", dialect, strings.Join(problems, "\n  "))
					}
				}
			})
		}
	}
}

// displayArgs writes the arguments as a shell would need them, with the
// paths relative to the repository.
func displayArgs(args []string) []string {
	out := make([]string, len(args))
	for i, a := range args {
		a = strings.TrimPrefix(a, "../../")
		if strings.ContainsAny(a, "\n\r") { // bash's $'...', so the header stays one comment line
			a = "$'" + strings.NewReplacer(`\`, `\\`, `'`, `\'`, "\n", `\n`, "\r", `\r`).Replace(a) + "'"
		} else if a == "" || strings.ContainsAny(a, " '\"`\\$*;#[]()<>=,|&\n") {
			a = "'" + strings.ReplaceAll(a, "'", `'\''`) + "'"
		}
		out[i] = a
	}
	return out
}

// No line of a SQL Server golden is a batch separator (GO, any case, an
// optional count: learn.microsoft.com/sql/t-sql/language-elements/sql-server-utilities-statements-go),
// which sqlcmd and SSMS would act on even inside a literal.
func TestSQLServerGoldensHaveNoBatchLines(t *testing.T) {
	files, _ := filepath.Glob("../../testdata/dialects/golden/sqlserver/*.sql")
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

func lastLine(s string) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	return strings.TrimPrefix(lines[len(lines)-1], "rollwise: ")
}

// blank replaces every quoted identifier of dialect d by ID and every
// string literal by ” (so that names and values are never read as SQL
// by the checks below).
func blank(d dialects.Dialect, sql string) string {
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

func portabilityProblems(d dialects.Dialect, sql string) []string {
	caps := d.Caps()
	text := blank(d, sql)
	var out []string
	add := func(ok bool, msg string) {
		if ok {
			out = append(out, msg)
		}
	}
	add(!caps.GroupingSets && strings.Contains(text, "GROUPING SETS"), "GROUPING SETS: the renderer must call dialects.GroupingSetsSQL")
	add(!caps.FilterClause && strings.Contains(text, "FILTER (WHERE"), "FILTER: the renderer must call dialects.FilteredAgg")
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
