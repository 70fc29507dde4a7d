package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
)

// requiredShop declares required links over the tables of testdata/exec:
// sale 6 points at store 9, which does not exist; every repair finds its
// store (1, 3, 3, 4) and every store its district (1, 2, 2, 3).
const requiredShop = `table sales at "shop.sales" {
  key id
  id        integer
  store_id  integer  -> stores.id STORE_REQUIRED
  qty       integer
}
table stores at "shop.stores" {
  key id
  id           integer
  region       text
  district_id  integer -> districts.id required
}
table districts {
  key id
  id    integer
  area  text
}
table repairs at "shop.repairs" {
  key id
  id        integer
  store_id  integer  -> stores.id required
  fee       decimal
}
measure units = sum(sales.qty)
`

// writeRequiredShop writes requiredShop, with the sales link required or
// not, and returns its path.
func writeRequiredShop(t *testing.T, salesRequired bool) string {
	t.Helper()
	req := ""
	if salesRequired {
		req = "required"
	}
	path := filepath.Join(t.TempDir(), "shop.roll")
	if err := os.WriteFile(path, []byte(strings.Replace(requiredShop, "STORE_REQUIRED", req, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func checkCmd(args ...string) (int, string) {
	var out, errb bytes.Buffer
	code := Main(append([]string{"check"}, args...), nil, &out, &errb)
	return code, errb.String()
}

const saleSixMissing = "shop.roll:4:25: error: link sales.store_id -> stores.id is declared required, but 1 row of sales finds no row of stores"

// check --required counts, per link declared required, the rows that find
// nothing, and fails on the links that have some.
func TestCheckRequiredLinks(t *testing.T) {
	t.Parallel()
	broken, kept := writeRequiredShop(t, true), writeRequiredShop(t, false)
	data := filepath.Join("..", "..", "testdata", "exec")
	code, msg := checkCmd(broken, "--data", data)
	if code != exitFindings || !strings.Contains(msg, saleSixMissing) || strings.Count(msg, "error:") != 1 {
		t.Errorf("the broken promise: exit %d\n%s", code, msg)
	}
	code, msg = checkCmd(kept, "--data", data)
	if code != 0 || !strings.Contains(msg, "ok: 4 tables, 1 measure, 0 views; on the data, 2 required links and 4 uniqueness promises hold") {
		t.Errorf("promises kept: exit %d\n%s", code, msg)
	}
	// Without --required (or --data, --dsn), check reads no data.
	code, msg = checkCmd(broken)
	if code != 0 || strings.Contains(msg, "required links") {
		t.Errorf("without the data: exit %d\n%s", code, msg)
	}
	code, msg = checkCmd(shopModel, "--required")
	if code != 0 || !strings.HasSuffix(msg, "; on the data, 0 required links and 4 uniqueness promises hold\n") {
		t.Errorf("no required link: exit %d\n%s", code, msg)
	}
	code, msg = checkCmd(broken, "--data", data, "--dsn", "sqlite:"+filepath.Join(t.TempDir(), "x.db"))
	if code != exitUsage || !strings.Contains(msg, "--data is for the embedded DuckDB") {
		t.Errorf("--data with --dsn: exit %d\n%s", code, msg)
	}
	// On the live engines, which hold the shop's tables.
	for _, name := range livetest.Names {
		t.Run(name, func(t *testing.T) {
			e := liveEngine(t, name, shopModel)
			code, msg := checkCmd(broken, "--dsn", e.DSN)
			if code != exitFindings || !strings.Contains(msg, saleSixMissing) || strings.Count(msg, "error:") != 1 {
				t.Errorf("exit %d\n%s", code, msg)
			}
		})
	}
}
