package engine

import (
	"fmt"
	"math"
	"math/big"
	"strconv"
	"time"

	"github.com/duckdb/duckdb-go/v2"
	"github.com/shopspring/decimal"
)

// Result is the outcome of a query: column names and rows of normalised
// values.
type Result struct {
	Columns []string
	// Rows hold, per column, one of: nil (NULL), int64, float64,
	// decimal.Decimal (DECIMAL and HUGEINT results, exact), string, bool,
	// time.Time (DATE and TIMESTAMP, in UTC).
	Rows [][]any
}

// normalize converts a value from the DuckDB driver to one of the types
// Result promises. dbType is the column's DuckDB type name.
func normalize(v any, dbType string) (any, error) {
	switch x := v.(type) {
	case nil:
		return nil, nil
	case int64:
		return x, nil
	case int8:
		return int64(x), nil
	case int16:
		return int64(x), nil
	case int32:
		return int64(x), nil
	case int:
		return int64(x), nil
	case uint8:
		return int64(x), nil
	case uint16:
		return int64(x), nil
	case uint32:
		return int64(x), nil
	case uint64:
		if x <= math.MaxInt64 {
			return int64(x), nil
		}
		return decimal.NewFromBigInt(new(big.Int).SetUint64(x), 0), nil
	case float64:
		return x, nil
	case float32:
		// The shortest decimal form of the float32, so that 0.1 stays 0.1
		// rather than 0.10000000149011612.
		f, err := strconv.ParseFloat(strconv.FormatFloat(float64(x), 'g', -1, 32), 64)
		if err != nil {
			return float64(x), nil
		}
		return f, nil
	case duckdb.Decimal:
		if x.Value == nil {
			return nil, fmt.Errorf("DECIMAL value without digits")
		}
		return decimal.NewFromBigInt(x.Value, -int32(x.Scale)), nil
	case *duckdb.Decimal:
		if x == nil {
			return nil, nil
		}
		return normalize(*x, dbType)
	case *big.Int:
		if x == nil {
			return nil, nil
		}
		return decimal.NewFromBigInt(x, 0), nil
	case decimal.Decimal:
		return x, nil
	case string:
		return x, nil
	case bool:
		return x, nil
	case time.Time:
		switch dbType {
		case "TIME", "TIMETZ", "TIME_NS":
			return nil, fmt.Errorf("values of type %s are not supported; cast them to text", dbType)
		}
		return x.UTC(), nil
	}
	name := dbType
	if name == "" {
		name = fmt.Sprintf("%T", v)
	}
	return nil, fmt.Errorf("values of type %s are not supported", name)
}
