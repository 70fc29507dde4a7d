package main

import (
	"bytes"
	"strings"
	"testing"
)

// The password pieces of the malformed DSNs below: neither may appear in
// any output of run, verify or check, however the DSN is broken (issue
// 17, item 3: the probe's 21 malformed DSNs, of which 10 showed the
// password, and more).
const pwA, pwB = "Pw0rdAAA", "Pw0rdBBB"

// secretDSNs are malformed (and a few well formed but unreachable) DSNs
// that hold the password pwA+SEP+pwB. Port 1 of the loopback refuses at
// once, so nothing waits on a network.
func secretDSNs() []string {
	var out []string
	for _, scheme := range []string{"postgres", "postgresql", "POSTGRES", "mysql", "mariadb", "sqlite"} {
		for _, f := range []string{
			"%s://u:" + pwA + "#" + pwB + "@127.0.0.1:1/db",     // '#' starts a fragment
			"%s://u:" + pwA + " " + pwB + "@127.0.0.1:1/db",     // a space
			"%s://u:" + pwA + "%zz" + pwB + "@127.0.0.1:1/db",   // a bad %-escape
			"%s://u:" + pwA + "%41" + pwB + "@127.0.0.1:abc/db", // a good escape, bad port
			"%s://u:" + pwA + pwB + "@127.0.0.1:abc/db",         // a port that is no number
			"%s://u:" + pwA + pwB + "@127.0.0.1:99999/db",       // a port out of range
			"%s://u:" + pwA + pwB + "@[::1/db",                  // an unclosed IPv6 host
			"%s://u:" + pwA + "@" + pwB + "@127.0.0.1:1/db",     // '@' in the password
			"%s://u:" + pwA + "/" + pwB + "@127.0.0.1:1/db",     // '/' in the password
			"%s://u:" + pwA + "?" + pwB + "@127.0.0.1:1/db",     // '?' in the password
			"%s://u:" + pwA + "\"" + pwB + "@127.0.0.1:1/db",    // a quote (messages quote it)
			"%s://u:" + pwA + "\n" + pwB + "@127.0.0.1:1/db",    // a control character
			"%s://u:" + pwA + pwB + "@127.0.0.1:1/db",           // well formed, refused
			"%s://u:" + pwA + pwB + "@127.0.0.1:1/db?bogus=1",   // an unknown parameter
			"%s://127.0.0.1:1/db?password=" + pwA + pwB,         // password as a parameter
			"%s://127.0.0.1:1/db?sslmode=disable&password=" + pwA + "&" + pwB,
			"%s:u:" + pwA + pwB + "@tcp(127.0.0.1:1)/db", // the Go MySQL driver's own form
		} {
			out = append(out, strings.Replace(f, "%s", scheme, 1))
		}
	}
	return append(out,
		"host=127.0.0.1 port=1 user=u password="+pwA+pwB+" dbname=db", // the keyword form
		"host=127.0.0.1 password='"+pwA+" "+pwB+"' dbname=db",
		"password="+pwA+" "+pwB+" host=127.0.0.1",
		"u:"+pwA+pwB+"@127.0.0.1/db", // no scheme
		"sqlite:/nonexistent/x.db?password="+pwA+pwB,
		"sqlite:/nonexistent/x.db?mode=ro&password="+pwA+"%zz"+pwB+"&attach=a=b.db",
	)
}

func TestDSNPasswordInNoOutput(t *testing.T) {
	t.Parallel()
	commands := map[string][]string{
		"run":    {"run", shopModel, "-m", "revenue", "-b", "stores.region"},
		"verify": {"verify", shopModel, "--sql", "../../testdata/verify/right_grand.sql", "-m", "revenue", "-b", "sales.item", "--totals", "grand"},
		"check":  {"check", writeRequiredShop(t, true)},
	}
	for _, dsn := range secretDSNs() {
		for name, args := range commands {
			var out, errb bytes.Buffer
			code := Main(append(append([]string{}, args...), "--dsn", dsn), strings.NewReader(""), &out, &errb)
			if code == 0 {
				t.Errorf("%s --dsn %q: exit 0, want a failure", name, dsn)
			}
			if errb.Len() == 0 {
				t.Errorf("%s --dsn %q: no message", name, dsn)
			}
			for _, pw := range []string{pwA, pwB} {
				if strings.Contains(out.String()+errb.String(), pw) {
					t.Errorf("%s --dsn %q shows the password's text %q:\nstdout: %s\nstderr: %s", name, dsn, pw, out.String(), errb.String())
				}
			}
		}
	}
}
