package engine

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// DecimalWidth and DecimalScale are the precision and scale of the DuckDB
// DECIMAL that stores every `decimal` column.
//
// Why DECIMAL(38,6):
//   - Width 38 (DuckDB's widest exact type, a 128-bit integer). DuckDB keeps
//     the width of a product of two DECIMAL(18,s) at 18, so
//     unit_price*unit_cost overflows as soon as it reaches 10^(18-2s).
//     With width 38 a product is DECIMAL(38,2s) and a sum of it stays
//     DECIMAL(38,2s): exact, and an overflow is an error, never a rounding.
//   - Scale 6 holds money (2 places), unit prices (4) and rates (6), and
//     still leaves 26 integer digits for a product of two decimals and 20
//     for a product of three. A data value with more than 6 decimal places
//     is refused when loading, not rounded.
const (
	DecimalWidth = 38
	DecimalScale = 6
)

// DecimalType is the DuckDB type of a `decimal` column:
// DECIMAL(DecimalWidth,DecimalScale).
const DecimalType = "DECIMAL(38,6)"

// duckType returns the DuckDB type that stores a column of type t.
func duckType(t model.Type) (string, error) {
	switch t {
	case model.TypeInteger:
		return "BIGINT", nil
	case model.TypeDecimal:
		return DecimalType, nil
	case model.TypeFloat:
		return "DOUBLE", nil
	case model.TypeText:
		return "VARCHAR", nil
	case model.TypeDate:
		return "DATE", nil
	case model.TypeTimestamp:
		return "TIMESTAMP", nil
	case model.TypeBoolean:
		return "BOOLEAN", nil
	}
	return "", fmt.Errorf("type %s cannot be stored", t)
}

// quoteIdent quotes an identifier for DuckDB: double quotes, embedded double
// quotes doubled.
func quoteIdent(s string) string {
	return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
}

// quoteName quotes each part of a qualified name and joins them with dots.
func quoteName(parts []string) string {
	q := make([]string, len(parts))
	for i, p := range parts {
		q[i] = quoteIdent(p)
	}
	return strings.Join(q, ".")
}

// quoteString renders s as a SQL string literal.
func quoteString(s string) string {
	return "'" + strings.ReplaceAll(s, "'", "''") + "'"
}

// lossyExpr is a SQL condition that holds when the text value v (a SQL
// expression of type VARCHAR) has nonzero digits beyond `scale` decimal
// places, that is when casting it to a number with that scale would round
// it. It understands plain (12.50) and exponent (1.25e1) notation; a cheap
// pre-test keeps the regular expressions off ordinary values.
func lossyExpr(v string, scale int) string {
	t := "trim(" + v + ")"
	cheap := fmt.Sprintf("(strpos(%[1]s, '.') > 0 AND length(%[1]s) - strpos(%[1]s, '.') > %[2]d) OR strpos(lower(%[1]s), 'e') > 0", v, scale)
	intPart := fmt.Sprintf("regexp_extract(%s, '^[+-]?([0-9]*)', 1)", t)
	frac := fmt.Sprintf("regexp_extract(%s, '^[+-]?[0-9]*\\.([0-9]*)', 1)", t)
	expText := fmt.Sprintf("regexp_extract(%s, '[eE]([+-]?[0-9]+)$', 1)", t)
	exp := fmt.Sprintf("(CASE WHEN %[1]s = '' THEN 0 ELSE TRY_CAST(%[1]s AS BIGINT) END)", expText)
	digits := fmt.Sprintf("(%s || %s)", intPart, frac)
	sig := fmt.Sprintf("rtrim(%s, '0')", digits)
	// Decimal places needed = fraction length - exponent - trailing zeros
	// of all the digits; NULL (an exponent out of range) counts as lossy.
	places := fmt.Sprintf("length(%s) - %s - (length(%s) - length(%s))", frac, exp, digits, sig)
	full := fmt.Sprintf("coalesce(%s <> '' AND %s > %d, true)", sig, places, scale)
	return fmt.Sprintf("((%s) AND %s)", cheap, full)
}

// firstParagraph keeps the first paragraph of a DuckDB error message,
// dropping its lists of possible fixes and reader settings.
func firstParagraph(msg string) string {
	msg = strings.TrimSpace(msg)
	for _, cut := range []string{"\n\n", "\nPossible fixes", "\nPossible solutions"} {
		if i := strings.Index(msg, cut); i >= 0 {
			msg = msg[:i]
		}
	}
	return strings.TrimSpace(msg)
}
