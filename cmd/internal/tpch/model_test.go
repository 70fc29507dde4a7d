package tpch

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
)

// These tests check testdata/tpch without data: the model files parse, and
// every rollwise query of queries.json names measures and columns the
// model declares, in predicates that parse.

// querySpec is one rollwise query of queries.json.
type querySpec struct {
	Models   []string `json:"models"`
	Measures []string `json:"measures"`
	By       []string `json:"by"`
	Where    string   `json:"where"`
	Totals   string   `json:"totals"`
	Order    string   `json:"order"`
	Limit    int      `json:"limit"`
	Columns  []struct {
		SQL      string `json:"sql"`
		Rollwise string `json:"rollwise"`
	} `json:"columns"`
}

type queriesFile struct {
	Models  []string `json:"models"`
	Queries []struct {
		querySpec
		ID           string      `json:"id"`
		SQL          string      `json:"sql"`
		Status       string      `json:"status"`
		Alternatives []querySpec `json:"alternatives"`
	} `json:"queries"`
}

func parseModel(t *testing.T, name string) *grammar.File {
	t.Helper()
	src, err := os.ReadFile(filepath.Join(testdataDir, name))
	if err != nil {
		t.Fatal(err)
	}
	f, diags := grammar.Parse(name, string(src))
	for _, d := range diags {
		t.Errorf("%s", d.Error())
	}
	return f
}

func TestModelsParse(t *testing.T) {
	main := parseModel(t, "tpch.roll")
	if len(main.Tables) != 10 || len(main.Measures) == 0 {
		t.Errorf("tpch.roll: %d tables, %d measures", len(main.Tables), len(main.Measures))
	}
	relations := map[string]int{}
	for _, tab := range main.Tables {
		if tab.At == nil {
			t.Errorf("table %s has no at", tab.Name.Name)
			continue
		}
		relations[tab.At.Value]++
	}
	for _, tab := range Tables {
		if relations[tab.Name] == 0 {
			t.Errorf("no table reads relation %q", tab.Name)
		}
	}
	if relations["nation"] != 2 || relations["region"] != 2 {
		t.Errorf("nation and region should each play two roles: %v", relations)
	}
	edits := parseModel(t, "tpch_edits.roll")
	if len(edits.Tables) != 0 || len(edits.Measures) == 0 {
		t.Errorf("tpch_edits.roll: %d tables, %d measures", len(edits.Tables), len(edits.Measures))
	}
}

// modelIndex lists the measures and table.column names of model files.
type modelIndex struct {
	measures map[string]bool
	columns  map[string]bool
}

func indexModels(t *testing.T, names []string) modelIndex {
	ix := modelIndex{measures: map[string]bool{}, columns: map[string]bool{}}
	for _, name := range names {
		f := parseModel(t, name)
		for _, m := range f.Measures {
			ix.measures[m.Name.Name] = true
		}
		for _, tab := range f.Tables {
			for _, c := range tab.Columns {
				ix.columns[tab.Name.Name+"."+c.Name.Name] = true
			}
		}
	}
	if len(ix.columns) == 0 { // tpch_edits.roll has no tables of its own
		main := parseModel(t, "tpch.roll")
		for _, tab := range main.Tables {
			for _, c := range tab.Columns {
				ix.columns[tab.Name.Name+"."+c.Name.Name] = true
			}
		}
	}
	return ix
}

// refs collects the table.column references of a predicate.
func refs(e grammar.Expr, out *[]*grammar.Ref) {
	switch x := e.(type) {
	case *grammar.Ref:
		*out = append(*out, x)
	case *grammar.Binary:
		refs(x.L, out)
		refs(x.R, out)
	case *grammar.Unary:
		refs(x.X, out)
	case *grammar.IsNull:
		refs(x.X, out)
	case *grammar.In:
		refs(x.X, out)
		for _, y := range x.List {
			refs(y, out)
		}
	case *grammar.Between:
		refs(x.X, out)
		refs(x.Lo, out)
		refs(x.Hi, out)
	case *grammar.Call:
		for _, y := range x.Args {
			refs(y, out)
		}
	}
}

func checkQuery(t *testing.T, id string, q querySpec) {
	t.Helper()
	ix := indexModels(t, q.Models)
	for _, m := range q.Measures {
		if !ix.measures[m] {
			t.Errorf("%s: unknown measure %q in %v", id, m, q.Models)
		}
	}
	for _, b := range q.By {
		if !ix.columns[b] {
			t.Errorf("%s: unknown group column %q", id, b)
		}
	}
	if q.Where != "" {
		// A predicate parses as the narrowing of a measure.
		src := "measure where_check = count_order where " + q.Where
		f, diags := grammar.Parse("--where", src)
		for _, d := range diags {
			t.Errorf("%s: where: %s", id, d.Error())
		}
		if len(f.Measures) != 1 {
			t.Fatalf("%s: where did not parse", id)
		}
		n, ok := f.Measures[0].Expr.(*grammar.Narrow)
		if !ok {
			t.Fatalf("%s: where did not parse as a narrowing", id)
		}
		var rs []*grammar.Ref
		refs(n.Pred, &rs)
		for _, r := range rs {
			if r.Table == "" || !ix.columns[r.Table+"."+r.Name] {
				t.Errorf("%s: where names %q, not a column of the model", id, r.Table+"."+r.Name)
			}
		}
	}
	for _, key := range strings.FieldsFunc(q.Order, func(r rune) bool { return r == ',' }) {
		o := strings.Fields(key)
		if len(o) == 0 || len(o) > 2 || !contains(q.Measures, o[0]) && !contains(q.By, o[0]) || len(o) == 2 && o[1] != "desc" && o[1] != "asc" {
			t.Errorf("%s: order key %q is not a requested measure or --by column with an optional asc or desc", id, key)
		}
	}
	if q.Totals != "none" || q.Limit < 0 {
		t.Errorf("%s: totals %q, limit %d", id, q.Totals, q.Limit)
	}
	for _, c := range q.Columns {
		if !contains(q.Measures, c.Rollwise) && !contains(q.By, c.Rollwise) {
			t.Errorf("%s: column %s maps to %q, which the query does not return", id, c.SQL, c.Rollwise)
		}
	}
	if len(q.Columns) != len(q.Measures)+len(q.By) {
		t.Errorf("%s: %d columns for %d measures and %d groups", id, len(q.Columns), len(q.Measures), len(q.By))
	}
}

func TestQueriesJSON(t *testing.T) {
	b, err := os.ReadFile(filepath.Join(testdataDir, "queries.json"))
	if err != nil {
		t.Fatal(err)
	}
	var qf queriesFile
	if err := json.Unmarshal(b, &qf); err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob(filepath.Join(testdataDir, "queries", "q*.sql"))
	if len(qf.Queries) != len(files) {
		t.Errorf("queries.json maps %d queries; queries/ holds %d", len(qf.Queries), len(files))
	}
	for _, q := range qf.Queries {
		if q.SQL != "queries/"+q.ID+".sql" {
			t.Errorf("%s: sql %q", q.ID, q.SQL)
		}
		src, err := os.ReadFile(filepath.Join(testdataDir, q.SQL))
		if err != nil {
			t.Errorf("%s: %v", q.ID, err)
		} else if !strings.HasPrefix(string(src), "-- TPC-H "+strings.ToUpper(q.ID)+", ") ||
			!strings.Contains(string(src), "TPC Benchmark H Standard Specification, Revision") {
			t.Errorf("%s: the file does not start with its source comment", q.ID)
		}
		switch q.Status {
		case "exact", "ties":
		default:
			t.Errorf("%s: status %q", q.ID, q.Status)
		}
		spec := q.querySpec
		spec.Models = qf.Models
		checkQuery(t, q.ID, spec)
		for _, alt := range q.Alternatives {
			checkQuery(t, q.ID+" (alternative)", alt)
		}
	}
}
