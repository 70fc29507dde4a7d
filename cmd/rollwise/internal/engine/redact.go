package engine

import (
	"net/url"
	"regexp"
	"sort"
	"strconv"
	"strings"
)

// Passwords are found in a DSN by its structure alone, never by parsing
// it: a DSN that fails to parse (a '#' or a space in the password, a bad
// %-escape, a port that is not a number, an unclosed IPv6 host) is exactly
// the one whose text ends up in an error message. Where the structure is
// unclear, more is hidden rather than less.

// passwordKey starts a password given as KEY=VALUE: a URL query parameter
// (?password=...) or the keyword form (host=... password=...).
var passwordKey = regexp.MustCompile(`(?i)(?:^|[^a-z0-9_])(password|passwd|pwd|pass|sslpassword)\s*=\s*`)

// nextKey starts the KEY=VALUE that follows an unquoted value.
var nextKey = regexp.MustCompile(`[&;\s]+[A-Za-z_][A-Za-z0-9_]*\s*=`)

// passwordSpans returns the byte ranges of dsn that may hold a password:
// the user information's text after its first ':' (up to the last '@' of
// the DSN, since a password may hold an unescaped '@'), and the values of
// password parameters (up to their closing quote, or to the next KEY=, or
// to the end).
func passwordSpans(dsn string) [][2]int {
	var spans [][2]int
	start := 0
	if i := strings.Index(dsn, "://"); i >= 0 {
		start = i + 3
	}
	if at := strings.LastIndex(dsn, "@"); at > start {
		if c := strings.Index(dsn[start:at], ":"); c >= 0 {
			spans = append(spans, [2]int{start + c + 1, at})
		}
	}
	for _, m := range passwordKey.FindAllStringIndex(dsn, -1) {
		from := m[1]
		spans = append(spans, [2]int{from, valueEnd(dsn, from)})
	}
	return spans
}

// valueEnd is where the value that starts at dsn[from] ends: after its
// closing quote if it is quoted (the end of dsn if the quote is never
// closed), else before the next KEY= or at the end of dsn.
func valueEnd(dsn string, from int) int {
	if from < len(dsn) && (dsn[from] == '\'' || dsn[from] == '"') {
		q := dsn[from]
		for i := from + 1; i < len(dsn); i++ {
			switch dsn[i] {
			case '\\':
				i++
			case q:
				return i + 1
			}
		}
		return len(dsn)
	}
	if m := nextKey.FindStringIndex(dsn[from:]); m != nil {
		return from + m[0]
	}
	return len(dsn)
}

// RedactDSN returns dsn with everything that may be a password replaced
// by xxxxx, whether or not dsn is well formed.
func RedactDSN(dsn string) string {
	spans := passwordSpans(dsn)
	if len(spans) == 0 {
		return dsn
	}
	sort.Slice(spans, func(i, j int) bool { return spans[i][0] < spans[j][0] })
	var b strings.Builder
	last := 0
	for _, s := range spans {
		if s[0] < last {
			s[0] = last
		}
		if s[1] <= s[0] {
			continue
		}
		b.WriteString(dsn[last:s[0]])
		b.WriteString("xxxxx")
		last = s[1]
	}
	b.WriteString(dsn[last:])
	return b.String()
}

// secretPieces are the texts a message must not show for dsn: the DSN
// itself, each password span, their unescaped, escaped and Go-quoted
// forms (drivers quote the text they reject), and the pieces of a
// password between its punctuation, which a parser that split the DSN at
// a '#' or a space shows alone. Longest first, so that a piece never
// breaks up a longer text before that is replaced.
func secretPieces(dsn string) []string {
	seen := map[string]bool{}
	add := func(s string) {
		s = strings.TrimSpace(s)
		if len(s) >= 4 && !seen[s] {
			seen[s] = true
		}
	}
	for _, sp := range passwordSpans(dsn) {
		pw := dsn[sp[0]:sp[1]]
		forms := []string{pw, url.QueryEscape(pw), url.PathEscape(pw), quoted(pw)}
		if u, err := url.QueryUnescape(pw); err == nil {
			forms = append(forms, u, quoted(u))
		}
		if u, err := url.PathUnescape(pw); err == nil {
			forms = append(forms, u)
		}
		for _, f := range forms {
			add(f)
			for _, p := range strings.FieldsFunc(f, isPunct) {
				add(p)
			}
		}
	}
	out := make([]string, 0, len(seen))
	for s := range seen {
		out = append(out, s)
	}
	sort.Slice(out, func(i, j int) bool {
		if len(out[i]) != len(out[j]) {
			return len(out[i]) > len(out[j])
		}
		return out[i] < out[j]
	})
	return out
}

// quoted is s as %q writes it, without the quotes.
func quoted(s string) string { q := strconv.Quote(s); return q[1 : len(q)-1] }

// isPunct separates the pieces of a password: anything but a letter or a
// digit.
func isPunct(r rune) bool {
	return !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r > 127)
}

// ScrubText removes from text every password dsn may hold, in any of the
// forms a driver's message shows it in.
func ScrubText(dsn, text string) string {
	if dsn == "" {
		return text
	}
	text = strings.ReplaceAll(text, dsn, RedactDSN(dsn))
	text = strings.ReplaceAll(text, quoted(dsn), quoted(RedactDSN(dsn)))
	for _, p := range secretPieces(dsn) {
		text = strings.ReplaceAll(text, p, "xxxxx")
	}
	return text
}

// scrubbed is an error whose message no longer shows a password; it
// still unwraps to the original (for errors.Is on timeouts and
// cancellation), which must not be printed.
type scrubbed struct {
	msg string
	err error
}

func (e *scrubbed) Error() string { return e.msg }
func (e *scrubbed) Unwrap() error { return e.err }

// ScrubError returns err with every password dsn may hold removed from
// its message (nil for nil).
func ScrubError(dsn string, err error) error {
	if err == nil || dsn == "" {
		return err
	}
	return &scrubbed{msg: ScrubText(dsn, err.Error()), err: err}
}
