package tpch

import (
	"context"
	"database/sql/driver"
	"fmt"
	"math/big"
	"time"

	"github.com/duckdb/duckdb-go/v2"
	"github.com/pingcap/go-tpc/tpch/dbgen"
)

// sink appends the rows of one table to a DuckDB staging table. It keeps
// the first error itself, because dbgen.DbGen flattens the errors its
// loaders return into text.
type sink struct {
	ctx   context.Context
	app   *duckdb.Appender
	rows  int64
	err   error
	dates map[string]time.Time
}

func (s *sink) add(vals ...driver.Value) error {
	if s.err != nil {
		return s.err
	}
	if s.rows%4096 == 0 {
		if err := s.ctx.Err(); err != nil {
			s.err = err
			return err
		}
	}
	if err := s.app.AppendRow(vals...); err != nil {
		s.err = err
		return err
	}
	s.rows++
	return nil
}

// date turns dbgen's "YYYY-MM-DD" text into a time.Time at UTC midnight
// (dbgen makes 2557 distinct dates, so they are cached).
func (s *sink) date(text string) time.Time {
	if d, ok := s.dates[text]; ok {
		return d
	}
	d, err := time.Parse(time.DateOnly, text)
	if err != nil && s.err == nil {
		s.err = fmt.Errorf("tpch: generator made a bad date %q: %w", text, err)
	}
	s.dates[text] = d
	return d
}

// money turns an amount in cents into a DECIMAL(15,2) value.
func money(cents int64) driver.Value {
	return duckdb.Decimal{Width: 15, Scale: 2, Value: big.NewInt(cents)}
}

// loader adapts a sink and a row function to dbgen.Loader.
type loader struct {
	s   *sink
	row func(s *sink, item any) error
}

// Load appends the rows of one generated item.
func (l loader) Load(item any) error {
	if err := l.row(l.s, item); err != nil {
		return err
	}
	return l.s.err
}

// Flush does nothing: Generate closes the appenders itself, because the
// port's combined orders/lineitem loader drops the error of the first
// Flush (order_line.go).
func (l loader) Flush() error { return nil }

// wrongItem reports an item of an unexpected type.
func wrongItem(s *sink, table string, item any) error {
	s.err = fmt.Errorf("tpch: %s loader got a %T", table, item)
	return s.err
}

// rowFuncs turns each generated item into rows of its table. Column order
// follows Tables.
var rowFuncs = map[string]func(s *sink, item any) error{
	"region": func(s *sink, item any) error {
		r, ok := item.(*dbgen.Region)
		if !ok {
			return wrongItem(s, "region", item)
		}
		return s.add(int64(r.Code), r.Text, r.Comment)
	},
	"nation": func(s *sink, item any) error {
		n, ok := item.(*dbgen.Nation)
		if !ok {
			return wrongItem(s, "nation", item)
		}
		return s.add(int64(n.Code), n.Text, int64(n.Join), n.Comment)
	},
	"supplier": func(s *sink, item any) error {
		x, ok := item.(*dbgen.Supp)
		if !ok {
			return wrongItem(s, "supplier", item)
		}
		return s.add(int64(x.SuppKey), x.Name, x.Address, int64(x.NationCode), x.Phone,
			money(int64(x.Acctbal)), x.Comment)
	},
	"customer": func(s *sink, item any) error {
		c, ok := item.(*dbgen.Cust)
		if !ok {
			return wrongItem(s, "customer", item)
		}
		return s.add(int64(c.CustKey), c.Name, c.Address, int64(c.NationCode), c.Phone,
			money(int64(c.Acctbal)), c.MktSegment, c.Comment)
	},
	"part": func(s *sink, item any) error {
		p, ok := item.(*dbgen.Part)
		if !ok {
			return wrongItem(s, "part", item)
		}
		return s.add(int64(p.PartKey), p.Name, p.Mfgr, p.Brand, p.Type, int32(p.Size), p.Container,
			money(int64(p.RetailPrice)), p.Comment)
	},
	"partsupp": func(s *sink, item any) error {
		p, ok := item.(*dbgen.Part)
		if !ok {
			return wrongItem(s, "partsupp", item)
		}
		for _, ps := range p.S {
			if err := s.add(int64(ps.PartKey), int64(ps.SuppKey), int32(ps.Qty),
				money(int64(ps.SCost)), ps.Comment); err != nil {
				return err
			}
		}
		return nil
	},
	"orders": func(s *sink, item any) error {
		o, ok := item.(*dbgen.Order)
		if !ok {
			return wrongItem(s, "orders", item)
		}
		return s.add(int64(o.OKey), int64(o.CustKey), string(rune(o.Status)), money(int64(o.TotalPrice)),
			s.date(o.Date), o.OrderPriority, o.Clerk, int32(o.ShipPriority), o.Comment)
	},
	"lineitem": func(s *sink, item any) error {
		o, ok := item.(*dbgen.Order)
		if !ok {
			return wrongItem(s, "lineitem", item)
		}
		for _, l := range o.Lines {
			// dbgen keeps quantity as a whole number and discount and tax
			// in hundredths; the spec's columns are decimals.
			if err := s.add(int64(l.OKey), int64(l.PartKey), int64(l.SuppKey), int32(l.LCnt),
				money(int64(l.Quantity)*100), money(int64(l.EPrice)), money(int64(l.Discount)), money(int64(l.Tax)),
				string(rune(l.RFlag)), string(rune(l.LStatus)),
				s.date(l.SDate), s.date(l.CDate), s.date(l.RDate),
				l.ShipInstruct, l.ShipMode, l.Comment); err != nil {
				return err
			}
		}
		return nil
	},
}

// genStep is one call of dbgen.DbGen: the dbgen table it generates and the
// TPC-H tables (with their dbgen loader slots) that receive the rows.
type genStep struct {
	gen    dbgen.Table
	tables []string
	slots  []dbgen.Table
}

// genSteps generate all eight tables; orders and lineitem come from one
// pass, as do part and partsupp.
var genSteps = []genStep{
	{dbgen.TRegion, []string{"region"}, []dbgen.Table{dbgen.TRegion}},
	{dbgen.TNation, []string{"nation"}, []dbgen.Table{dbgen.TNation}},
	{dbgen.TSupp, []string{"supplier"}, []dbgen.Table{dbgen.TSupp}},
	{dbgen.TCust, []string{"customer"}, []dbgen.Table{dbgen.TCust}},
	{dbgen.TPartPsupp, []string{"part", "partsupp"}, []dbgen.Table{dbgen.TPart, dbgen.TPsupp}},
	{dbgen.TOrderLine, []string{"orders", "lineitem"}, []dbgen.Table{dbgen.TOrder, dbgen.TLine}},
}
