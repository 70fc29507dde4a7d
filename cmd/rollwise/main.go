// Command rollwise compiles measure definitions (.roll files) into SQL,
// runs them on an embedded DuckDB, and checks models for mistakes.
package main

import "os"

func main() {
	os.Exit(Main(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
