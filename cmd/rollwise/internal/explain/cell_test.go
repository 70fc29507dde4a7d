package explain

import (
	"strings"
	"testing"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

func TestSplitCell(t *testing.T) {
	for _, c := range []struct {
		in   string
		want []Pair
		err  string
	}{
		{"stores.region='North'", []Pair{{"stores.region", "'North'"}}, ""},
		// Commas and equals signs inside quotes and backquotes stay.
		{"a.`x,=y`='p, q = r' , b.c = 3", []Pair{{"a.`x,=y`", "'p, q = r'"}, {"b.c", "3"}}, ""},
		{"a.b='it''s'", []Pair{{"a.b", "'it''s'"}}, ""},
		{"stores.region", nil, `"stores.region" is not TABLE.COLUMN=VALUE; write --cell`},
		{"a.b=", nil, "is not TABLE.COLUMN=VALUE"},
		{"=3", nil, "is not TABLE.COLUMN=VALUE"},
		{"a.b='open", nil, "has an unclosed '"},
	} {
		got, err := SplitCell(c.in)
		switch {
		case c.err != "":
			if err == nil || !strings.Contains(err.Error(), c.err) {
				t.Errorf("%q: error %v, want %q", c.in, err, c.err)
			}
		case err != nil:
			t.Errorf("%q: %v", c.in, err)
		case len(got) != len(c.want):
			t.Errorf("%q: %v, want %v", c.in, got, c.want)
		default:
			for i := range got {
				if got[i] != c.want[i] {
					t.Errorf("%q: %v, want %v", c.in, got, c.want)
				}
			}
		}
	}
}

func TestReadValueByType(t *testing.T) {
	day := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	for _, c := range []struct {
		in   string
		t    model.Type
		want reference.Value
		err  string
	}{
		{"North", model.TypeText, "North", ""},
		{"'North'", model.TypeText, "North", ""},
		{"'null'", model.TypeText, "null", ""},
		{"null", model.TypeText, nil, ""},
		{"NULL", model.TypeInteger, nil, ""},
		{"12", model.TypeInteger, decimal.NewFromInt(12), ""},
		{"12.5", model.TypeInteger, nil, "not a whole number"},
		{"one", model.TypeInteger, nil, "not a number; write digits"},
		{"2.25", model.TypeDecimal, decimal.RequireFromString("2.25"), ""},
		{"0.25", model.TypeFloat, 0.25, ""},
		{"true", model.TypeBoolean, true, ""},
		{"yes", model.TypeBoolean, nil, "write true or false"},
		{"2026-03-01", model.TypeDate, day, ""},
		{"'2026-03-01'", model.TypeDate, day, ""},
		{"date '2026-03-01'", model.TypeDate, day, ""},
		{"2026-03-01 08:30:00", model.TypeTimestamp, day.Add(8*time.Hour + 30*time.Minute), ""},
		{"2026-03-01T08:30:00Z", model.TypeTimestamp, day.Add(8*time.Hour + 30*time.Minute), ""},
		{"03/01/2026", model.TypeDate, nil, "write YYYY-MM-DD"},
	} {
		got, err := readValue(c.in, c.t)
		if c.err != "" {
			if err == nil || !strings.Contains(err.Error(), c.err) {
				t.Errorf("%q as %s: error %v, want %q", c.in, c.t, err, c.err)
			}
			continue
		}
		if err != nil || reference.Literal(got) != reference.Literal(c.want) {
			t.Errorf("%q as %s: %v (%v), want %v", c.in, c.t, got, err, c.want)
		}
	}
}

func TestTidy(t *testing.T) {
	for in, want := range map[string]string{
		"((revenue - cost) / revenue)":                "(revenue - cost) / revenue",
		"sum((sales.price * sales.qty))":              "sum(sales.price * sales.qty)",
		"(revenue where (sales.item = 'rose'))":       "revenue where sales.item = 'rose'",
		"(revenue)[drop stores.region]":               "revenue[drop stores.region]",
		"(sum(stock.qty))[stock.day = latest]":        "sum(stock.qty)[stock.day = latest]",
		"(a + b) * (c + d)":                           "(a + b) * (c + d)",
		"(x where (p or q)) + y":                      "(x where p or q) + y",
		"count(* per t.c having (m > ')('))":          "count(* per t.c having (m > ')('))",
		"((revenue where (stores.region = 'North')))": "revenue where stores.region = 'North'",
	} {
		if got := tidy(in); got != want {
			t.Errorf("tidy(%q) = %q, want %q", in, got, want)
		}
	}
}
