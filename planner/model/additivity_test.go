package model_test

import (
	"strings"
	"testing"

	"pgregory.net/rapid"
)

// Additivity follows the value, not the spelling (issue 13, rule 6;
// language.md, "Additivity follows the value"): each of these once passed
// check and added up a unit price or a stock level.
func TestNonadditiveFollowsTheValue(t *testing.T) {
	for _, m := range []string{
		"sum(sales.price * 1)",                              // a constant factor keeps the kind
		"sum(coalesce(sales.price, 0))",                     // coalesce keeps it
		"sum(case when sales.qty > 0 then sales.price end)", // case keeps it
		"sum(-sales.price + 2)",                             // so do minus and a constant term
		"sum(sales.qty / sales.id)",                         // a row-level ratio of columns
		"sum(copies.price_each)",                            // a derived copy
	} {
		_, got := load(t, copies+"measure m = "+m+"\n")
		if len(got) == 0 || !strings.Contains(strings.Join(got, "\n"), "error: sum of ") {
			t.Errorf("%s: no nonadditive-sum error:\n%s", m, strings.Join(got, "\n"))
		}
	}
	for _, m := range []string{
		"sum(sales.price * sales.qty)", // a rate times a quantity is additive
		"sum(sales.qty * 2)",
		"avg(coalesce(sales.price, 0))", // only sum is refused
	} {
		if _, got := load(t, "measure m = "+m+"\n"); len(got) != 0 {
			t.Errorf("%s: want no diagnostic, got:\n%s", m, strings.Join(got, "\n"))
		}
	}
}

// copies reads the relation of sales again: it keeps price nonadditive
// (and copies it) but leaves out the semiadditivity of balance: a
// warning names both tables.
const copies = `table copies at "sales" {
  key id
  id integer
  price decimal nonadditive
  balance decimal
  price_each = price
}
`

func TestSecondTableOverRelationWarns(t *testing.T) {
	_, got := load(t, copies)
	want := "warning: copies.balance and sales.balance read the same relation sales, but only sales.balance is declared semiadditive(sales.day)"
	if len(got) != 1 || !strings.Contains(got[0], want) {
		t.Errorf("got:\n%s\nwant one: %s", strings.Join(got, "\n"), want)
	}
}

// A semiadditive sum is allowed only where the final cell, after every
// edit and per-grain group, holds its date to one value.
func TestSemiadditiveNeedsTheDateHeldAfterEveryEdit(t *testing.T) {
	const d1, d2 = "date '2026-01-30'", "date '2026-01-31'"
	for _, m := range []string{
		"sum(sales.balance)[sales.day = " + d2 + "; drop sales.day]", // the pin is dropped
		"sum(sales.balance)[sales.day = " + d2 + "; drop sales]",
		"sum(sales.balance)[sales.day = " + d2 + "; drop]",
		"(sum(sales.balance)[sales.day in (" + d1 + ", " + d2 + ")])[sales.day = " + d2 + "]", // an inner pin widens it
		"sum(sum(sales.balance)[drop sales.day] per sales.day)",                               // the group is dropped
		"sum(sales.balance * 1)", // a constant factor keeps the kind
	} {
		_, got := load(t, "measure m = "+m+"\n")
		if !strings.Contains(strings.Join(got, "\n"), "error: sum of ") {
			t.Errorf("%s: no semiadditive-sum error:\n%s", m, strings.Join(got, "\n"))
		}
	}
	for _, m := range []string{
		"sum(sales.balance)[sales.day = " + d2 + "]",
		"(sum(sales.balance)[drop stores])[sales.day = " + d2 + "]",     // the inner edit leaves the pin
		"sum(sum(sales.balance) per sales.day)",                         // each group holds the day
		"sum(sales.balance)[sales.day = " + d2 + "; ungroup sales.day]", // ungroup keeps a pin
		"sum(sales.balance * sales.price)[sales.day = " + d2 + "]",      // semiadditive times a rate stays so
	} {
		_, got := load(t, "measure m = "+m+"\n")
		if strings.Contains(strings.Join(got, "\n"), "error:") {
			t.Errorf("%s: want no error, got:\n%s", m, strings.Join(got, "\n"))
		}
	}
}

// A pin that an inner pin on the same column replaces has no effect: a
// warning at the outer pin.
func TestDeadPinWarns(t *testing.T) {
	expectErrors(t, "measure m = (sum(sales.qty)[sales.day = date '2026-01-30'])[sales.day = date '2026-01-31']\n",
		at(0, 61)+": warning: this pin of sales.day has no effect: the pin at "+at(0, 29)+" replaces it | hint: remove one of the two pins")
}

// A pin before `= latest` (or around a measure that `= earliest` edits)
// is not dead: E is the latest day among the rows it keeps
// (revenue[D = latest; D = earliest] is the value on E, not on F).
func TestPinBeforeLatestIsNotDead(t *testing.T) {
	for _, m := range []string{
		"sum(sales.qty)[sales.day = latest; sales.day = earliest]",
		"(sum(sales.qty)[sales.day = earliest])[sales.day = date '2026-01-31']",
		"sum(sales.qty)[sales.day in (date '2026-01-30', date '2026-01-31'); sales.day = latest]",
	} {
		_, got := load(t, "measure m = "+m+"\n")
		if strings.Contains(strings.Join(got, "\n"), "dead-pin") || strings.Contains(strings.Join(got, "\n"), "has no effect") {
			t.Errorf("%s: want no dead-pin warning, got:\n%s", m, strings.Join(got, "\n"))
		}
	}
	// a literal pin after = latest does replace it
	expectErrors(t, "measure m = sum(sales.qty)[sales.day = latest; sales.day = date '2026-01-31']\n",
		at(0, 28)+": warning: this pin of sales.day has no effect: the pin at "+at(0, 48)+" replaces it | hint: remove one of the two pins")
}

// wrapKeeping draws a row expression around x that keeps x's kind: a copy
// through coalesce, case, abs, round, a constant factor or term, nested.
func wrapKeeping(t *rapid.T, x string, depth int) string {
	if depth == 0 {
		return x
	}
	inner := wrapKeeping(t, x, depth-1)
	switch rapid.IntRange(0, 6).Draw(t, "wrap") {
	case 0:
		return "coalesce(" + inner + ", 0)"
	case 1:
		return "(" + inner + ") * " + rapid.SampledFrom([]string{"1", "2", "0.5"}).Draw(t, "factor")
	case 2:
		return "case when sales.qty > 1 then " + inner + " else 0 end"
	case 3:
		return "abs(" + inner + ")"
	case 4:
		return "round(" + inner + ", 1)"
	case 5:
		return "(" + inner + ") / 4"
	}
	return "-(" + inner + ") + 1"
}

// Property: any kind-keeping wrapping of a nonadditive column is refused
// under sum, and the same wrapping times a quantity (a rate times a
// quantity) is accepted; a semiadditive one is refused unless pinned.
func TestAdditivityRulesProperty(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		depth := rapid.IntRange(1, 4).Draw(t, "depth")
		w := wrapKeeping(t, "sales.price", depth)
		if _, got := load(nil, "measure m = sum("+w+")\n"); !strings.Contains(strings.Join(got, "\n"), "nonadditive") {
			t.Fatalf("sum(%s) is not refused: %v", w, got)
		}
		if _, got := load(nil, "measure m = sum(("+w+") * sales.qty)\n"); len(got) != 0 {
			t.Fatalf("sum((%s) * sales.qty) is refused: %v", w, got)
		}
		b := wrapKeeping(t, "sales.balance", depth)
		if _, got := load(nil, "measure m = sum("+b+")\n"); !strings.Contains(strings.Join(got, "\n"), "semiadditive") {
			t.Fatalf("sum(%s) is not refused: %v", b, got)
		}
		if _, got := load(nil, "measure m = sum("+b+")[sales.day = date '2026-01-31']\n"); len(got) != 0 {
			t.Fatalf("sum(%s) pinned is refused: %v", b, got)
		}
	})
}
