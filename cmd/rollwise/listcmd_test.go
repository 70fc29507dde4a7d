package main

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"runtime/debug"
	"strings"
	"testing"
)

// TestListShowsWhatTheModelHolds: `list` through Main, as JSON (every
// field checked on one measure, one table, one link) and as a table.
func TestListShowsWhatTheModelHolds(t *testing.T) {
	t.Parallel()
	model := filepath.Join(t.TempDir(), "m.roll")
	src := "table stores at \"shop.stores\" {\n  key id\n  id integer\n  region text\n}\n" +
		"table sales at \"shop.sales\" {\n  key id\n  id integer\n  store_id integer -> stores.id required\n  qty integer\n}\n" +
		"measure units = sum(sales.qty) format integer \"Pieces sold.\"\n" +
		"view by_region = units by stores.region with totals grand\n"
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	var out, errb bytes.Buffer
	if code := Main([]string{"list", model, "--format", "json"}, nil, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	var got listed
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatalf("%v\n%s", err, out.String())
	}
	if len(got.Measures) != 1 || got.Measures[0] != (listMeasure{Name: "units", Type: "integer", Format: "integer",
		Description: "Pieces sold.", Definition: "sum(sales.qty)", At: model + ":12:9"}) {
		t.Errorf("measures %+v", got.Measures)
	}
	if len(got.Tables) != 2 || got.Tables[1].Name != "sales" || got.Tables[1].Relation != "shop.sales" ||
		strings.Join(got.Tables[1].Key, ",") != "id" || got.Tables[1].Columns != 3 {
		t.Errorf("tables %+v", got.Tables)
	}
	if len(got.Links) != 1 || got.Links[0] != (listLink{From: "sales.store_id", To: "stores.id", Required: true}) {
		t.Errorf("links %+v", got.Links)
	}
	if len(got.Views) != 1 || got.Views[0].Name != "by_region" || got.Views[0].Totals != "grand" ||
		strings.Join(got.Views[0].By, ",") != "stores.region" {
		t.Errorf("views %+v", got.Views)
	}

	out.Reset()
	if code := Main([]string{"list", model, "measures", "links"}, nil, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	want := "measures (1)\nNAME   TYPE     FORMAT   DESCRIPTION\nunits  integer  integer  Pieces sold.\n\n" +
		"links (1)\nFROM            TO         REQUIRED\nsales.store_id  stores.id  yes\n"
	if out.String() != want {
		t.Errorf("got\n%q\nwant\n%q", out.String(), want)
	}
	if code := Main([]string{"list", model, "--format", "csv"}, nil, &out, &errb); code != exitUsage {
		t.Errorf("--format csv exited %d", code)
	}
}

// TestCompletionFromTheModelOnTheLine: the shell asks `__complete`
// (cobra's protocol) and gets the measures, columns and views of the
// model files already on the line; the bash script is valid bash.
func TestCompletionFromTheModelOnTheLine(t *testing.T) {
	t.Parallel()
	complete := func(args ...string) []string {
		var out bytes.Buffer
		Main(append([]string{"__complete"}, args...), nil, &out, &bytes.Buffer{})
		lines := strings.Split(strings.TrimSpace(out.String()), "\n")
		return lines[:len(lines)-1] // the last line is the directive
	}
	if got := strings.Join(complete("run", shopModel, "-m", "revenue,co"), " "); got != "revenue,cost" {
		t.Errorf("-m revenue,co completes to %q", got)
	}
	if got := strings.Join(complete("sql", shopModel, "-b", "stores."), " "); got != "stores.district_id stores.id stores.region" {
		t.Errorf("-b stores. completes to %q", got)
	}
	if got := strings.Join(complete("explain", shopModel, "--cell", "stores.region=North,sales.it"), " "); got != "stores.region=North,sales.item=" {
		t.Errorf("--cell stores.region=North,sales.it completes to %q", got)
	}
	if got := strings.Join(complete("sql", shopModel, "-d", "post"), " "); got != "postgres" {
		t.Errorf("-d post completes to %q", got)
	}
	bash, err := exec.LookPath("bash")
	if err != nil {
		t.Skip("no bash to check the script with")
	}
	var script bytes.Buffer
	if code := Main([]string{"completion", "bash"}, nil, &script, &bytes.Buffer{}); code != 0 || !strings.Contains(script.String(), "__start_rollwise") {
		t.Fatalf("completion bash: exit %d", code)
	}
	cmd := exec.Command(bash, "-n")
	cmd.Stdin = &script
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Errorf("bash -n rejects the script: %v\n%s", err, out)
	}
}

// TestVersionNamesTheCommit: --version prints the module version and the
// commit the build recorded.
func TestVersionNamesTheCommit(t *testing.T) {
	t.Parallel()
	info := &debug.BuildInfo{GoVersion: "go1.26.8", Main: debug.Module{Version: "v0.3.0"},
		Settings: []debug.BuildSetting{{Key: "vcs.revision", Value: "0123456789abcdef0123"}, {Key: "vcs.time", Value: "2026-12-05T17:00:00Z"},
			{Key: "vcs.modified", Value: "true"}}}
	if got, want := describeBuild(info), "v0.3.0 (commit 0123456789ab, 2026-12-05T17:00:00Z, with uncommitted changes, go1.26.8)"; got != want {
		t.Errorf("describeBuild = %q, want %q", got, want)
	}
	var out bytes.Buffer
	if code := Main([]string{"--version"}, nil, &out, &out); code != 0 || !strings.HasPrefix(out.String(), "rollwise ") {
		t.Errorf("--version: exit %d, %q", code, out.String())
	}
}
