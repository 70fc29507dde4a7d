package grammar

import "testing"

func TestDeclarationText(t *testing.T) {
	src := "-- head\nmeasure revenue = sum(s.p)  -- inside\n  format currency \"money in\"\n-- about the next one\n\nMEASURE b = revenue / 2\nview v = b by s.x"
	f, diags := Parse("m.roll", src)
	if diags.HasErrors() {
		t.Fatal(diags)
	}
	cases := []struct {
		offset int
		want   string
	}{
		{f.Measures[0].Name.Pos.Offset, "measure revenue = sum(s.p)  -- inside\n  format currency \"money in\""},
		{f.Measures[1].Name.Pos.Offset, "MEASURE b = revenue / 2"},
		{-1, ""},
		{len(src), ""},
	}
	for _, c := range cases {
		if got := DeclarationText(src, c.offset); got != c.want {
			t.Errorf("DeclarationText(%d) = %q, want %q", c.offset, got, c.want)
		}
	}
}
