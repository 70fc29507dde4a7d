package main

import (
	"bytes"
	"html"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// mainRun runs the command line and returns its exit code, stdout and
// stderr.
func mainRun(args ...string) (int, string, string) {
	var out, errb bytes.Buffer
	code := Main(args, strings.NewReader(""), &out, &errb)
	return code, out.String(), errb.String()
}

// readTree reads every file of a folder, by name.
func readTree(t *testing.T, dir string) map[string]string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	files := map[string]string{}
	for _, e := range entries {
		b, err := os.ReadFile(filepath.Join(dir, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		files[e.Name()] = string(b)
	}
	return files
}

// writeCatalog runs `rollwise docs` into a fresh folder and returns it.
func writeCatalog(t *testing.T, models ...string) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "catalog")
	code, _, stderr := mainRun(append(append([]string{"docs"}, models...), "--out", dir)...)
	if code != exitOK {
		t.Fatalf("docs: exit %d\n%s", code, stderr)
	}
	return dir
}

// catalogModels are the shop's model files that load together (other
// files of testdata/exec are models of their own).
var catalogModels = []string{"../../testdata/exec/shop.roll", "../../testdata/exec/edits.roll",
	"../../testdata/exec/narrowed.roll", "../../testdata/exec/pergrain.roll"}

var hrefRE = regexp.MustCompile(`(?:href|src)="([^"]*)"`)

func TestDocsCatalogOfTheShop(t *testing.T) {
	t.Parallel()
	dir := writeCatalog(t, catalogModels...)
	files := readTree(t, dir)
	for _, want := range []string{"index.html", "style.css", "catalog.json", "measure-takings.html", "measure-revenue.html", "table-sales.html"} {
		if _, ok := files[want]; !ok {
			t.Errorf("the catalog lacks %s", want)
		}
	}
	// testdata/exec/shop.roll:53: measure takings = coalesce(revenue, 0) + coalesce(fees, 0)
	takings := files["measure-takings.html"]
	if !strings.Contains(html.UnescapeString(takings), "measure takings      = coalesce(revenue, 0) + coalesce(fees, 0)") {
		t.Error("takings page lacks its definition as written")
	}
	for _, want := range []string{`<a href="measure-revenue.html">revenue</a>`, `<a href="measure-fees.html">fees</a>`} {
		if !strings.Contains(takings, want) {
			t.Errorf("takings page lacks %q", want)
		}
	}
	// The graph of takings: itself, revenue and fees, and the tables they
	// read (sales, repairs): 5 boxes and 4 arrows.
	if n := strings.Count(takings, `<g class="node `); n != 5 {
		t.Errorf("takings graph has %d boxes, want 5", n)
	}
	if n := strings.Count(takings, `<g class="edge">`); n != 4 {
		t.Errorf("takings graph has %d arrows, want 4", n)
	}
	// revenue is built on by takings and read from sales.price, sales.qty.
	revenue := files["measure-revenue.html"]
	for _, want := range []string{`<a href="measure-takings.html">takings</a>`, `<a href="table-sales.html#col-price">sales.price</a>`, `<a href="table-sales.html#col-qty">sales.qty</a>`} {
		if !strings.Contains(revenue, want) {
			t.Errorf("revenue page lacks %q", want)
		}
	}
	// sales links to stores: the table page says so; the index lists and
	// draws every table of testdata/exec (each with a row and a box).
	if !strings.Contains(files["table-sales.html"], "<code>sales.store_id -&gt; stores.id</code> to <a href=\"table-stores.html\">stores</a>") {
		t.Error("the sales page does not list its link to stores")
	}
	index := files["index.html"]
	listed := strings.Count(index, `<tr><td><a href="table-`)
	if n := strings.Count(index, `<g class="node table">`); n != listed || listed < 6 {
		t.Errorf("the index lists %d tables and draws %d", listed, n)
	}
	// No page needs the network or a script, and every link leads to a
	// page of the catalog.
	for name, text := range files {
		if !strings.HasSuffix(name, ".html") {
			continue
		}
		if strings.Contains(text, "<script") || strings.Contains(text, "http://") && !strings.Contains(text, `xmlns="http://www.w3.org/2000/svg"`) {
			t.Errorf("%s holds a script or a remote address", name)
		}
		for _, m := range hrefRE.FindAllStringSubmatch(text, -1) {
			target, _, _ := strings.Cut(m[1], "#")
			if _, ok := files[target]; !ok {
				t.Errorf("%s links to %q, which the catalog lacks", name, m[1])
			}
		}
	}
}

func TestDocsIsDeterministicAndReplacesItsOwnFolder(t *testing.T) {
	t.Parallel()
	a := readTree(t, writeCatalog(t, catalogModels...))
	dir := writeCatalog(t, catalogModels...)
	b := readTree(t, dir)
	if len(a) != len(b) {
		t.Fatalf("two runs wrote %d and %d files", len(a), len(b))
	}
	for name, text := range a {
		if b[name] != text {
			t.Errorf("%s differs between two runs", name)
		}
	}
	// A second run on the same folder, with a smaller model, replaces the
	// catalog whole: pages of measures gone are gone, nothing is left beside.
	code, _, stderr := mainRun("docs", "../../testdata/exec/shop.roll", "--out", dir)
	if code != exitOK {
		t.Fatalf("docs again: exit %d\n%s", code, stderr)
	}
	c := readTree(t, dir)
	if _, ok := c["measure-item_share.html"]; ok { // declared in edits.roll
		t.Error("a measure no longer in the model kept its page")
	}
	if _, ok := c["measure-takings.html"]; !ok {
		t.Error("the new catalog lacks takings")
	}
	beside, _ := os.ReadDir(filepath.Dir(dir))
	if len(beside) != 1 {
		t.Errorf("the folder beside the catalog holds %d entries, want only the catalog", len(beside))
	}
}

func TestDocsRefusesAFolderItDidNotWrite(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	notes := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(notes, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := mainRun("docs", "../../testdata/exec/shop.roll", "--out", dir)
	if code != exitFindings || !strings.Contains(stderr, "notes.txt") || !strings.Contains(stderr, "rollwise docs did not write") {
		t.Fatalf("exit %d, stderr:\n%s", code, stderr)
	}
	if b, err := os.ReadFile(notes); err != nil || string(b) != "mine" {
		t.Errorf("the foreign file was touched: %q %v", b, err)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 1 {
		t.Errorf("the refused folder holds %d entries, want 1", len(entries))
	}
}

func TestDocsUsageAndModelErrors(t *testing.T) {
	t.Parallel()
	if code, _, stderr := mainRun("docs", "../../testdata/exec/shop.roll"); code != exitUsage || !strings.Contains(stderr, "--out DIR") {
		t.Errorf("no --out: exit %d\n%s", code, stderr)
	}
	if code, _, _ := mainRun("docs", "--out", t.TempDir()); code != exitUsage {
		t.Errorf("no model: exit %d", code)
	}
	bad := filepath.Join(t.TempDir(), "bad.roll")
	os.WriteFile(bad, []byte("measure p = sum(nothing.here)\n"), 0o644)
	out := filepath.Join(t.TempDir(), "cat")
	if code, _, stderr := mainRun("docs", bad, "--out", out); code != exitFindings || !strings.Contains(stderr, "bad.roll:1:") {
		t.Errorf("model error: exit %d\n%s", code, stderr)
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Error("a model with errors still wrote a catalog")
	}
}

// hostileCatalogModel has names and a description that would be markup if a
// page let them through.
const hostileCatalogModel = "table `<b>t</b>` from \"t.csv\" {\n" +
	"  key id\n  id integer\n  `x\"><img src=1 onerror=alert(1)>` decimal\n}\n" +
	"measure `<script>alert(1)</script>` = sum(`<b>t</b>`.`x\"><img src=1 onerror=alert(1)>`) \"<script>alert('doc')</script> & more\"\n" +
	"measure twice = `<script>alert(1)</script>` * 2\n"

func TestDocsEscapesHostileNames(t *testing.T) {
	t.Parallel()
	model := filepath.Join(t.TempDir(), "hostile.roll")
	if err := os.WriteFile(model, []byte(hostileCatalogModel), 0o644); err != nil {
		t.Fatal(err)
	}
	files := readTree(t, writeCatalog(t, model))
	page := "measure--3cscript-3ealert-281-29-3c-2fscript-3e.html"
	if _, ok := files[page]; !ok {
		t.Fatalf("no page %s among %d files", page, len(files))
	}
	for name, text := range files {
		for _, bad := range []string{"<script", "<img", "<b>"} {
			if strings.Contains(text, bad) {
				t.Errorf("%s holds %q unescaped", name, bad)
			}
		}
	}
	for _, want := range []string{"&lt;script&gt;alert(&#39;doc&#39;)&lt;/script&gt; &amp; more", "measure &lt;script&gt;alert(1)&lt;/script&gt;"} {
		if !strings.Contains(files[page], want) {
			t.Errorf("%s lacks %q", page, want)
		}
	}
}
