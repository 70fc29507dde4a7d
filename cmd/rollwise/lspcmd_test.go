package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"net/url"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// lspClient speaks the Language Server Protocol to `rollwise lsp` over
// pipes, as an editor does: Content-Length framed JSON-RPC messages
// (the protocol's base protocol, specification 3.16).
type lspClient struct {
	t      *testing.T
	w      io.Writer
	r      *bufio.Reader
	id     int
	diags  map[string][]map[string]any // the last diagnostics published per URI
	notify int                         // publishDiagnostics notifications seen
}

func (c *lspClient) send(msg map[string]any) {
	msg["jsonrpc"] = "2.0"
	b, _ := json.Marshal(msg)
	fmt.Fprintf(c.w, "Content-Length: %d\r\n\r\n%s", len(b), b)
}

// read reads one message; notifications of diagnostics are remembered.
func (c *lspClient) read() map[string]any {
	c.t.Helper()
	n := 0
	for {
		line, err := c.r.ReadString('\n')
		if err != nil {
			c.t.Fatalf("reading from the server: %v", err)
		}
		line = strings.TrimSpace(line)
		if line == "" {
			break
		}
		if v, ok := strings.CutPrefix(line, "Content-Length: "); ok {
			n, _ = strconv.Atoi(v)
		}
	}
	body := make([]byte, n)
	if _, err := io.ReadFull(c.r, body); err != nil {
		c.t.Fatal(err)
	}
	var msg map[string]any
	if err := json.Unmarshal(body, &msg); err != nil {
		c.t.Fatalf("bad message %s: %v", body, err)
	}
	if msg["method"] == "textDocument/publishDiagnostics" {
		p := msg["params"].(map[string]any)
		var ds []map[string]any
		for _, d := range p["diagnostics"].([]any) {
			ds = append(ds, d.(map[string]any))
		}
		c.diags[p["uri"].(string)] = ds
		c.notify++
	}
	return msg
}

// call sends a request and returns its result, reading notifications on
// the way.
func (c *lspClient) call(method string, params any) any {
	c.t.Helper()
	c.id++
	c.send(map[string]any{"id": c.id, "method": method, "params": params})
	for {
		msg := c.read()
		if id, ok := msg["id"].(float64); ok && int(id) == c.id {
			if e, bad := msg["error"]; bad {
				c.t.Fatalf("%s: %v", method, e)
			}
			return msg["result"]
		}
	}
}

// notifyAndWait sends a notification that makes the server publish
// diagnostics, and waits for them.
func (c *lspClient) notifyAndWait(method string, params any) {
	before := c.notify
	c.send(map[string]any{"method": method, "params": params})
	for c.notify == before {
		c.read()
	}
}

func pos(line, char int) map[string]any { return map[string]any{"line": line, "character": char} }

// TestLanguageServer drives `rollwise lsp` through Main over pipes: the
// diagnostics are check's (message, position, hint), hover, definition,
// references across the folder's files, completion after a dot, and a
// clean exit.
func TestLanguageServer(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	model := filepath.Join(dir, "model.roll")
	other := filepath.Join(dir, "other.roll")
	good := "table sales at \"s\" {\n  key id\n  id integer\n  store_id integer -> stores.id\n  price decimal nonadditive\n  qty integer\n}\n" +
		"table stores at \"st\" {\n  key id\n  id integer\n  region text\n}\n" +
		"measure revenue = sum(sales.price * sales.qty) \"What customers paid.\"\n" +
		"measure twice = revenue + revenue\n"
	bad := strings.Replace(good, "sum(sales.price * sales.qty)", "sum(sales.price * sales.qtty)", 1)
	if err := os.WriteFile(other, []byte("measure units = sum(sales.qty)\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(model, []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	// What `rollwise check` says of the bad text, for comparison.
	var checkOut bytes.Buffer
	Main([]string{"check", model, other}, nil, &checkOut, &checkOut)

	c, caps, done := startLSP(t)
	uri := fileURI(model)
	doc := map[string]any{"uri": uri}
	for _, k := range []string{"hoverProvider", "definitionProvider", "referencesProvider", "completionProvider"} {
		if caps[k] == nil || caps[k] == false {
			t.Errorf("capability %s missing: %v", k, caps)
		}
	}

	// Diagnostics as typed: the unknown column, where check puts it.
	c.notifyAndWait("textDocument/didOpen", map[string]any{"textDocument": map[string]any{"uri": uri, "languageId": "rollwise", "version": 1, "text": bad}})
	ds := c.diags[uri]
	if len(ds) != 1 {
		t.Fatalf("diagnostics %v", ds)
	}
	msg := ds[0]["message"].(string)
	first := strings.SplitN(msg, "\n", 2)[0]
	// model.roll:13:43 in check's words is line 12, character 42 here.
	want := model + ":13:43: error: " + first
	if !strings.Contains(checkOut.String(), want) || !strings.Contains(msg, "did you mean 'qty'") {
		t.Errorf("diagnostic %q; check printed:\n%s", msg, checkOut.String())
	}
	if r := ds[0]["range"].(map[string]any); fmt.Sprint(r["start"]) != fmt.Sprint(map[string]any{"line": 12.0, "character": 42.0}) ||
		fmt.Sprint(r["end"]) != fmt.Sprint(map[string]any{"line": 12.0, "character": 46.0}) {
		t.Errorf("range %v, want line 12 characters 42 to 46 (qtty)", r)
	}

	// Fixed in the editor: the diagnostics clear.
	c.notifyAndWait("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 2},
		"contentChanges": []any{map[string]any{"text": good}}})
	if len(c.diags[uri]) != 0 {
		t.Errorf("diagnostics after the fix: %v", c.diags[uri])
	}

	// Hover on revenue in `twice` (line 13, character 16).
	hover := c.call("textDocument/hover", map[string]any{"textDocument": doc, "position": pos(13, 16)}).(map[string]any)
	text := hover["contents"].(map[string]any)["value"].(string)
	for _, w := range []string{"measure revenue = sum((sales.price * sales.qty))", "type decimal", "What customers paid.", "iterates over: sales", "additive: its subtotals"} {
		if !strings.Contains(text, w) {
			t.Errorf("hover lacks %q:\n%s", w, text)
		}
	}

	// Definition: revenue is declared at line 12, character 8.
	def := c.call("textDocument/definition", map[string]any{"textDocument": doc, "position": pos(13, 16)}).(map[string]any)
	if def["uri"] != uri || fmt.Sprint(def["range"].(map[string]any)["start"]) != fmt.Sprint(map[string]any{"line": 12.0, "character": 8.0}) {
		t.Errorf("definition %v", def)
	}

	// References of sales.qty from its declaration (line 5, character 2):
	// the declaration, the use in revenue, the use in other.roll.
	refs := c.call("textDocument/references", map[string]any{"textDocument": doc, "position": pos(5, 3), "context": map[string]any{"includeDeclaration": true}}).([]any)
	var got []string
	for _, r := range refs {
		l := r.(map[string]any)
		s := l["range"].(map[string]any)["start"].(map[string]any)
		got = append(got, fmt.Sprintf("%s:%v:%v", filepath.Base(l["uri"].(string)), s["line"], s["character"]))
	}
	if strings.Join(got, " ") != "model.roll:5:2 model.roll:12:42 other.roll:0:26" {
		t.Errorf("references %v", got)
	}

	// Completion after "sales." lists the table's columns.
	c.notifyAndWait("textDocument/didChange", map[string]any{"textDocument": map[string]any{"uri": uri, "version": 3},
		"contentChanges": []any{map[string]any{"text": good + "measure n = count(sales.)\n"}}})
	items := c.call("textDocument/completion", map[string]any{"textDocument": doc, "position": pos(14, 24)}).([]any)
	var labels []string
	for _, it := range items {
		labels = append(labels, it.(map[string]any)["label"].(string))
	}
	if strings.Join(labels, ",") != "id,store_id,price,qty" {
		t.Errorf("completion after sales.: %v", labels)
	}

	c.stop(done)
}

// startLSP starts `rollwise lsp` through Main on pipes and initializes
// it; it returns the client, the server's capabilities and the channel
// that gets Main's exit code.
func startLSP(t *testing.T) (*lspClient, map[string]any, chan int) {
	inR, inW := io.Pipe()
	outR, outW := io.Pipe()
	done := make(chan int, 1)
	go func() {
		done <- Main([]string{"lsp"}, inR, outW, io.Discard)
		outW.Close()
	}()
	c := &lspClient{t: t, w: inW, r: bufio.NewReader(outR), diags: map[string][]map[string]any{}}
	caps := c.call("initialize", map[string]any{"processId": nil, "rootUri": nil, "capabilities": map[string]any{}}).(map[string]any)["capabilities"].(map[string]any)
	c.send(map[string]any{"method": "initialized", "params": map[string]any{}})
	return c, caps, done
}

// stop shuts the server down and checks that it exits cleanly.
func (c *lspClient) stop(done chan int) {
	c.t.Helper()
	c.call("shutdown", nil)
	c.send(map[string]any{"method": "exit"})
	select {
	case code := <-done:
		if code != 0 {
			c.t.Errorf("lsp exited %d", code)
		}
	case <-time.After(10 * time.Second):
		c.t.Fatal("lsp did not exit after exit")
	}
}

func fileURI(path string) string {
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(path)}).String()
}
