package model

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// timeUnits maps the units a time edit accepts (singular and plural) to
// the singular.
var timeUnits = map[string]string{
	"day": "day", "days": "day", "week": "week", "weeks": "week", "month": "month", "months": "month",
	"quarter": "quarter", "quarters": "quarter", "year": "year", "years": "year",
}

// timeForms are the time edits as they are written, for messages.
const timeForms = "D = latest, D = earliest, D back N UNIT, D to date UNIT, D running, D last N UNIT"

// timeEdit resolves a time edit (language.md, "Time") into ce: the date
// column, the word, and the count and unit it needs.
func (x *exprResolver) timeEdit(ed *grammar.Edit, ce *CellEdit) bool {
	t := ed.Time
	if ed.Target == nil || ed.Target.Table == "" {
		name := ""
		if ed.Target != nil {
			name = ed.Target.Name
		}
		x.errorf(ed.Pos, "bad-edit", "a time edit takes a date column, written table.column, not '%s'", name).Suggestion =
			"write for example m[sales.sold_on back 1 year]"
		return false
	}
	if ce.Col = x.r.columnRef(ed.Target, nil); ce.Col == nil {
		return false
	}
	if ce.Col.Type != TypeDate && ce.Col.Type != TypeTimestamp {
		x.errorf(ed.Target.Pos, "bad-edit", "a time edit moves a date or timestamp column; %s is %s", ce.Col, ce.Col.Type).Suggestion =
			"name the fact's date column or a calendar's date key reached through a link"
		return false
	}
	word := strings.ToLower(t.Word.Name)
	kinds := map[string]EditKind{"latest": EditLatest, "earliest": EditEarliest, "back": EditBack, "to": EditToDate, "running": EditRunning, "last": EditLast}
	kind, ok := kinds[word]
	if !ok {
		x.errorf(t.Word.Pos, "bad-edit", "unknown time edit '%s'", t.Word.Name).Suggestion = "write one of " + timeForms
		return false
	}
	ce.Kind = kind
	needN := kind == EditBack || kind == EditLast
	needUnit := needN || kind == EditToDate
	form := map[EditKind]string{EditLatest: "D = latest", EditEarliest: "D = earliest", EditBack: "D back N UNIT",
		EditToDate: "D to date UNIT", EditRunning: "D running", EditLast: "D last N UNIT"}[kind]
	bad := func(p grammar.Pos, what string) bool {
		x.errorf(p, "bad-edit", "%s: this time edit is written %s", what, form).Suggestion =
			"UNIT is day, week, month, quarter or year (plurals accepted); N is a whole number"
		return false
	}
	switch {
	case t.Date != (kind == EditToDate):
		return bad(t.Pos, "'date' does not belong here")
	case needN && t.N == nil:
		return bad(t.Pos, "a number of units is missing")
	case !needN && t.N != nil:
		return bad(t.N.Pos, "unexpected number")
	case needUnit && t.Unit == nil:
		return bad(t.Pos, "a unit is missing")
	case !needUnit && t.Unit != nil:
		return bad(t.Unit.Pos, fmt.Sprintf("unexpected '%s'", t.Unit.Name))
	}
	if t.N != nil {
		n, err := strconv.Atoi(t.N.Text)
		if err != nil || n < 0 || n > 100000 {
			return bad(t.N.Pos, fmt.Sprintf("'%s' is not a whole number of units", t.N.Text))
		}
		if kind == EditLast && n == 0 {
			return bad(t.N.Pos, "last 0 units holds no rows")
		}
		ce.N = n
	}
	if t.Unit != nil {
		u, ok := timeUnits[strings.ToLower(t.Unit.Name)]
		if !ok {
			return bad(t.Unit.Pos, fmt.Sprintf("unknown unit '%s'", t.Unit.Name))
		}
		ce.Unit = u
	}
	return true
}

// TimeText spells a time edit after its column: "= latest", "back 1 year",
// "to date month", "running", "last 3 month".
func (ed *CellEdit) TimeText() string {
	switch ed.Kind {
	case EditLatest:
		return "= latest"
	case EditEarliest:
		return "= earliest"
	case EditBack:
		return fmt.Sprintf("back %d %s", ed.N, ed.Unit)
	case EditToDate:
		return "to date " + ed.Unit
	case EditRunning:
		return "running"
	case EditLast:
		return fmt.Sprintf("last %d %s", ed.N, ed.Unit)
	}
	return ""
}
