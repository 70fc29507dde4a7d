package main

import (
	"unicode/utf8"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// identLimit is the longest identifier an engine keeps as written.
type identLimit struct {
	max   int
	bytes bool // max counts bytes, not characters
	// source is where the limit is documented.
	source string
}

// identLimits holds the engines whose limit is documented; the others
// (DuckDB, SQLite, Trino, Spark, Snowflake, BigQuery) are not checked.
var identLimits = map[string]identLimit{
	// "The system uses no more than NAMEDATALEN-1 bytes of an identifier;
	// longer names can be written in commands, but they will be
	// truncated. By default, NAMEDATALEN is 64 so the maximum identifier
	// length is 63 bytes." Truncation is silent (a NOTICE), and two names
	// alike in their first 63 bytes become one.
	"postgres": {63, true, "https://www.postgresql.org/docs/current/sql-syntax-lexical.html#SQL-SYNTAX-IDENTIFIERS"},
	// Database, table, column and view names: 64 characters; column
	// aliases in CREATE VIEW are held to the same 64 (MariaDB documents
	// the same limits).
	"mysql": {64, false, "https://dev.mysql.com/doc/refman/8.4/en/identifier-length.html"},
	// Regular and delimited identifiers: 1 to 128 characters.
	"sqlserver": {128, false, "https://learn.microsoft.com/en-us/sql/relational-databases/databases/database-identifiers"},
}

// identTooLong reports, for `check -d`, every name of the model that
// becomes an identifier in the dialect's SQL (a relation's parts, a
// column, a measure and a view) and is longer than the dialect keeps.
func identTooLong(m *model.Model, dialect string) grammar.Diagnostics {
	lim, ok := identLimits[dialect]
	if !ok {
		return nil
	}
	var diags grammar.Diagnostics
	check := func(pos grammar.Pos, what, name string) {
		n, unit := utf8.RuneCountInString(name), "characters"
		if lim.bytes {
			n, unit = len(name), "bytes"
		}
		if n > lim.max {
			diags.Errorf(pos, "name-too-long", "%s %.40s... is %d %s long; %s keeps at most %d (%s)",
				what, name, n, unit, dialect, lim.max, lim.source).Suggestion =
				"give it a shorter name (a measure or view name can differ from the warehouse's)"
		}
	}
	for _, t := range m.Tables {
		for _, part := range t.Relation {
			check(t.Pos, "the relation name", part)
		}
		for _, c := range t.Columns {
			check(c.Pos, "column", c.Name)
		}
	}
	for _, x := range m.Measures {
		check(x.Pos, "measure", x.Name)
	}
	for _, v := range m.Views {
		check(v.Pos, "view", v.Name)
	}
	return diags
}
