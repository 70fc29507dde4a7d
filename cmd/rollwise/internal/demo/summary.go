package demo

// Summary gives counts and exact totals of the generated data, computed in
// memory, so that tests can compare query results with what the files hold.
// Money is in cents and hours in hundredths, to stay exact.
type Summary struct {
	// Row counts per table.
	SalesLines, Receipts, Plants, Stores, Districts, CalendarDays, Repairs int
	// RevenueCents is sum(unit_price * qty) in cents; CostCents likewise
	// for unit_cost.
	RevenueCents, CostCents int64
	// Units is sum(qty).
	Units int64
	// UnmatchedSalesLines is the number of sales lines whose plant_id
	// matches no plant; UnmatchedRevenueCents is their revenue.
	UnmatchedSalesLines   int
	UnmatchedRevenueCents int64
	// NoFamilySalesLines is the number of sales lines on a plant whose
	// family is NULL (not counting unmatched lines).
	NoFamilySalesLines int
	// NoRegionSalesLines is the number of sales lines of stores in the
	// district without a region.
	NoRegionSalesLines int
	// RepairFeeCents is sum(fee) in cents; RepairHoursHundredths is
	// sum(hours) in hundredths of an hour.
	RepairFeeCents        int64
	RepairHoursHundredths int64
	// RepairsWithoutHours is the number of repair jobs with hours NULL.
	RepairsWithoutHours int
	// FirstSale and LastSale are the first and last sold_on (yyyy-mm-dd).
	FirstSale, LastSale string
}

// Summarize generates the data WriteData would write for salesLines sales
// lines and returns its counts and totals, without writing any file.
func Summarize(salesLines int) (Summary, error) {
	d, err := generate(salesLines)
	if err != nil {
		return Summary{}, err
	}
	s := Summary{
		SalesLines: len(d.sales), Plants: len(d.plants), Stores: len(stores),
		Districts: len(districts), CalendarDays: len(d.days), Repairs: len(d.repairs),
	}
	plantFamily := make(map[int]string, len(d.plants))
	for _, p := range d.plants {
		plantFamily[p.id] = p.family
	}
	noRegion := make(map[int]bool)
	for _, st := range stores {
		for _, x := range districts {
			if x.id == st.district && x.region == "" {
				noRegion[st.id] = true
			}
		}
	}
	lastReceipt := ""
	for _, l := range d.sales {
		if l.receipt != lastReceipt {
			// Lines of one receipt are adjacent.
			s.Receipts++
			lastReceipt = l.receipt
		}
		rev := l.price * int64(l.qty)
		s.RevenueCents += rev
		s.CostCents += l.cost * int64(l.qty)
		s.Units += int64(l.qty)
		fam, ok := plantFamily[l.plant]
		switch {
		case !ok:
			s.UnmatchedSalesLines++
			s.UnmatchedRevenueCents += rev
		case fam == "":
			s.NoFamilySalesLines++
		}
		if noRegion[l.store] {
			s.NoRegionSalesLines++
		}
	}
	if len(d.sales) > 0 {
		s.FirstSale = d.days[d.sales[0].day].date
		s.LastSale = d.days[d.sales[len(d.sales)-1].day].date
	}
	for _, j := range d.repairs {
		s.RepairFeeCents += j.fee
		if j.quarters < 0 {
			s.RepairsWithoutHours++
		} else {
			s.RepairHoursHundredths += int64(j.quarters) * 25
		}
	}
	return s, nil
}
