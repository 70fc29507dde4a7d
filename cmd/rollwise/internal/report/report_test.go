package report

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/shopspring/decimal"
)

func dec(s string) decimal.Decimal { return decimal.RequireFromString(s) }

// sample has a detail row, a NULL group value, a subtotal and a grand
// total, with a decimal, a float, a percent, an integer and a date.
func sample() *Table {
	march := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	tenth := 0.1
	noisy := tenth + 0.2 // 0.30000000000000004 at run time
	return &Table{
		Columns: []Column{
			{Name: "plants.family", Group: true},
			{Name: "sales.sold_month", Group: true},
			{Name: "revenue", Format: model.FormatCurrency},
			{Name: "basket"},
			{Name: "margin_rate", Format: model.FormatPercent},
			{Name: "receipts", Format: model.FormatInteger},
		},
		Rows: []Row{
			{Values: []any{"Roses", march, dec("1234567.505"), noisy, 0.25, int64(1200)}},
			{Values: []any{nil, march, dec("-12.345"), 2.0 / 3.0, nil, int64(3)}},
			{Values: []any{"Roses", nil, dec("1234567.505"), noisy, 0.25, int64(1200)}, RolledUp: []string{"sales.sold_month"}},
			{Values: []any{nil, nil, dec("1234555.16"), 12.5, 0.24994, int64(1203)}, RolledUp: []string{"plants.family", "sales.sold_month"}},
		},
	}
}

func render(t *testing.T, tb *Table, o Options) string {
	t.Helper()
	var b bytes.Buffer
	if err := Write(&b, tb, o); err != nil {
		t.Fatalf("Write(%+v): %v", o, err)
	}
	return b.String()
}

func expectOutput(t *testing.T, got, want string) {
	t.Helper()
	if got != want {
		t.Errorf("got:\n%s\nwant:\n%s", got, want)
	}
}

func TestTableFormat(t *testing.T) {
	expectOutput(t, render(t, sample(), Options{Format: "table"}), ""+
		" plants.family │ sales.sold_month │      revenue │ basket │ margin_rate │ receipts\n"+
		"───────────────┼──────────────────┼──────────────┼────────┼─────────────┼──────────\n"+
		" Roses         │ 2026-03-01       │ 1,234,567.51 │    0.3 │       25.0% │    1,200\n"+
		" (null)        │ 2026-03-01       │       -12.35 │ 0.6667 │             │        3\n"+
		" Roses         │ Total            │ 1,234,567.51 │    0.3 │       25.0% │    1,200\n"+
		" All           │ All              │ 1,234,555.16 │   12.5 │       25.0% │    1,203\n")
	// The default format is table.
	expectOutput(t, render(t, sample(), Options{}), render(t, sample(), Options{Format: "table"}))
}

func TestTableFormatColorBoldsTotalRowsOnly(t *testing.T) {
	out := render(t, sample(), Options{Format: "table", Color: true})
	lines := strings.Split(out, "\n")
	if len(lines) != 7 {
		t.Fatalf("got %d lines:\n%s", len(lines), out)
	}
	for i, l := range lines[:4] {
		if strings.Contains(l, "\x1b[") {
			t.Errorf("line %d is not a total but has escapes: %q", i, l)
		}
	}
	for _, want := range []string{"\x1b[1mTotal\x1b[0m", "\x1b[1m1,234,567.51\x1b[0m"} {
		if !strings.Contains(lines[4], want) {
			t.Errorf("subtotal line %q lacks %q", lines[4], want)
		}
	}
	if !strings.Contains(lines[5], "\x1b[1mAll\x1b[0m") {
		t.Errorf("grand total line %q is not bold", lines[5])
	}
	// Escapes do not upset the alignment.
	plain := strings.NewReplacer("\x1b[1m", "", "\x1b[0m", "").Replace(out)
	expectOutput(t, plain, render(t, sample(), Options{Format: "table"}))
}

func TestTableFormatWrapsTextToFitWidth(t *testing.T) {
	tb := &Table{
		Columns: []Column{{Name: "plants.name", Group: true}, {Name: "revenue", Format: model.FormatCurrency}},
		Rows: []Row{
			{Values: []any{"Rosa 'Gertrude Jekyll' climbing rose", dec("1234.5")}},
			{Values: []any{nil, dec("99999.99")}, RolledUp: []string{"plants.name"}},
		},
	}
	expectOutput(t, render(t, tb, Options{Format: "table", Width: 30}), ""+
		" plants.name      │   revenue\n"+
		"──────────────────┼───────────\n"+
		" Rosa 'Gertrude   │  1,234.50\n"+
		" Jekyll' climbing │\n"+
		" rose             │\n"+
		" All              │ 99,999.99\n")
	for _, l := range strings.Split(render(t, tb, Options{Format: "table", Width: 30}), "\n") {
		if n := len([]rune(l)); n > 30 {
			t.Errorf("line %q is %d wide", l, n)
		}
	}
	// Numbers are never cut, even when the width cannot be met.
	out := render(t, tb, Options{Format: "table", Width: 5})
	if !strings.Contains(out, "99,999.99") || !strings.Contains(out, "1,234.50") {
		t.Errorf("numbers were cut:\n%s", out)
	}
}

func TestMarkdownFormat(t *testing.T) {
	expectOutput(t, render(t, sample(), Options{Format: "markdown"}), ""+
		"| plants.family | sales.sold_month |      revenue | basket | margin_rate | receipts |\n"+
		"|:------------- |:---------------- | ------------:| ------:| -----------:| --------:|\n"+
		"| Roses         | 2026-03-01       | 1,234,567.51 |    0.3 |       25.0% |    1,200 |\n"+
		"| (null)        | 2026-03-01       |       -12.35 | 0.6667 |             |        3 |\n"+
		"| Roses         | **Total**        | 1,234,567.51 |    0.3 |       25.0% |    1,200 |\n"+
		"| **All**       | **All**          | 1,234,555.16 |   12.5 |       25.0% |    1,203 |\n")
}

func TestCSVFormat(t *testing.T) {
	expectOutput(t, render(t, sample(), Options{Format: "csv"}), ""+
		"plants.family,sales.sold_month,revenue,basket,margin_rate,receipts,rolled_up\n"+
		"Roses,2026-03-01,1234567.505,0.30000000000000004,0.25,1200,\n"+
		",2026-03-01,-12.345,0.6666666666666666,,3,\n"+
		"Roses,,1234567.505,0.30000000000000004,0.25,1200,sales.sold_month\n"+
		",,1234555.16,12.5,0.24994,1203,plants.family;sales.sold_month\n")
}

func TestJSONFormat(t *testing.T) {
	out := render(t, sample(), Options{Format: "json"})
	expectOutput(t, out, ""+
		"[\n"+
		`  {"plants.family": "Roses", "sales.sold_month": "2026-03-01", "revenue": 1234567.505, "basket": 0.30000000000000004, "margin_rate": 0.25, "receipts": 1200, "rolled_up": []},`+"\n"+
		`  {"plants.family": null, "sales.sold_month": "2026-03-01", "revenue": -12.345, "basket": 0.6666666666666666, "margin_rate": null, "receipts": 3, "rolled_up": []},`+"\n"+
		`  {"plants.family": "Roses", "sales.sold_month": null, "revenue": 1234567.505, "basket": 0.30000000000000004, "margin_rate": 0.25, "receipts": 1200, "rolled_up": ["sales.sold_month"]},`+"\n"+
		`  {"plants.family": null, "sales.sold_month": null, "revenue": 1234555.16, "basket": 12.5, "margin_rate": 0.24994, "receipts": 1203, "rolled_up": ["plants.family", "sales.sold_month"]}`+"\n"+
		"]\n")
	// It parses, and decimals survive exactly.
	var rows []map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatalf("output is not JSON: %v", err)
	}
	if got := string(rows[0]["revenue"]); got != "1234567.505" {
		t.Errorf("revenue = %s", got)
	}
}

func TestJSONEdgeValues(t *testing.T) {
	big := dec("123456789012345678901234567890.123456789")
	tb := &Table{
		Columns: []Column{{Name: "k", Group: true}, {Name: "f"}, {Name: "d"}, {Name: "ts"}, {Name: "b"}, {Name: `q"<&>`}},
		Rows: []Row{
			{Values: []any{"a\nb", math.NaN(), big, time.Date(2026, 3, 1, 10, 30, 0, 0, time.UTC), true, "x"}},
			{Values: []any{"c", math.Inf(-1), dec("1e-20"), time.Date(2026, 3, 1, 0, 0, 0, 500, time.UTC), nil, nil}},
			{Values: []any{"d", 1e21, decimal.New(5, 30), nil, false, int64(7)}},
		},
	}
	expectOutput(t, render(t, tb, Options{Format: "json"}), ""+
		"[\n"+
		`  {"k": "a\nb", "f": null, "d": 123456789012345678901234567890.123456789, "ts": "2026-03-01T10:30:00Z", "b": true, "q\"<&>": "x", "rolled_up": []},`+"\n"+
		`  {"k": "c", "f": null, "d": 0.00000000000000000001, "ts": "2026-03-01T00:00:00.0000005Z", "b": null, "q\"<&>": null, "rolled_up": []},`+"\n"+
		`  {"k": "d", "f": 1e+21, "d": 5000000000000000000000000000000, "ts": null, "b": false, "q\"<&>": 7, "rolled_up": []}`+"\n"+
		"]\n")
}

func TestEmptyResults(t *testing.T) {
	tb := &Table{Columns: []Column{{Name: "plants.family", Group: true}, {Name: "revenue"}}}
	expectOutput(t, render(t, tb, Options{Format: "json"}), "[]\n")
	expectOutput(t, render(t, tb, Options{Format: "csv"}), "plants.family,revenue,rolled_up\n")
	expectOutput(t, render(t, tb, Options{Format: "markdown"}), ""+
		"| plants.family | revenue |\n"+
		"|:------------- |:------- |\n")
}

func TestDisplayFormats(t *testing.T) {
	cases := []struct {
		v      any
		format model.Format
		want   string
	}{
		{0.30000000000000004, model.FormatNone, "0.3"},
		{dec("1234567.123456"), model.FormatNone, "1234567.1235"},
		{dec("1234567.123456"), model.FormatNumber, "1,234,567.1235"},
		{dec("2"), model.FormatNone, "2"},
		{0.0000123456, model.FormatNone, "0.00001235"},
		{-0.00004, model.FormatNone, "-0.00004"},
		{int64(-1234567), model.FormatNone, "-1234567"},
		{int64(-1234567), model.FormatInteger, "-1,234,567"},
		{2.5, model.FormatInteger, "3"},
		{-2.5, model.FormatInteger, "-3"},
		{dec("999.995"), model.FormatCurrency, "1,000.00"},
		{dec("-0.001"), model.FormatCurrency, "0.00"},
		{int64(100), model.FormatCurrency, "100.00"},
		{0.12345, model.FormatPercent, "12.3%"},
		{dec("0.00049"), model.FormatPercent, "0.0%"},
		{dec("-0.5"), model.FormatPercent, "-50.0%"},
		{int64(12), model.FormatPercent, "1,200.0%"},
		{math.Inf(1), model.FormatCurrency, "+Inf"},
		{"text", model.FormatPercent, "text"},
		{dec("18446744073709551615"), model.FormatInteger, "18,446,744,073,709,551,615"},
	}
	for _, c := range cases {
		tb := &Table{Columns: []Column{{Name: "m", Format: c.format}}, Rows: []Row{{Values: []any{c.v}}}}
		out := render(t, tb, Options{Format: "markdown"})
		lines := strings.Split(out, "\n")
		got := strings.TrimSpace(strings.Trim(lines[2], "|"))
		if got != c.want {
			t.Errorf("%T %v as %q = %q, want %q", c.v, c.v, c.format, got, c.want)
		}
	}
}

func TestGroupValuesShowInFull(t *testing.T) {
	tb := &Table{
		Columns: []Column{{Name: "g", Group: true}, {Name: "ts", Group: true}, {Name: "m", Format: model.FormatCurrency}},
		Rows: []Row{
			{Values: []any{dec("1234.56789"), time.Date(2026, 3, 1, 10, 30, 0, 0, time.UTC), 1.0}},
			{Values: []any{"", time.Date(2026, 3, 2, 0, 0, 0, 0, time.UTC), 2.0}},
		},
	}
	expectOutput(t, render(t, tb, Options{Format: "markdown"}), ""+
		"| g          | ts                  |    m |\n"+
		"|:---------- |:------------------- | ----:|\n"+
		"| 1234.56789 | 2026-03-01 10:30:00 | 1.00 |\n"+
		"|            | 2026-03-02 00:00:00 | 2.00 |\n")
}

func TestValidFormat(t *testing.T) {
	for _, f := range []string{"table", "csv", "json", "markdown", "html"} {
		if err := ValidFormat(f); err != nil {
			t.Errorf("ValidFormat(%q) = %v", f, err)
		}
	}
	err := ValidFormat("yaml")
	if err == nil || !strings.Contains(err.Error(), `"yaml"`) || !strings.Contains(err.Error(), "table, csv, json, markdown, html") {
		t.Errorf("ValidFormat(yaml) = %v", err)
	}
	if err := Write(&bytes.Buffer{}, sample(), Options{Format: "xml"}); err == nil {
		t.Error("Write accepted format xml")
	}
}

func TestBadInputIsAnError(t *testing.T) {
	cols := []Column{{Name: "g", Group: true}, {Name: "m"}}
	cases := []struct {
		name   string
		t      *Table
		format string
		want   string
	}{
		{"nil table", nil, "table", "no table"},
		{"short row", &Table{Columns: cols, Rows: []Row{{Values: []any{"a"}}}}, "table", "row 1 has 1 values for 2 columns"},
		{"unknown rolled up", &Table{Columns: cols, Rows: []Row{{Values: []any{"a", 1.0}, RolledUp: []string{"m"}}}}, "json", `rolls up "m"`},
		{"unsupported value", &Table{Columns: cols, Rows: []Row{{Values: []any{"a", []int{1}}}}}, "csv", "row 1, column m: unsupported value type []int"},
		{"duplicate name", &Table{Columns: []Column{{Name: "m"}, {Name: "m"}}}, "json", `two columns are named "m"`},
		{"rolled_up name", &Table{Columns: []Column{{Name: "rolled_up"}}}, "csv", `named "rolled_up"`},
	}
	for _, c := range cases {
		err := Write(&bytes.Buffer{}, c.t, Options{Format: c.format})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
		}
	}
}
