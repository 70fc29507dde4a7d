package engine

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"regexp"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// collationName is what a collation or character set name may look like;
// names read from the server are spliced into a probe only when they do.
var collationName = regexp.MustCompile(`^[A-Za-z0-9_]+$`)

// LooseGroupCollations returns a caution for each stored text column of
// groups whose MySQL/MariaDB collation treats as equal values that
// DuckDB, the reference evaluator and the other engines keep apart: a
// case-insensitive collation ('North' = 'north') or a PAD SPACE one
// ('North' = 'North '). GROUP BY follows the column's collation, so such
// values fall into one group and the numbers differ from the other
// engines' without any error. On other engines it returns nothing.
//
// Whether a collation ignores case or trailing spaces is asked of the
// server, by comparing two probes under it, rather than guessed from its
// name.
func (l *Live) LooseGroupCollations(ctx context.Context, groups []*model.Column) ([]string, error) {
	if l.dialect != "mysql" {
		return nil, nil
	}
	var out []string
	for _, g := range groups {
		if g.Type != model.TypeText || !g.Stored() {
			continue
		}
		what, coll, err := l.looseCollation(ctx, g)
		if err != nil {
			return out, fmt.Errorf("reading the collation of %s: %w", g, err)
		}
		if what != "" {
			out = append(out, fmt.Sprintf(
				"%s: group column %s has collation %s, which %s: values that differ only so are one group here but separate groups on other engines; declare the column with a binary NO PAD collation (MariaDB utf8mb4_nopad_bin, MySQL utf8mb4_0900_bin) for exact groups",
				l.Server, g, coll, what))
		}
	}
	return out, nil
}

// looseCollation says what the collation of column c ignores ("" when
// nothing) and names it. A column the server does not list (its relation
// is not a base table or view of this database) is left alone.
func (l *Live) looseCollation(ctx context.Context, c *model.Column) (what, coll string, err error) {
	schema, table := any(nil), c.Table.Name
	if r := c.Table.Relation; len(r) > 0 {
		table = r[len(r)-1]
		if len(r) > 1 {
			schema = r[len(r)-2]
		}
	}
	var cs, name sql.NullString
	err = l.conn.QueryRowContext(ctx,
		`SELECT CHARACTER_SET_NAME, COLLATION_NAME FROM information_schema.COLUMNS
		 WHERE TABLE_SCHEMA = COALESCE(?, DATABASE()) AND TABLE_NAME = ? AND COLUMN_NAME = ?`,
		schema, table, c.Name).Scan(&cs, &name)
	if errors.Is(err, sql.ErrNoRows) || !cs.Valid || !name.Valid {
		return "", "", nil
	}
	if err != nil {
		return "", "", err
	}
	if !collationName.MatchString(cs.String) || !collationName.MatchString(name.String) {
		return "", "", fmt.Errorf("unexpected collation name %q (character set %q)", name.String, cs.String)
	}
	probe := func(s string) string { return fmt.Sprintf("CONVERT('%s' USING %s)", s, cs.String) }
	var caseless, padded bool
	err = l.conn.QueryRowContext(ctx, fmt.Sprintf("SELECT %[1]s COLLATE %[2]s = %[3]s, %[1]s COLLATE %[2]s = %[4]s",
		probe("a"), name.String, probe("A"), probe("a "))).Scan(&caseless, &padded)
	if err != nil {
		return "", "", err
	}
	var ignores []string
	if caseless {
		ignores = append(ignores, "ignores case")
	}
	if padded {
		ignores = append(ignores, "ignores trailing spaces")
	}
	return strings.Join(ignores, " and "), name.String, nil
}
