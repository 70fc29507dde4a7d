package expect

import (
	"encoding/json"
	"testing"
)

// The comparison rules the hand-worked tests rely on: exact decimals
// whatever the printed scale, floats within 1e-9 relative, text as text.
func TestSame(t *testing.T) {
	cases := []struct {
		got  any
		want any
		same bool
	}{
		{json.Number("10.500"), "10.5", true},
		{json.Number("10.500000001"), "10.5", false},
		{json.Number("0.3333333333"), 1.0 / 3, true},
		{json.Number("0.3334"), 1.0 / 3, false},
		{json.Number("7"), 7, true},
		{json.Number("7.0"), 7, false},
		{"North", "North", true},
		{"north", "North", false},
		{nil, nil, true},
		{json.Number("0"), nil, false},
		{[]any{"a", "b"}, []string{"a", "b"}, true},
		{[]any{"a"}, []string{"a", "b"}, false},
	}
	for _, c := range cases {
		if got := Same(c.got, c.want); got != c.same {
			t.Errorf("Same(%#v, %#v) = %v, want %v", c.got, c.want, got, c.same)
		}
	}
}
