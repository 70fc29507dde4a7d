package tpch

import "strings"

// Column is one column of a TPC-H table as this package writes it.
type Column struct {
	Name string
	// SQLType is the DuckDB type: BIGINT for identifiers, INTEGER for
	// integers, DECIMAL(15,2) for decimals, VARCHAR for fixed and variable
	// text, DATE for dates (TPC-H specification, clauses 1.3.1 and 1.4.1).
	SQLType string
}

// Table is one TPC-H table: its name (also the Parquet file's base name and
// the relation name a loader exposes), its columns in specification order,
// and its primary key.
type Table struct {
	Name    string
	Columns []Column
	Key     []string
}

func cols(spec string) []Column {
	var out []Column
	for _, f := range strings.Split(spec, ", ") { // ", " never occurs inside DECIMAL(15,2)
		name, typ, _ := strings.Cut(strings.TrimSpace(f), " ")
		out = append(out, Column{Name: name, SQLType: typ})
	}
	return out
}

const (
	id  = "BIGINT"
	num = "INTEGER"
	dec = "DECIMAL(15,2)"
	txt = "VARCHAR"
	dt  = "DATE"
)

// Tables lists the eight TPC-H tables in the order Generate writes them.
var Tables = []Table{
	{Name: "region", Key: []string{"r_regionkey"}, Columns: cols(
		"r_regionkey " + id + ", r_name " + txt + ", r_comment " + txt)},
	{Name: "nation", Key: []string{"n_nationkey"}, Columns: cols(
		"n_nationkey " + id + ", n_name " + txt + ", n_regionkey " + id + ", n_comment " + txt)},
	{Name: "supplier", Key: []string{"s_suppkey"}, Columns: cols(
		"s_suppkey " + id + ", s_name " + txt + ", s_address " + txt + ", s_nationkey " + id +
			", s_phone " + txt + ", s_acctbal " + dec + ", s_comment " + txt)},
	{Name: "customer", Key: []string{"c_custkey"}, Columns: cols(
		"c_custkey " + id + ", c_name " + txt + ", c_address " + txt + ", c_nationkey " + id +
			", c_phone " + txt + ", c_acctbal " + dec + ", c_mktsegment " + txt + ", c_comment " + txt)},
	{Name: "part", Key: []string{"p_partkey"}, Columns: cols(
		"p_partkey " + id + ", p_name " + txt + ", p_mfgr " + txt + ", p_brand " + txt + ", p_type " + txt +
			", p_size " + num + ", p_container " + txt + ", p_retailprice " + dec + ", p_comment " + txt)},
	{Name: "partsupp", Key: []string{"ps_partkey", "ps_suppkey"}, Columns: cols(
		"ps_partkey " + id + ", ps_suppkey " + id + ", ps_availqty " + num + ", ps_supplycost " + dec +
			", ps_comment " + txt)},
	{Name: "orders", Key: []string{"o_orderkey"}, Columns: cols(
		"o_orderkey " + id + ", o_custkey " + id + ", o_orderstatus " + txt + ", o_totalprice " + dec +
			", o_orderdate " + dt + ", o_orderpriority " + txt + ", o_clerk " + txt +
			", o_shippriority " + num + ", o_comment " + txt)},
	{Name: "lineitem", Key: []string{"l_orderkey", "l_linenumber"}, Columns: cols(
		"l_orderkey " + id + ", l_partkey " + id + ", l_suppkey " + id + ", l_linenumber " + num +
			", l_quantity " + dec + ", l_extendedprice " + dec + ", l_discount " + dec + ", l_tax " + dec +
			", l_returnflag " + txt + ", l_linestatus " + txt + ", l_shipdate " + dt +
			", l_commitdate " + dt + ", l_receiptdate " + dt + ", l_shipinstruct " + txt +
			", l_shipmode " + txt + ", l_comment " + txt)},
}

// createSQL is the CREATE TABLE statement for t's staging table.
func (t Table) createSQL() string {
	var b strings.Builder
	b.WriteString("CREATE TABLE " + quoteIdent(t.Name) + " (")
	for i, c := range t.Columns {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(quoteIdent(c.Name) + " " + c.SQLType + " NOT NULL")
	}
	// No PRIMARY KEY: the index would slow the appender down, and Parquet
	// keeps no keys; the tests check that keys are unique.
	b.WriteString(")")
	return b.String()
}

func quoteIdent(s string) string { return `"` + strings.ReplaceAll(s, `"`, `""`) + `"` }

func quoteString(s string) string { return "'" + strings.ReplaceAll(s, "'", "''") + "'" }
