package engine

import (
	"strings"
	"testing"
)

// RedactDSN hides the password by the DSN's structure, well formed or not,
// and keeps the rest readable (issue 17, item 3).
func TestRedactDSN(t *testing.T) {
	cases := []struct{ in, want string }{
		{"postgres://u:secret@h:5432/db", "postgres://u:xxxxx@h:5432/db"},
		{"postgres://u@h/db", "postgres://u@h/db"},
		{"postgres://h/db?x=a@b", "postgres://h/db?x=a@b"},
		{"postgres://u:se#cr et@h:abc/db", "postgres://u:xxxxx@h:abc/db"},
		{"mysql://u:a@b@[::1/db", "mysql://u:xxxxx@[::1/db"},
		{"postgres://h/db?sslmode=disable&password=a&b&user=u", "postgres://h/db?sslmode=disable&password=xxxxx&user=u"},
		{"host=h password=sec ret dbname=d", "host=h password=xxxxx dbname=d"},
		{"host=h password = 'se c\\'ret' dbname=d", "host=h password = xxxxx dbname=d"},
		{"host=h password='unclosed dbname=d", "host=h password=xxxxx"},
		{"sqlite:/x.db?mode=ro&PASSWORD=p", "sqlite:/x.db?mode=ro&PASSWORD=xxxxx"},
		{"mysql:u:pw@tcp(h:1)/db", "mysql:xxxxx@tcp(h:1)/db"},
		{"sqlite:/data/shop.db", "sqlite:/data/shop.db"},
	}
	for _, c := range cases {
		if got := RedactDSN(c.in); got != c.want {
			t.Errorf("RedactDSN(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// ScrubText removes the password from a driver's message in the forms
// drivers show it: quoted, unescaped, and cut at a '#'.
func TestScrubText(t *testing.T) {
	dsn := "postgres://u:Abcd%41#Efgh\"@h/db"
	msg := `parse "postgres://u:Abcd%41#Efgh\"@h/db": invalid port ":Abcd%41" after host; pw AbcdA#Efgh"; Efgh`
	got := ScrubText(dsn, msg)
	for _, piece := range []string{"Abcd", "Efgh"} {
		if strings.Contains(got, piece) {
			t.Errorf("ScrubText left %q in %q", piece, got)
		}
	}
}
