package langserver

import (
	"strings"
	"unicode/utf16"
	"unicode/utf8"

	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// workspace is one model: the files of a folder, parsed and resolved.
type workspace struct {
	paths []string
	src   map[string]string
	model *model.Model // what resolves; nil when the files that parse do not resolve
	diags grammar.Diagnostics
}

// workspace reads and checks the model that path belongs to, as `rollwise
// check` would, with the editor's text for the open documents.
func (s *Server) workspace(path string) *workspace {
	w := &workspace{src: map[string]string{}}
	var files []pipeline.Source
	for _, p := range s.modelFiles(path) {
		text, ok := s.text(p)
		if !ok {
			continue
		}
		w.paths = append(w.paths, p)
		w.src[p] = text
		files = append(files, pipeline.Source{Name: p, Text: text})
	}
	// While one file is being typed and does not parse, the model is what
	// resolves in the files that do, for hover and completion.
	w.model, w.diags = pipeline.Resolve(files)
	return w
}

// toDiagnostic turns a rollwise diagnostic into the protocol's, with its
// notes and hint in the message as `rollwise check` prints them.
func toDiagnostic(d *grammar.Diagnostic, src string) protocol.Diagnostic {
	sev := protocol.DiagnosticSeverityError
	if d.Severity == grammar.Warning {
		sev = protocol.DiagnosticSeverityWarning
	}
	msg := d.Message
	for _, n := range d.Notes {
		msg += "\nnote: " + n
	}
	if d.Suggestion != "" {
		msg += "\nhint: " + d.Suggestion
	}
	source := "rollwise"
	code := protocol.IntegerOrString{Value: d.Code}
	start := position(src, d.Pos.Line, d.Pos.Col)
	end := start
	if line := lineText(src, d.Pos.Line); d.Pos.Col >= 1 {
		// Underline the word the diagnostic points at.
		rest := []rune(line)[min(d.Pos.Col-1, utf8.RuneCountInString(line)):]
		n := 0
		for n < len(rest) && (isWordRune(rest[n]) || rest[n] == '`') {
			n++
		}
		end = position(src, d.Pos.Line, d.Pos.Col+max(n, 1))
	}
	return protocol.Diagnostic{Range: protocol.Range{Start: start, End: end}, Severity: &sev, Code: &code, Source: &source, Message: msg}
}

func isWordRune(r rune) bool {
	return r == '_' || r >= '0' && r <= '9' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r > 127
}

func lineText(src string, line int) string {
	lines := strings.Split(src, "\n")
	if line < 1 || line > len(lines) {
		return ""
	}
	return strings.TrimSuffix(lines[line-1], "\r")
}

// position converts a line and a column in characters, counted from 1 as
// rollwise counts them, into the protocol's zero-based line and UTF-16
// offset.
func position(src string, line, col int) protocol.Position {
	if line < 1 {
		return protocol.Position{}
	}
	runes := []rune(lineText(src, line))
	n := min(max(col-1, 0), len(runes))
	return protocol.Position{Line: protocol.UInteger(line - 1), Character: protocol.UInteger(len(utf16.Encode(runes[:n])))}
}

// column converts the protocol's UTF-16 offset on a line into rollwise's
// column in characters, counted from 1.
func column(src string, p protocol.Position) (line, col int) {
	runes := []rune(lineText(src, int(p.Line)+1))
	units := 0
	for i, r := range runes {
		if units >= int(p.Character) {
			return int(p.Line) + 1, i + 1
		}
		units += len(utf16.Encode([]rune{r}))
	}
	return int(p.Line) + 1, len(runes) + 1
}
