package demo

// The fixed dimension data of the demo chain: districts, stores, plant
// families and plants. Everything here is made up. Prices and popularity of
// plants are drawn from the seeded generator in data.go; names, places and
// seasons are written out here so that they read well.

// district is one row of districts.csv. An empty region is written as an
// empty field (NULL).
type district struct {
	id     int
	name   string
	region string
}

var districts = []district{
	{1, "Upper Wendle", "North"},
	{2, "Marrowby Vale", "East"},
	{3, "Saltgrave Coast", "South"},
	{4, "Hollin Reach", "West"},
	{5, "Kettleford Fringe", ""}, // deliberate: no region yet
}

// store is one row of stores.csv. floorM2 also weights how many receipts
// the store rings up.
type store struct {
	id       int
	city     string
	district int
	opened   string // yyyy-mm-dd
	floorM2  int
	workshop bool
}

var stores = []store{
	{1, "Brackenholt", 1, "2009-04-01", 3200, true},
	{2, "Ashwendle", 1, "2012-03-15", 1800, true},
	{3, "Thornmere", 1, "2016-05-01", 1400, false},
	{4, "Quillhaven", 2, "2008-03-01", 4100, true},
	{5, "Dunmarrow", 2, "2014-09-20", 2200, true},
	{6, "Fernsby Cross", 2, "2019-04-06", 1500, false},
	{7, "Otterlade", 3, "2010-02-27", 2900, true},
	{8, "Hazelcombe", 3, "2013-06-01", 2600, true},
	{9, "Pennydown", 3, "2021-03-20", 1200, true},
	{10, "Larkmire", 4, "2011-03-12", 3500, true},
	{11, "Corvey Bridge", 4, "2017-04-08", 2000, true},
	{12, "Wrenfold", 5, "2025-09-13", 1600, false}, // deliberate: opens mid-period, no workshop
}

// family describes one plant family: its price band in whole units, how
// many of an item a line usually carries, and how well it sells in each
// month (percent, January first).
type family struct {
	name     string
	priceLo  int
	priceHi  int
	qty      []int // weights for qty 1, 2, ...
	season   [12]int
	products []string
}

var (
	qtyFew   = []int{80, 15, 5}
	qtyMany  = []int{30, 22, 14, 10, 7, 5, 4, 3, 3, 2}
	qtySeeds = []int{20, 16, 14, 12, 10, 8, 6, 5, 5, 4}
)

var families = []family{
	{"Roses", 8, 25, qtyMany[:6],
		[12]int{30, 40, 70, 110, 160, 170, 150, 110, 80, 60, 50, 40},
		[]string{"Rose 'Copper Lantern'", "Rose 'Morning Pilgrim'", "Rose 'Quiet Harbour'",
			"Rose 'Wendle Blush'", "Rose 'Ember Lace'", "Climbing rose 'Tall Story'",
			"Rose 'Saltgrave Snow'", "Rambling rose 'Hedge Mist'"}},
	{"Herbs", 2, 6, qtyMany,
		[12]int{20, 30, 70, 140, 170, 160, 140, 110, 70, 40, 20, 20},
		[]string{"Basil, sweet", "Rosemary 'Blue Spire'", "Thyme, lemon", "Mint, apple",
			"Chives", "Sage 'Grey Owl'", "Coriander", "Parsley, flat-leaf"}},
	{"Fruit trees", 25, 70, qtyFew,
		[12]int{130, 140, 120, 70, 40, 30, 30, 40, 60, 110, 160, 140},
		[]string{"Apple 'Hollin Russet'", "Pear 'Saltgrave Gold'", "Plum 'Dusk Velvet'",
			"Cherry 'Larkmire Red'", "Fig 'Harbour Brown'", "Quince 'Old Wendle'",
			"Damson 'Otter Blue'", "Medlar 'Nottle'"}},
	{"Bulbs", 3, 9, qtyMany,
		[12]int{20, 30, 80, 70, 30, 20, 30, 90, 190, 200, 130, 40},
		[]string{"Tulip mix 'Ember Parade'", "Daffodil 'Little Lantern'", "Crocus 'Frost Violet'",
			"Allium 'Purple Orb'", "Snowdrop bundle", "Iris 'Midnight Sail'",
			"Hyacinth 'Pale Sky'", "Lily 'Sunset Trumpet'"}},
	{"Seeds", 1, 4, qtySeeds,
		[12]int{130, 170, 190, 160, 90, 50, 40, 40, 50, 40, 40, 70},
		[]string{"Seeds: carrot 'Early Fen'", "Seeds: sweet pea mix", "Seeds: runner bean 'Tall Tom'",
			"Seeds: lettuce 'Crisp Wendle'", "Seeds: tomato 'Garnet Drop'", "Seeds: sunflower 'Giant Noon'",
			"Seeds: wildflower meadow", "Seeds: courgette 'Green Barrel'", "Seeds: radish 'Quick Scarlet'"}},
	{"Perennials", 5, 15, qtyMany[:8],
		[12]int{30, 40, 80, 140, 170, 160, 130, 110, 100, 60, 40, 30},
		[]string{"Lavender, dwarf", "Foxglove 'Tall Bell'", "Hellebore 'Winter Moth'",
			"Geranium 'Blue Brook'", "Hosta 'Wide Leaf'", "Salvia 'Ember'",
			"Coneflower 'Sunhat'", "Peony 'Blush Globe'", "Delphinium 'Sky Tower'"}},
	{"Tools", 9, 60, qtyFew,
		[12]int{60, 70, 120, 130, 120, 90, 80, 80, 80, 80, 100, 160},
		[]string{"Hand trowel", "Border fork", "Secateurs, bypass", "Watering can 10 l",
			"Hori hori knife", "Kneeling pad", "Hedge shears", "Rake, landscape"}},
	// Deliberate: the last two plants have no family (written as an empty
	// field, NULL). Their name is used in place of a family name here.
	{"", 4, 10, qtyMany[:4],
		[12]int{100, 100, 100, 100, 100, 100, 100, 100, 100, 100, 100, 100},
		[]string{"Mixed bedding tray", "Surprise seedling pot"}},
}

// monthWeight is how busy the chain is in each month (January first).
var monthWeight = [12]int{30, 40, 80, 120, 140, 120, 100, 80, 70, 60, 50, 60}

// weekdayWeight is how busy the chain is on each weekday (Sunday first).
var weekdayWeight = [7]int{15, 10, 9, 9, 10, 12, 18}

// repairMonthWeight and repairWeekdayWeight shape the workshop's year and
// week; workshops close on Sundays.
var (
	repairMonthWeight   = [12]int{40, 60, 120, 140, 120, 90, 80, 70, 70, 80, 60, 40}
	repairWeekdayWeight = [7]int{0, 10, 10, 10, 10, 10, 6}
)

// repairKind is one kind of workshop job: its share of jobs, its labour in
// quarter hours, and the parts it uses in whole units.
type repairKind struct {
	name             string
	weight           int
	quartersLo, qHi  int
	partsLo, partsHi int
}

var repairKinds = []repairKind{
	{"Mower service", 40, 4, 10, 5, 35},
	{"Mower blade sharpening", 20, 1, 3, 0, 4},
	{"Hedge trimmer repair", 12, 2, 8, 4, 45},
	{"Chainsaw chain and tune", 10, 3, 8, 8, 40},
	{"Strimmer repair", 12, 2, 6, 3, 25},
	{"Cultivator overhaul", 6, 8, 24, 20, 120},
}

// repairRateCents is the workshop's labour rate per quarter hour.
const repairRateCents = 1050

var seasonOfMonth = [12]string{
	"Winter", "Winter", "Spring", "Spring", "Spring", "Summer",
	"Summer", "Summer", "Autumn", "Autumn", "Autumn", "Winter",
}

var weekdayNames = [7]string{"Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"}
