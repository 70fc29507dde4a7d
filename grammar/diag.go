package grammar

import (
	"fmt"
	"io"
	"sort"
	"strings"
)

// Pos is a place in a source file. Line and Col are 1-based; Col counts
// bytes. The zero Pos means "no position".
type Pos struct {
	File   string
	Offset int
	Line   int
	Col    int
}

// IsValid reports whether p names a real place.
func (p Pos) IsValid() bool { return p.Line > 0 }

// String renders p as file:line:col (or as much of it as is known).
func (p Pos) String() string {
	switch {
	case !p.IsValid() && p.File == "":
		return "-"
	case !p.IsValid():
		return p.File
	case p.File == "":
		return fmt.Sprintf("%d:%d", p.Line, p.Col)
	}
	return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col)
}

// Severity says whether a diagnostic stops the run.
type Severity int

const (
	// Error diagnostics stop the run.
	Error Severity = iota
	// Warning diagnostics are printed but do not stop the run.
	Warning
)

func (s Severity) String() string {
	if s == Warning {
		return "warning"
	}
	return "error"
}

// Diagnostic is one message about a place in a model or a query.
type Diagnostic struct {
	Pos      Pos
	Severity Severity
	// Code is a stable identifier (for example "unknown-column") that tests
	// and tools can match on.
	Code    string
	Message string
	// Notes add context on lines of their own ("the cycle: a -> b -> a").
	Notes []string
	// Suggestion says what to write instead, when there is something to say.
	Suggestion string
	// More is set only on the last diagnostic of a list that reached
	// MaxKept (code "too-many"): how many more were found and not kept.
	// Print and Error count them; Print does not print this one.
	More int
}

func (d *Diagnostic) Error() string {
	return fmt.Sprintf("%s: %s: %s", d.Pos, d.Severity, d.Message)
}

// Diagnostics is a list of diagnostics, used as an error value in the manner
// of go/scanner.ErrorList.
type Diagnostics []*Diagnostic

// MaxKept is the most diagnostics a list keeps (ten times what Print
// shows, so that after sorting and removing repeats there are still
// enough to show): past it, a last diagnostic (code "too-many") only
// counts the others in its More, so that a model with millions of errors
// costs no more memory, and no more formatting, than one with MaxKept.
const MaxKept = 10 * MaxPrinted

// Add appends a diagnostic, or counts it once the list holds MaxKept.
func (l *Diagnostics) Add(d *Diagnostic) {
	if !l.count(d.Pos, d.Severity) {
		*l = append(*l, d)
	}
}

// count counts a diagnostic of severity sev at pos in the list's last
// entry, if the list is full, and says whether it did.
func (l *Diagnostics) count(pos Pos, sev Severity) bool {
	if len(*l) < MaxKept {
		return false
	}
	if len(*l) == MaxKept {
		*l = append(*l, &Diagnostic{Pos: pos, Severity: Warning, Code: "too-many",
			Message: fmt.Sprintf("more than %d diagnostics; the rest are counted, not kept", MaxKept)})
	}
	last := (*l)[len(*l)-1]
	last.More++
	if sev == Error {
		last.Severity = Error
	}
	return true
}

// Errorf appends an error with a code at pos.
func (l *Diagnostics) Errorf(pos Pos, code, format string, args ...any) *Diagnostic {
	return l.newf(pos, Error, code, format, args)
}

// Warnf appends a warning with a code at pos.
func (l *Diagnostics) Warnf(pos Pos, code, format string, args ...any) *Diagnostic {
	return l.newf(pos, Warning, code, format, args)
}

// newf appends a diagnostic, or, once the list is full, counts it and
// returns one that is not kept, without formatting its message.
func (l *Diagnostics) newf(pos Pos, sev Severity, code, format string, args []any) *Diagnostic {
	if l.count(pos, sev) {
		return &Diagnostic{Pos: pos, Severity: sev, Code: code}
	}
	d := &Diagnostic{Pos: pos, Severity: sev, Code: code, Message: fmt.Sprintf(format, args...)}
	*l = append(*l, d)
	return d
}

// Append adds every diagnostic of other (the counted ones too).
func (l *Diagnostics) Append(other Diagnostics) {
	for _, d := range other {
		if d.More == 0 {
			l.Add(d)
			continue
		}
		for range d.More {
			l.count(d.Pos, d.Severity)
		}
	}
}

// NotKept is how many diagnostics were counted and not kept.
func (l Diagnostics) NotKept() int {
	n := 0
	for _, d := range l {
		n += d.More
	}
	return n
}

// Sort orders the list by file, line and column, keeping the order of
// diagnostics at the same place.
func (l Diagnostics) Sort() {
	sort.SliceStable(l, func(i, j int) bool {
		a, b := l[i].Pos, l[j].Pos
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
}

// HasErrors reports whether any diagnostic is an error (not a warning).
func (l Diagnostics) HasErrors() bool {
	for _, d := range l {
		if d.Severity == Error {
			return true
		}
	}
	return false
}

// Errors returns only the errors.
func (l Diagnostics) Errors() Diagnostics {
	var out Diagnostics
	for _, d := range l {
		if d.Severity == Error {
			out = append(out, d)
		}
	}
	return out
}

// Err returns nil when the list holds no error, and the list otherwise.
func (l Diagnostics) Err() error {
	if !l.HasErrors() {
		return nil
	}
	return l.Errors()
}

// Error renders the first error and how many more there are.
func (l Diagnostics) Error() string {
	more := l.NotKept()
	if more > 0 {
		more-- // the entry that counts them
	}
	switch len(l) + more {
	case 0:
		return "no errors"
	case 1:
		return l[0].Error()
	}
	return fmt.Sprintf("%s (and %d more errors)", l[0].Error(), len(l)+more-1)
}

// Sources maps a file name to its text, so that messages can quote the line
// they point at.
type Sources map[string]string

// Print writes each diagnostic as
//
//	FILE:LINE:COL: error: MESSAGE
//	   12 | measure m = sum(sales.qtty)
//	      |                       ^
//	  note: ...
//	  hint: ...
//
// The source line is shown when src holds the file.
func (l Diagnostics) Print(w io.Writer, src Sources, color bool) {
	seen := map[string]bool{}
	shown, omitted := 0, 0
	for _, d := range l {
		if d.More > 0 {
			omitted += d.More
			continue
		}
		if key := d.Error(); seen[key] {
			continue // the same message at the same place, found twice
		} else {
			seen[key] = true
		}
		if shown == MaxPrinted {
			omitted++
			continue
		}
		shown++
		d.print(w, src, color)
	}
	if omitted > 0 {
		fmt.Fprintf(w, "... and %d more (only the first %d are shown; fix these and check again)\n", omitted, MaxPrinted)
	}
}

// MaxPrinted is the most diagnostics Print writes; the rest are counted.
const MaxPrinted = 100

// print writes one diagnostic, as Print describes.
func (d *Diagnostic) print(w io.Writer, src Sources, color bool) {
	sev := d.Severity.String()
	if color {
		if d.Severity == Error {
			sev = "\x1b[1;31m" + sev + "\x1b[0m"
		} else {
			sev = "\x1b[1;33m" + sev + "\x1b[0m"
		}
	}
	fmt.Fprintf(w, "%s: %s: %s\n", d.Pos, sev, d.Message)
	if line, ok := sourceLine(src, d.Pos); ok {
		num := fmt.Sprintf("%5d", d.Pos.Line)
		fmt.Fprintf(w, "%s | %s\n", num, strings.ReplaceAll(line, "\t", " "))
		col := d.Pos.Col - 1
		if col > len(line) {
			col = len(line)
		}
		fmt.Fprintf(w, "%s | %s^\n", strings.Repeat(" ", len(num)), strings.Repeat(" ", col))
	}
	for _, n := range d.Notes {
		fmt.Fprintf(w, "  note: %s\n", n)
	}
	if d.Suggestion != "" {
		fmt.Fprintf(w, "  hint: %s\n", d.Suggestion)
	}
}

// maxShownLine is the longest source line a diagnostic quotes.
const maxShownLine = 200

// sourceLine is the line p points into, if src holds it and it is short
// enough to quote. It looks at no more than maxShownLine bytes on either
// side of p, so that a file of one long line costs each diagnostic no
// more than a short one.
func sourceLine(src Sources, p Pos) (string, bool) {
	if !p.IsValid() || src == nil {
		return "", false
	}
	text, ok := src[p.File]
	if !ok || p.Offset > len(text) {
		return "", false
	}
	from := max(0, p.Offset-maxShownLine-1)
	start := strings.LastIndexByte(text[from:p.Offset], '\n') + 1 + from
	if start == from && from > 0 {
		return "", false // no line start within reach: the line is too long
	}
	rest := text[start:min(len(text), start+maxShownLine+2)]
	end := strings.IndexByte(rest, '\n')
	if end < 0 {
		end = len(rest)
	}
	line := strings.TrimRight(rest[:end], "\r")
	if len(line) > maxShownLine {
		return "", false
	}
	return line, true
}

// Closest returns the candidate nearest to name by edit distance (ignoring
// case), if it is close enough to be a plausible typo, and "" otherwise.
// Names longer than maxCompared bytes are not compared: no one mistypes
// a name that long in a way a suggestion would fix, and the distance
// takes time in the product of the lengths. Within that, the distance is
// computed only up to the limit that makes a typo plausible.
func Closest(name string, candidates []string) string {
	if len(name) > maxCompared {
		return ""
	}
	limit := 1
	if len(name) > 3 {
		limit = max(2, len(name)/3)
	}
	lower := strings.ToLower(name)
	best, bestD := "", limit+1
	for _, c := range candidates {
		if len(c) > maxCompared || abs(len(c)-len(name)) > limit {
			continue
		}
		d := editDistance(lower, strings.ToLower(c), bestD)
		if d < bestD || (d == bestD && best != "" && c < best) {
			best, bestD = c, d
		}
	}
	if bestD > limit {
		return ""
	}
	return best
}

// maxCompared is the longest name Closest compares.
const maxCompared = 128

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// editDistance is the Levenshtein distance of a and b when it is at most
// bound, and a number above bound otherwise (it stops as soon as every
// cell of a row exceeds bound).
func editDistance(a, b string, bound int) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		rowMin := cur[0]
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			rowMin = min(rowMin, cur[j])
		}
		if rowMin > bound {
			return bound + 1
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
