package grammar

import (
	"fmt"
	"testing"
)

func TestTokens(t *testing.T) {
	got := Tokens("m.roll", "-- note\nmeasure `a b` = sum(sales.qty) where x.y <> 'it''s' \"f\" 1.5e3 @")
	want := []string{
		"comment -- note 1:1", "keyword measure 2:1", "name `a b` 2:9", "operator = 2:15", "name sum 2:17", "operator ( 2:20",
		"name sales 2:21", "operator . 2:26", "name qty 2:27", "operator ) 2:30", "keyword where 2:32", "name x 2:38",
		"operator . 2:39", "name y 2:40", "operator <> 2:42", "string 'it''s' 2:45", "text \"f\" 2:53", "number 1.5e3 2:57", "bad @ 2:63",
	}
	if len(got) != len(want) {
		t.Fatalf("%d tokens: %v", len(got), got)
	}
	for i, w := range want {
		if g := fmt.Sprintf("%s %s %d:%d", got[i].Kind, got[i].Text, got[i].Line, got[i].Col); g != w {
			t.Errorf("token %d = %q, want %q", i, g, w)
		}
	}
}
