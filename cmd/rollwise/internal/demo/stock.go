package demo

import (
	"math/rand/v2"
	"strconv"
)

// seedStock is the random stream of the weekly stock counts.
const seedStock = 4

// stockCount is one row of stock.csv: the units a store holds at its
// weekly count (Sundays), a balance that sums across stores but not across
// days (semiadditive).
type stockCount struct {
	store int
	day   int
	units int
}

// genStock counts every open store's stock each Sunday: a random walk
// that builds up before spring and runs down in autumn.
func genStock(days []day) []stockCount {
	r := rand.New(rand.NewPCG(seedHi, seedStock))
	level := make([]int, len(stores))
	for i, s := range stores {
		level[i] = s.floorM2 / 4
	}
	var out []stockCount
	for di, dy := range days {
		if dy.weekday != 0 {
			continue
		}
		for i, s := range stores {
			if openedDay(s) > di {
				continue
			}
			drift := 0
			switch {
			case dy.month >= 1 && dy.month <= 3:
				drift = 15
			case dy.month >= 8 && dy.month <= 10:
				drift = -12
			}
			level[i] = max(0, level[i]+drift+r.IntN(41)-20)
			out = append(out, stockCount{store: s.id, day: di, units: level[i]})
		}
	}
	return out
}

// stockWriter writes stock.csv.
var stockWriter = tableWriter{"stock.csv", []string{"store_id", "counted_on", "units"},
	func(d *dataset, emit func(...string) error) error {
		for _, c := range d.stock {
			if err := emit(strconv.Itoa(c.store), d.days[c.day].date, strconv.Itoa(c.units)); err != nil {
				return err
			}
		}
		return nil
	}}
