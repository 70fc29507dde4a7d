package dialects

import (
	"maps"
	"strings"
)

// sharedRows is a rows CTE: the rows of one table, joined along links and
// filtered, with the columns that the scans reading them need. Scans that
// read the same rows (the same table, joins and WHERE: a per-grain
// sub-context's scan and its context's, or a scan with keys removed) share
// one, with the union of their columns, where that saves work: when the
// rows are joined, or when the later scan aggregates a computed value (not
// a stored column) that the CTE already computes. DuckDB materializes a
// CTE that is referenced more than once, so the join and the shared values
// are computed once; but the copy costs more than reading a table's stored
// columns twice and grouping them by a cheap key such as a year
// (docs/benchmarks.md, R6).
type sharedRows struct {
	name string
	// at is the CTE's place in renderer.ctes.
	at int
	// from is the FROM clause with its joins and WHERE, as rendered.
	from string
	cols []rowCol
}

// rowCol is a column of a rows CTE: a scan's key (kept under its name, as
// the cells CTE groups by it) or an aggregate's input; computed is set on
// an input that is not a stored column.
type rowCol struct {
	name, expr    string
	key, computed bool
}

// rowsOf returns the name of the rows CTE that selects cols from from
// (rendered FROM, joins and WHERE; joined tells that it joins), and the
// column each of cols is read as: the first CTE of an earlier scan of the
// same rows that sharing saves work with and whose names do not clash,
// with the columns it lacks added (an input it already computes is read
// under that column's name), or else a new CTE.
func (r *renderer) rowsOf(base, from string, joined bool, cols []rowCol) (string, func(string) string) {
	as := map[string]string{}
	col := func(name string) string {
		if n, ok := as[name]; ok {
			return n
		}
		return name
	}
	for _, sr := range r.rows[from] {
		if (joined || sr.computes(cols)) && sr.merge(cols, as) {
			r.ctes[sr.at] = r.cteSQL(sr.name, sr.body(r))
			if r.d.materializeShared {
				// (read by a second scan now)
				r.ctes[sr.at] = r.q(sr.name) + " AS MATERIALIZED (\n" + sr.body(r) + "\n)"
			}
			return sr.name, col
		}
	}
	sr := &sharedRows{name: r.cteName(base + "_rows"), at: len(r.ctes), from: from, cols: cols}
	r.rows[from] = append(r.rows[from], sr)
	r.addCTE(sr.name, sr.body(r))
	return sr.name, col
}

// computes reports whether the CTE already computes a value among cols
// that is not a stored column.
func (sr *sharedRows) computes(cols []rowCol) bool {
	for _, c := range cols {
		if !c.computed {
			continue
		}
		for _, o := range sr.cols {
			if o.expr == c.expr {
				return true
			}
		}
	}
	return false
}

// merge adds cols to the CTE, recording in as the inputs read under
// another name; it reports false, and changes nothing, when a column name
// is taken by another expression.
func (sr *sharedRows) merge(cols []rowCol, as map[string]string) bool {
	byName := map[string]string{}
	byExpr := map[string]string{}
	for _, c := range sr.cols {
		byName[c.name] = c.expr
		if _, ok := byExpr[c.expr]; !ok {
			byExpr[c.expr] = c.name
		}
	}
	var add []rowCol
	read := map[string]string{}
	for _, c := range cols {
		if e, ok := byName[c.name]; ok {
			if e != c.expr {
				return false
			}
			continue
		}
		if n, ok := byExpr[c.expr]; ok && !c.key {
			read[c.name] = n
			continue
		}
		byName[c.name] = c.expr
		add = append(add, c)
	}
	sr.cols = append(sr.cols, add...)
	maps.Copy(as, read)
	return true
}

// body is the CTE's SELECT.
func (sr *sharedRows) body(r *renderer) string {
	var cols []string
	for _, c := range sr.cols {
		cols = append(cols, c.expr+" AS "+r.q(c.name))
	}
	if len(cols) == 0 {
		cols = append(cols, "1 AS "+r.q("one"))
	}
	return "  SELECT\n    " + strings.Join(cols, ",\n    ") + sr.from
}
