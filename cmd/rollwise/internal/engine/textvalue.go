package engine

import (
	"fmt"

	"github.com/rollwise/rollwise/planner/model"
)

// numberPattern is how a number must be written in a data file: decimal
// digits with an optional point and exponent, blanks around it allowed
// (SQL's <exact numeric literal> and <approximate numeric literal>,
// ISO/IEC 9075-2 5.3, with a sign). DuckDB's casts also read 0x10, 0b10
// and 1_000, which a data file almost never means; they are refused.
const numberPattern = `\s*[+-]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?\s*`

// nonFinitePattern spells NaN and the infinities, which a float column
// may hold when written out.
const nonFinitePattern = `(?i)\s*[+-]?(nan|inf|infinity)\s*`

// timestampPattern is the forms a timestamp may take in a data file: the
// date, then optionally a time of day (seconds and up to 6 decimals of
// them optional, more only as zeros so that nothing is rounded) and an
// offset Z, ±HH, ±HHMM or ±HH:MM (ISO 8601-1:2019 5.4). Group 1 is the
// hours of the offset, group 2 its minutes.
const timestampPattern = `[0-9]{4}-[0-9]{2}-[0-9]{2}(?:[T ][0-9]{2}:[0-9]{2}(?::[0-9]{2}(?:\.[0-9]{1,6}0*)?)?(?:Z|[+-]([0-9]{2})(?::?([0-9]{2}))?)?)?`

// maxOffsetMinutes bounds a time zone offset: the zones in use run from
// UTC-12:00 to UTC+14:00 (IANA time zone database, Pacific/Kiritimati);
// +99:00 is a typo, not a place.
const maxOffsetMinutes = 14 * 60

// textUnreadable is a SQL condition that holds when the text value v (a
// non-NULL VARCHAR expression) is not a value of column type t as written:
// not spelled as one (numberPattern, timestampPattern), or not a real one
// (February 30, hour 25, an offset beyond ±14:00, a number out of range).
// Dates and booleans need only to cast; text is always readable.
func textUnreadable(v string, c column) string {
	cast := fmt.Sprintf("TRY_CAST(%s AS %s) IS NULL", v, parseType(c))
	switch c.typ {
	case model.TypeInteger, model.TypeDecimal:
		return fmt.Sprintf("(NOT regexp_full_match(%s, '%s') OR %s)", v, numberPattern, cast)
	case model.TypeFloat:
		return fmt.Sprintf("(NOT (regexp_full_match(%[1]s, '%[2]s') OR regexp_full_match(%[1]s, '%[3]s')) OR %[4]s)",
			v, numberPattern, nonFinitePattern, cast)
	case model.TypeTimestamp:
		offset := fmt.Sprintf("coalesce(TRY_CAST(regexp_extract(%[1]s, '^%[2]s$', 1) AS INTEGER), 0) * 60 + coalesce(TRY_CAST(regexp_extract(%[1]s, '^%[2]s$', 2) AS INTEGER), 0)",
			v, timestampPattern)
		return fmt.Sprintf("(NOT regexp_full_match(%[1]s, '%[2]s') OR %[3]s OR %[4]s > %[5]d OR regexp_extract(%[1]s, '^%[2]s$', 2) >= '60')",
			v, timestampPattern, cast, offset, maxOffsetMinutes)
	case model.TypeText:
		return "false"
	}
	return cast
}

// textRefused is a SQL condition that holds when the text value v cannot
// be stored exactly in column c: it is unreadable (textUnreadable), a
// number would be rounded (lossyExpr), or a float overflows to an
// infinity it does not spell (1e400). NULL is never refused.
func textRefused(v string, c column) string {
	cond := textUnreadable(v, c)
	switch c.typ {
	case model.TypeInteger, model.TypeDecimal:
		cond += " OR " + lossyExpr(v, scaleOf(c.typ))
	case model.TypeFloat:
		cond += fmt.Sprintf(" OR (isinf(TRY_CAST(%s AS DOUBLE)) AND NOT regexp_full_match(%s, '%s'))", v, v, nonFinitePattern)
	}
	return fmt.Sprintf("(%s IS NOT NULL AND (%s))", v, cond)
}

// textNumeric is a SQL condition that holds when the text value v is
// spelled as a number, so that a number it cannot be read as is out of
// range rather than misspelled.
func textNumeric(v string) string {
	return fmt.Sprintf("regexp_full_match(%s, '%s')", v, numberPattern)
}

// textParsed is the SQL that reads the text value v, already checked by
// textRefused, as column c's DuckDB type. Timestamps are parsed with
// their offset and held in UTC.
func textParsed(v string, c column) string {
	if c.typ == model.TypeTimestamp {
		return fmt.Sprintf("CAST(CAST(%s AS TIMESTAMPTZ) AS TIMESTAMP)", v)
	}
	return fmt.Sprintf("CAST(%s AS %s)", v, c.duckType)
}

// readsAsText reports whether a CSV column of type t is read as text and
// checked by textRefused, rather than parsed by the CSV reader (which
// reads 0x10 as 16 and an unreadable timestamp as NULL).
func readsAsText(t model.Type) bool {
	switch t {
	case model.TypeInteger, model.TypeDecimal, model.TypeFloat, model.TypeTimestamp:
		return true
	}
	return false
}
