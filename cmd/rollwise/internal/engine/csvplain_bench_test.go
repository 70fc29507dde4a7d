package engine

import (
	"context"
	"fmt"
	"os"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/model"
)

// BenchmarkOpenSmallCSV opens DuckDB on a 30-row CSV file of every column
// type, plainly spelled (csvPlain lets the load leave the SQL checks out)
// and with one float written 1.5e3 (the checked load), to show what
// csvPlain saves on the small files the tests load by the thousand.
func BenchmarkOpenSmallCSV(b *testing.B) {
	for _, odd := range []string{"", "1.5e3"} {
		name := "plain"
		if odd != "" {
			name = "checked"
		}
		b.Run(name, func(b *testing.B) {
			var sb strings.Builder
			sb.WriteString("i,d,f,ts,dt,s,bo\n")
			for r := range 30 {
				f := fmt.Sprintf("%d.5", r)
				if r == 7 && odd != "" {
					f = odd
				}
				fmt.Fprintf(&sb, "%d,%d.25,%s,2024-01-%02d 10:00:00,2024-02-%02d,x%d,true\n", r, r, f, r%28+1, r%28+1, r)
			}
			dir := b.TempDir()
			writeFileB(b, dir+"/t.csv", sb.String())
			m := newModel(table("t", nil, dir+"/t.csv", col("i", model.TypeInteger), col("d", model.TypeDecimal),
				col("f", model.TypeFloat), col("ts", model.TypeTimestamp), col("dt", model.TypeDate),
				col("s", model.TypeText), col("bo", model.TypeBoolean)))
			b.ResetTimer()
			for range b.N {
				db, err := OpenDuckDB(context.Background(), m, "", Options{})
				if err != nil {
					b.Fatal(err)
				}
				db.Close()
			}
			b.ReportMetric(float64(b.Elapsed().Microseconds())/1000/float64(b.N), "ms/op")
		})
	}
}

func writeFileB(b *testing.B, path, content string) {
	b.Helper()
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		b.Fatal(err)
	}
}
