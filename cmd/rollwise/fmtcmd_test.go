package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const messyModel = "TABLE sales AT \"shop.sales\" { KEY id\nid integer -- the key\n  qty  Integer\n price decimal NONADDITIVE }\n" +
	"measure units=sum(sales.qty) measure revenue = sum( sales.price*sales.qty ) FORMAT number \"paid\"\n"

const tidyModel = `table sales at "shop.sales" {
  key id
  id     integer  -- the key
  qty    Integer
  price  decimal  nonadditive
}

measure units   = sum(sales.qty)
measure revenue = sum(sales.price * sales.qty)  format number "paid"
`

// runMain runs the command line and returns its exit code, stdout and
// stderr.
func runMain(args []string, stdin string) (int, string, string) {
	var out, errOut bytes.Buffer
	code := Main(args, strings.NewReader(stdin), &out, &errOut)
	return code, out.String(), errOut.String()
}

// TestFmt: fmt prints the layout and leaves the file alone; --check
// lists the file and exits 1; -w writes it, after which --check is
// content; standard input formats to stdout.
func TestFmt(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	name := filepath.Join(dir, "shop.roll")
	if err := os.WriteFile(name, []byte(messyModel), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errOut := runMain([]string{"fmt", name}, "")
	if code != 0 || out != tidyModel || errOut != "" {
		t.Errorf("fmt: exit %d, stdout:\n%s\nstderr: %s", code, out, errOut)
	}
	if b, _ := os.ReadFile(name); string(b) != messyModel {
		t.Errorf("fmt without -w changed the file")
	}
	code, out, errOut = runMain([]string{"fmt", "--check", dir}, "")
	if code != 1 || out != name+"\n" || !strings.Contains(errOut, "1 file of 1 not formatted") {
		t.Errorf("fmt --check: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	code, out, errOut = runMain([]string{"fmt", "-w", name}, "")
	if code != 0 || out != "" || errOut != "ok: 1 file, 1 reformatted\n" {
		t.Errorf("fmt -w: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	if b, _ := os.ReadFile(name); string(b) != tidyModel {
		t.Errorf("fmt -w wrote:\n%s", b)
	}
	code, out, errOut = runMain([]string{"fmt", "--check", name}, "")
	if code != 0 || out != "" || errOut != "ok: 1 file, all formatted\n" {
		t.Errorf("fmt --check after -w: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 1 {
		t.Errorf("the folder holds %v; a temporary file was left", entries)
	}
	if code, out, _ = runMain([]string{"fmt", "-"}, messyModel); code != 0 || out != tidyModel {
		t.Errorf("fmt -: exit %d, stdout:\n%s", code, out)
	}
}

// TestFmtParseError: a file that does not parse is an error at its
// file:line:col, and -w writes none of the files, not even those that
// parse.
func TestFmtParseError(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	good := filepath.Join(dir, "a.roll")
	bad := filepath.Join(dir, "b.roll")
	badText := "measure m = sum(sales.qty\nmeasure n = 1\n"
	if err := os.WriteFile(good, []byte(messyModel), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(bad, []byte(badText), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errOut := runMain([]string{"fmt", "-w", dir}, "")
	if code != 1 || out != "" || !strings.Contains(errOut, bad+":1:26: error: syntax error") ||
		!strings.Contains(errOut, "rollwise: 1 error; nothing was formatted") {
		t.Errorf("exit %d, stdout %q, stderr:\n%s", code, out, errOut)
	}
	for name, want := range map[string]string{good: messyModel, bad: badText} {
		if b, _ := os.ReadFile(name); string(b) != want {
			t.Errorf("%s was written:\n%s", name, b)
		}
	}
}

// TestFmtUsage: the usage errors exit 2.
func TestFmtUsage(t *testing.T) {
	t.Parallel()
	empty := t.TempDir()
	for _, args := range [][]string{
		{"fmt"},
		{"fmt", "-w", "--check", "x.roll"},
		{"fmt", "-w", "-"},
		{"fmt", empty},
		{"fmt", filepath.Join(empty, "missing.roll")},
	} {
		if code, _, errOut := runMain(args, ""); code != 2 || !strings.HasPrefix(errOut, "rollwise: ") {
			t.Errorf("%v: exit %d, stderr %q", args, code, errOut)
		}
	}
}

// TestLanguageServerFormatting: the server advertises formatting and
// answers it with one edit over the whole document whose text is what
// `rollwise fmt` prints; a document that does not parse gets no edit.
func TestLanguageServerFormatting(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	name := filepath.Join(dir, "shop.roll")
	text := strings.TrimSuffix(messyModel, "\n") + " -- é\n\nmeasure last = 1" // ends without a line break
	c, caps, done := startLSP(t)
	if caps["documentFormattingProvider"] != true {
		t.Errorf("documentFormattingProvider is %v", caps["documentFormattingProvider"])
	}
	uri := fileURI(name)
	c.notifyAndWait("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "rollwise", "version": 1, "text": text}})
	params := map[string]any{"textDocument": map[string]any{"uri": uri}, "options": map[string]any{"tabSize": 2, "insertSpaces": true}}
	edits := c.call("textDocument/formatting", params).([]any)
	_, want, _ := runMain([]string{"fmt", "-"}, text)
	if len(edits) != 1 {
		t.Fatalf("edits %v", edits)
	}
	e := edits[0].(map[string]any)
	r := e["range"].(map[string]any)
	// The document's last line is line 6 (from 0), "measure last = 1",
	// 16 UTF-16 units long.
	if e["newText"] != want || !strings.Contains(want, "-- é") ||
		fmtPos(r["start"]) != "0:0" || fmtPos(r["end"]) != "6:16" {
		t.Errorf("edit %v\nwant the text:\n%s", e, want)
	}
	c.notifyAndWait("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"text": "measure m = sum(\n"}}})
	if edits := c.call("textDocument/formatting", params).([]any); len(edits) != 0 {
		t.Errorf("a document that does not parse got edits %v", edits)
	}
	c.stop(done)
}

func fmtPos(p any) string {
	m := p.(map[string]any)
	return fmt.Sprintf("%v:%v", m["line"], m["character"])
}
