package mbal

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"
	"unicode"

	"dewcell/internal/phys"
)

// PriceBasis says what quantity of sales gas Economics.GasPrice is the
// price of.
type PriceBasis int

const (
	// GasPerEnergy: the price is per joule of the gross (higher) heating
	// value of the sales gas, YearVolumes.SalesEnergy. A price of 3 per GJ
	// is 3e-9 per J. The zero value.
	GasPerEnergy PriceBasis = iota
	// GasPerVolume: the price is per standard m³ of sales gas,
	// YearVolumes.SalesGas.
	GasPerVolume
)

func (b PriceBasis) String() string {
	switch b {
	case GasPerEnergy:
		return "per joule of gross heating value"
	case GasPerVolume:
		return "per standard m³"
	}
	return fmt.Sprintf("PriceBasis(%d)", int(b))
}

func (b PriceBasis) known() bool { return b == GasPerEnergy || b == GasPerVolume }

// Discounting is when within its year a year's cash is taken to flow, for
// discounting to 1 January of the first year of the table. Year k of the
// table (k = 0 the first) is divided by (1 + r)^(k + 0.5) (MidYear) or by
// (1 + r)^(k + 1) (EndOfYear), r the discount rate: the half-year and
// full-year discount factors of Jahn, Cook and Graham (2008, §14.3.3).
type Discounting int

const (
	// MidYear takes the whole year's cash at 1 July, the middle of the year:
	// the convention for cash that flows evenly through the year, as
	// production revenue and operating costs do. The zero value.
	MidYear Discounting = iota
	// EndOfYear takes the whole year's cash at 31 December, in a lump.
	EndOfYear
)

func (d Discounting) String() string {
	switch d {
	case MidYear:
		return "mid-year"
	case EndOfYear:
		return "end of year"
	}
	return fmt.Sprintf("Discounting(%d)", int(d))
}

func (d Discounting) known() bool { return d == MidYear || d == EndOfYear }

// Capex is one capital cost: a well, a platform, a plant.
type Capex struct {
	// Date the money is spent; the cost falls in the calendar year of the
	// date (in the date's own location). Within that year it is treated,
	// like all of the year's cash, as spread evenly over the year (for the
	// payback) and as flowing at the date the Discounting convention puts
	// the year's cash at (for the discounting): only its year matters.
	Date   time.Time
	Amount float64 // currency, at least 0
	What   string  // what it pays for, a label; not used in the arithmetic
}

// Economics are the prices and costs of a gas-condensate development, in
// one currency, constant over the life of the field (no escalation), before
// tax. Volumes are SI: standard m³ of sales gas (at the standard conditions
// of the volumes the caller supplies), m³ of stock-tank condensate and of
// natural-gas liquids, joules of gross heating value.
type Economics struct {
	// Currency is the name of the unit of money ("USD", "EUR"), a label;
	// not used in the arithmetic.
	Currency string
	// GasPrice is the price of sales gas, at least 0: currency per joule of
	// gross heating value (GasBasis GasPerEnergy) or per standard m³
	// (GasPerVolume).
	GasPrice float64
	GasBasis PriceBasis
	// CondensatePrice is per m³ of stock-tank condensate, at least 0.
	CondensatePrice float64
	// NGLPrice is per m³ of natural-gas liquids recovered by the plant, at
	// least 0.
	NGLPrice float64
	// Royalty is the share of the revenue (gas, condensate and NGL) paid to
	// the owner of the mineral rights, a fraction: 0 <= Royalty < 1.
	Royalty float64
	// DiscountRate is the effective annual discount rate, a fraction per
	// year (0.10 for 10 %), above −1.
	DiscountRate float64
	// Discounting is the timing convention of the discounting; the zero
	// value is MidYear.
	Discounting Discounting
	// OpexFixed is the fixed operating cost per year of production, at least
	// 0, charged in each year in proportion to YearVolumes.ProducingFraction.
	OpexFixed float64
	// OpexPerWell is the operating cost per producing well and year, at
	// least 0, charged on YearVolumes.WellYears.
	OpexPerWell float64
	// OpexGas is the operating cost per standard m³ of sales gas (treatment,
	// compression, transport), at least 0.
	OpexGas float64
	// OpexCondensate is the operating cost per m³ of stock-tank condensate
	// (stabilisation, storage, transport), at least 0.
	OpexCondensate float64
	// AbandonmentCost is the cost of plugging the wells and removing the
	// facilities, at least 0, paid in the abandonment year (the last year of
	// the table).
	AbandonmentCost float64
	// Capex are the capital costs, in any order.
	Capex []Capex
	// GasPerOilEquivalent is the standard m³ of sales gas counted as one m³
	// of oil equivalent in CashFlowResult.OilEquivalent and
	// UnitTechnicalCost, at least 0; 0 means DefaultGasPerOilEquivalent.
	GasPerOilEquivalent float64
}

// DefaultGasPerOilEquivalent is 6000 ft³ of gas per barrel of oil
// equivalent (6 Mcf/bbl), in standard m³ per m³: 1068.65. It is the ratio on
// which the trade commonly reports gas in barrels of oil equivalent, about
// the ratio of the heating value of a barrel of crude oil (some 5.8 million
// Btu) to that of a thousand cubic feet of gas (some one million Btu)
// (common practice, no published source; the heating values from memory).
// The foot and the barrel are those of internal/phys (NIST SP 811); the
// standard conditions of the cubic foot are taken to be those of the
// caller's standard m³, a difference far below the precision of the rule.
const DefaultGasPerOilEquivalent = 6000 * phys.M3PerFt3 / phys.M3PerBbl

// YearVolumes is what the field sold and how it produced in one calendar
// year, from a forecast.
type YearVolumes struct {
	Year        int
	SalesGas    float64 // standard m³ of gas sold in the year
	SalesEnergy float64 // J, the gross heating value of that gas
	Condensate  float64 // m³ of stock-tank condensate sold
	NGL         float64 // m³ of natural-gas liquids sold
	// WellYears is the sum over the wells of the fraction of the year each
	// produced: 3 wells all year and one for half of it make 3.5.
	WellYears float64
	// ProducingFraction is the fraction of the year the field produced,
	// from 0 to 1, on which the fixed opex is charged.
	ProducingFraction float64
	// OtherOpex is a cost of the year beyond the opex of Economics, in the
	// currency: the compression of gas cycled or bought, the pumping of
	// water injected, by a scenario's own unit costs.
	OtherOpex float64
}

func (y YearVolumes) hasVolumes() bool {
	return y.SalesGas > 0 || y.SalesEnergy > 0 || y.Condensate > 0 || y.NGL > 0 ||
		y.WellYears > 0 || y.ProducingFraction > 0 || y.OtherOpex > 0
}

// CashFlowYear is one row of the cash-flow table, in the currency of the
// Economics.
type CashFlowYear struct {
	Year int
	// Volumes are the year's volumes (zero in a year without production).
	Volumes           YearVolumes
	GasRevenue        float64 // GasPrice × SalesEnergy or × SalesGas
	CondensateRevenue float64 // CondensatePrice × Condensate
	NGLRevenue        float64 // NGLPrice × NGL
	Revenue           float64 // gas + condensate + NGL revenue
	Royalty           float64 // Economics.Royalty × Revenue
	// Opex is OpexFixed × ProducingFraction + OpexPerWell × WellYears +
	// OpexGas × SalesGas + OpexCondensate × Condensate + OtherOpex.
	Opex        float64
	Capex       float64 // the capital costs dated in the year
	Abandonment float64 // AbandonmentCost in the last year of the table, else 0
	// Net is Revenue − Royalty − Opex − Capex − Abandonment.
	Net float64
	// DiscountFactor is 1/(1 + r)^(k + 0.5) (MidYear) or 1/(1 + r)^(k + 1)
	// (EndOfYear), k the row's index in the table; Discounted is Net divided
	// by (1 + r)^(k + 0.5) or (1 + r)^(k + 1).
	DiscountFactor float64
	Discounted     float64
	// Cumulative and CumulativeDiscounted are the sums of Net and of
	// Discounted from the first row to this one.
	Cumulative, CumulativeDiscounted float64
}

// CashFlowResult is the cash-flow table of a development and its measures.
// Totals run over the whole table.
type CashFlowResult struct {
	// Years runs from the year of the earliest capital cost or production,
	// whichever comes first, to the abandonment year, one row per calendar
	// year, years without volumes or capex included with zeros.
	Years []CashFlowYear
	// NPV is the sum of Discounted: the net present value at
	// Economics.DiscountRate on 1 January of the first year of Years.
	NPV float64
	// IRR is the internal rate of return, the discount rate in (MinIRR,
	// MaxIRR] at which the NPV is zero, when IRRKnown. Otherwise IRR is 0
	// and IRRWhy says in words why there is none, or why it is ambiguous.
	// IRRs lists every rate found with NPV = 0, in increasing order (one
	// when IRRKnown, several when the IRR is ambiguous). See IRR.
	IRR      float64
	IRRKnown bool
	IRRWhy   string
	IRRs     []float64
	// Payback is the date from which the cumulative undiscounted net cash
	// flow stays above zero to the end of the table; PaybackYears the time
	// from 1 January of the first year of the table to it, in years. Each
	// year's cash is taken as spread evenly over the year (capex included),
	// so the cumulative is linear within the year and the date is
	// interpolated linearly in it. A table whose cumulative is never
	// negative pays back on its first day. PaybackKnown is false, and the
	// two zero, when the cumulative ends at or below zero.
	PaybackKnown bool
	Payback      time.Time
	PaybackYears float64
	// UndiscountedProfit is the sum of Net.
	UndiscountedProfit float64
	// The sums of the columns of Years.
	TotalRevenue, TotalRoyalty, TotalOpex, TotalCapex, TotalAbandonment float64
	// The sums of the volumes: standard m³, J, m³, m³.
	TotalSalesGas, TotalSalesEnergy, TotalCondensate, TotalNGL float64
	// OilEquivalent is the production as m³ of oil equivalent: condensate
	// plus NGL (one for one, by volume: common practice, no published
	// source) plus the sales gas divided by GasPerOilEquivalent, the factor
	// used (Economics.GasPerOilEquivalent or DefaultGasPerOilEquivalent).
	OilEquivalent       float64
	GasPerOilEquivalent float64
	// The unit costs, undiscounted: the technical cost TotalCapex +
	// TotalOpex + TotalAbandonment (royalty is a share of revenue, not a
	// cost of production) divided by the TotalSalesGas
	// (UnitCostPerSalesGas, currency per standard m³, all of the cost
	// charged to the gas), by the TotalSalesEnergy (UnitCostPerEnergy,
	// currency per J of gross heating value, comparable with a gas price
	// per energy) and by the OilEquivalent (UnitTechnicalCost, currency per
	// m³ of oil equivalent, gas and liquids together: the fairer measure
	// for a rich condensate). Each is 0 when its divisor is 0.
	UnitCostPerSalesGas float64
	UnitCostPerEnergy   float64
	UnitTechnicalCost   float64
}

// ErrBadEconomics reports invalid prices, costs or yearly volumes; the
// error CashFlow returns is an *EconomicsError wrapping it.
var ErrBadEconomics = errors.New("invalid economics")

// EconomicsError says which input of CashFlow is wrong and why.
type EconomicsError struct {
	// Field is the input as Go names it: a field of Economics
	// ("GasPrice"), of one of its capital costs ("Capex[1].Date"), of one
	// of the yearly volumes ("years[2].SalesGas"), "years" for the table
	// as a whole, or "abandonYear".
	Field string
	// Why is what is wrong, in words, usually the value and what it should
	// be.
	Why string
}

// Error gives the field in lower-case words, "economics: capex[1].date is
// not set: ...", "economics: gas price = -1, want at least 0".
func (e *EconomicsError) Error() string {
	return "economics: " + fieldWords(e.Field) + " " + e.Why
}

// Unwrap makes errors.Is(err, ErrBadEconomics) hold.
func (e *EconomicsError) Unwrap() error { return ErrBadEconomics }

// fieldWords writes a Go field path in lower-case words: "GasPrice" → "gas
// price", "NGLPrice" → "ngl price", "Capex[1].Date" → "capex[1].date".
func fieldWords(path string) string {
	rs := []rune(path)
	var b strings.Builder
	for i, r := range rs {
		if unicode.IsUpper(r) {
			prevLower := i > 0 && unicode.IsLower(rs[i-1])
			acronymEnd := i > 0 && unicode.IsUpper(rs[i-1]) && i+1 < len(rs) && unicode.IsLower(rs[i+1])
			if prevLower || acronymEnd {
				b.WriteByte(' ')
			}
			r = unicode.ToLower(r)
		}
		b.WriteRune(r)
	}
	return b.String()
}

// MaxCashFlowYears is the longest cash-flow table CashFlow builds, from the
// first capital cost or production to the abandonment year: a longer span is
// a mistyped date or year.
const MaxCashFlowYears = 500

// CashFlow builds the yearly cash-flow table of a development from its
// economics and the yearly volumes of a forecast, and its measures: the NPV,
// the IRR, the payback, the undiscounted profit and the unit costs. There is
// no tax; prices and costs are constant.
//
// The table runs from the earliest year that has a capital cost or volumes
// (any of the YearVolumes quantities above zero) to abandonYear, which must
// not come before the last year with volumes; it is the year the
// abandonment cost is paid. years must be in increasing order of Year, each
// year at most once; years missing from it, and those in it without volumes,
// are rows of zero volumes. Entries without volumes outside the table are
// ignored. In each year
//
//	revenue   = gas price × sales energy (or sales gas) + condensate price × condensate + NGL price × NGL
//	royalty   = Royalty × revenue
//	opex      = OpexFixed × producing fraction + OpexPerWell × well-years + OpexGas × sales gas + OpexCondensate × condensate
//	net       = revenue − royalty − opex − capex − abandonment
//
// and the row k of the table (k = 0 the first) is discounted to 1 January of
// the first year by dividing by (1 + r)^(k + 0.5) for MidYear and by
// (1 + r)^(k + 1) for EndOfYear, r = DiscountRate (Jahn, Cook and Graham
// 2008, §14.3.3). The IRR is IRR's on the net cash flows; the payback and
// unit costs are as CashFlowResult describes.
//
// Special cases: any of the following is an *EconomicsError wrapping
// ErrBadEconomics, naming the field: a price, cost, amount or volume that is
// negative or not finite; a royalty outside [0, 1); a discount rate at or
// below −1 or not finite; an unknown GasBasis or Discounting; a capital cost
// without a date or dated after abandonYear; a producing fraction outside
// [0, 1]; years out of order or repeated; abandonYear before the last year
// with volumes; a year that sells gas or liquids with no producing fraction
// (when OpexFixed is above zero) or no well-years (when OpexPerWell is); a
// year that sells gas priced per joule without its heating value; nothing
// to evaluate (no volumes and no capital cost); a table longer than
// MaxCashFlowYears; a discount rate so close to −1 that the discounting
// overflows, or values so large that a cash flow does. On error the result
// is nil.
//
// References:
//   - Jahn, F., Cook, M. and Graham, M. (2008). Hydrocarbon Exploration and
//     Production, 2nd edition. Developments in Petroleum Science 55,
//     Elsevier, Amsterdam. Chapter 14, Petroleum economics: §14.3.3, the
//     full-year and half-year discount factors from a reference date of
//     1 January.
func CashFlow(e Economics, years []YearVolumes, abandonYear int) (*CashFlowResult, error) {
	if err := e.check(); err != nil {
		return nil, err
	}
	bad := func(field, format string, a ...any) error {
		return &EconomicsError{Field: field, Why: fmt.Sprintf(format, a...)}
	}

	// The first and last years of the table.
	first, lastVolumes, found := 0, 0, false
	include := func(y int) {
		if !found || y < first {
			first = y
		}
		found = true
	}
	for i := range e.Capex {
		include(e.Capex[i].Date.Year())
	}
	haveVolumes := false
	for i, y := range years {
		if err := e.checkYear(i, y, years); err != nil {
			return nil, err
		}
		if y.hasVolumes() {
			include(y.Year)
			lastVolumes, haveVolumes = y.Year, true
		}
	}
	if !found {
		return nil, bad("years", "has no year with volumes and there is no capital cost: nothing to evaluate")
	}
	if haveVolumes && abandonYear < lastVolumes {
		return nil, bad("abandonYear", "= %d is before %d, the last year with volumes", abandonYear, lastVolumes)
	}
	for i, c := range e.Capex {
		if y := c.Date.Year(); y > abandonYear {
			return nil, bad(fmt.Sprintf("Capex[%d].Date", i), "= %s falls after the abandonment year %d%s",
				c.Date.Format(time.DateOnly), abandonYear, capexLabel(c))
		}
	}
	if span := float64(abandonYear) - float64(first) + 1; span > MaxCashFlowYears {
		return nil, bad("abandonYear", "= %d makes a table of %.0f years from %d, want at most %d: check the capital-cost dates and the abandonment year",
			abandonYear, span, first, MaxCashFlowYears)
	}

	n := abandonYear - first + 1
	res := &CashFlowResult{Years: make([]CashFlowYear, n)}
	rows := res.Years
	for k := range rows {
		rows[k].Year = first + k
		rows[k].Volumes.Year = first + k
	}
	for _, y := range years {
		if k := y.Year - first; y.hasVolumes() {
			rows[k].Volumes = y
		}
	}
	for _, c := range e.Capex {
		rows[c.Date.Year()-first].Capex += c.Amount
	}
	rows[n-1].Abandonment = e.AbandonmentCost

	res.GasPerOilEquivalent = e.GasPerOilEquivalent
	if res.GasPerOilEquivalent == 0 {
		res.GasPerOilEquivalent = DefaultGasPerOilEquivalent
	}
	net := make([]float64, n)
	for k := range rows {
		row := &rows[k]
		v := row.Volumes
		switch e.GasBasis {
		case GasPerEnergy:
			row.GasRevenue = e.GasPrice * v.SalesEnergy
		case GasPerVolume:
			row.GasRevenue = e.GasPrice * v.SalesGas
		}
		row.CondensateRevenue = e.CondensatePrice * v.Condensate
		row.NGLRevenue = e.NGLPrice * v.NGL
		row.Revenue = row.GasRevenue + row.CondensateRevenue + row.NGLRevenue
		row.Royalty = e.Royalty * row.Revenue
		row.Opex = e.OpexFixed*v.ProducingFraction + e.OpexPerWell*v.WellYears +
			e.OpexGas*v.SalesGas + e.OpexCondensate*v.Condensate + v.OtherOpex
		row.Net = row.Revenue - row.Royalty - row.Opex - row.Capex - row.Abandonment
		if math.IsNaN(row.Net) || math.IsInf(row.Net, 0) {
			return nil, bad("years", "give a cash flow in %d too large to add up: check the prices, costs and volumes", row.Year)
		}
		div := discountDivisor(e.DiscountRate, k, e.Discounting)
		row.DiscountFactor = 1 / div
		row.Discounted = row.Net / div
		if math.IsNaN(row.Discounted) || math.IsInf(row.Discounted, 0) || math.IsInf(row.DiscountFactor, 0) {
			return nil, bad("DiscountRate", "= %g overflows the discounting over the %d years of the table", e.DiscountRate, n)
		}
		net[k] = row.Net

		res.NPV += row.Discounted
		res.UndiscountedProfit += row.Net
		row.Cumulative = res.UndiscountedProfit
		row.CumulativeDiscounted = res.NPV

		res.TotalRevenue += row.Revenue
		res.TotalRoyalty += row.Royalty
		res.TotalOpex += row.Opex
		res.TotalCapex += row.Capex
		res.TotalAbandonment += row.Abandonment
		res.TotalSalesGas += v.SalesGas
		res.TotalSalesEnergy += v.SalesEnergy
		res.TotalCondensate += v.Condensate
		res.TotalNGL += v.NGL
	}
	if math.IsInf(res.NPV, 0) || math.IsInf(res.UndiscountedProfit, 0) {
		return nil, bad("years", "give cash flows too large to add up: check the prices, costs and volumes")
	}

	res.IRRs, res.IRRWhy = irrSolve(net, e.Discounting)
	if res.IRRWhy == "" {
		res.IRR, res.IRRKnown = res.IRRs[0], true
	}
	if py, ok := paybackYears(rows); ok {
		k := int(py)
		if k >= n { // rounding at the very end of the table
			k = n - 1
		}
		start := time.Date(first+k, time.January, 1, 0, 0, 0, 0, time.UTC)
		length := time.Date(first+k+1, time.January, 1, 0, 0, 0, 0, time.UTC).Sub(start)
		res.Payback = start.Add(time.Duration(math.Round((py - float64(k)) * float64(length))))
		res.PaybackYears, res.PaybackKnown = py, true
	}

	res.OilEquivalent = res.TotalCondensate + res.TotalNGL + res.TotalSalesGas/res.GasPerOilEquivalent
	cost := res.TotalCapex + res.TotalOpex + res.TotalAbandonment
	per := func(d float64) float64 {
		if d > 0 {
			return cost / d
		}
		return 0
	}
	res.UnitCostPerSalesGas = per(res.TotalSalesGas)
	res.UnitCostPerEnergy = per(res.TotalSalesEnergy)
	res.UnitTechnicalCost = per(res.OilEquivalent)
	return res, nil
}

// paybackYears is the time from the start of the table to the moment the
// cumulative net cash flow rises above zero for the last time, in years,
// with each year's cash spread evenly over the year: rows[j] is the first
// row from which every cumulative stays above zero, and the cumulative
// crosses zero within it at the fraction −C(j−1)/(C(j) − C(j−1)), C(−1) = 0.
func paybackYears(rows []CashFlowYear) (float64, bool) {
	n := len(rows)
	if n == 0 || !(rows[n-1].Cumulative > 0) {
		return 0, false
	}
	j := n - 1
	for j > 0 && rows[j-1].Cumulative > 0 {
		j--
	}
	prev := 0.0
	if j > 0 {
		prev = rows[j-1].Cumulative
	}
	return float64(j) + -prev/(rows[j].Cumulative-prev), true
}

// check validates the prices, costs and conventions of e and its capital
// costs (their dates against the table are checked by CashFlow).
func (e Economics) check() error {
	bad := func(field, format string, a ...any) error {
		return &EconomicsError{Field: field, Why: fmt.Sprintf(format, a...)}
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	for _, f := range []struct {
		field string
		v     float64
		unit  string
	}{
		{"GasPrice", e.GasPrice, ""},
		{"CondensatePrice", e.CondensatePrice, " (currency per m³)"},
		{"NGLPrice", e.NGLPrice, " (currency per m³)"},
		{"OpexFixed", e.OpexFixed, " (currency per year)"},
		{"OpexPerWell", e.OpexPerWell, " (currency per well and year)"},
		{"OpexGas", e.OpexGas, " (currency per standard m³)"},
		{"OpexCondensate", e.OpexCondensate, " (currency per m³)"},
		{"AbandonmentCost", e.AbandonmentCost, ""},
		{"GasPerOilEquivalent", e.GasPerOilEquivalent, " standard m³ per m³ (0 means 6000 ft³ per barrel)"},
	} {
		if !(f.v >= 0) || !finite(f.v) {
			return bad(f.field, "= %g, want at least 0 and finite%s", f.v, f.unit)
		}
	}
	switch {
	case !e.GasBasis.known():
		return bad("GasBasis", "= %d is unknown: want GasPerEnergy (a price per joule of heating value) or GasPerVolume (per standard m³)", int(e.GasBasis))
	case !(e.Royalty >= 0 && e.Royalty < 1):
		return bad("Royalty", "= %g, want at least 0 and below 1 (a fraction of revenue)", e.Royalty)
	case !(e.DiscountRate > -1) || !finite(e.DiscountRate):
		return bad("DiscountRate", "= %g, want above -1 and finite (a fraction per year: 0.1 for 10 %%)", e.DiscountRate)
	case !e.Discounting.known():
		return bad("Discounting", "= %d is unknown: want MidYear or EndOfYear", int(e.Discounting))
	}
	for i, c := range e.Capex {
		field := fmt.Sprintf("Capex[%d]", i)
		switch {
		case c.Date.IsZero():
			return bad(field+".Date", "is not set: every capital cost needs the date it is spent%s", capexLabel(c))
		case !(c.Amount >= 0) || !finite(c.Amount):
			return bad(field+".Amount", "= %g, want at least 0 and finite%s", c.Amount, capexLabel(c))
		}
	}
	return nil
}

// capexLabel is " (What)" for the messages about a capital cost, or nothing.
func capexLabel(c Capex) string {
	if c.What == "" {
		return ""
	}
	return " (" + c.What + ")"
}

// checkYear validates years[i] and its order after years[i−1].
func (e Economics) checkYear(i int, y YearVolumes, years []YearVolumes) error {
	bad := func(field, format string, a ...any) error {
		return &EconomicsError{Field: fmt.Sprintf("years[%d].%s", i, field), Why: fmt.Sprintf(format, a...)}
	}
	if i > 0 {
		switch p := years[i-1].Year; {
		case y.Year == p:
			return bad("Year", "= %d repeats years[%d]: each year may appear once", y.Year, i-1)
		case y.Year < p:
			return bad("Year", "= %d comes after %d (years[%d]): years must be in increasing order", y.Year, p, i-1)
		}
	}
	for _, f := range []struct {
		field string
		v     float64
		unit  string
	}{
		{"SalesGas", y.SalesGas, "standard m³"},
		{"SalesEnergy", y.SalesEnergy, "J"},
		{"Condensate", y.Condensate, "m³"},
		{"NGL", y.NGL, "m³"},
		{"WellYears", y.WellYears, "well-years"},
		{"OtherOpex", y.OtherOpex, "currency"},
	} {
		if !(f.v >= 0) || math.IsInf(f.v, 0) {
			return bad(f.field, "= %g in %d, want at least 0 and finite (%s)", f.v, y.Year, f.unit)
		}
	}
	if !(y.ProducingFraction >= 0 && y.ProducingFraction <= 1) {
		return bad("ProducingFraction", "= %g in %d, want from 0 to 1 (the fraction of the year the field produced)", y.ProducingFraction, y.Year)
	}
	sells := y.SalesGas > 0 || y.Condensate > 0 || y.NGL > 0
	switch {
	case sells && e.OpexFixed > 0 && y.ProducingFraction == 0:
		return bad("ProducingFraction", "= 0 in %d, a year that sells gas or liquids: give the fraction of the year the field produced, on which the fixed opex is charged", y.Year)
	case sells && e.OpexPerWell > 0 && y.WellYears == 0:
		return bad("WellYears", "= 0 in %d, a year that sells gas or liquids: give the producing wells times the fraction of the year each produced, on which the opex per well is charged", y.Year)
	case e.GasBasis == GasPerEnergy && e.GasPrice > 0 && y.SalesGas > 0 && y.SalesEnergy == 0:
		return bad("SalesEnergy", "= 0 in %d, a year that sells %g standard m³ of gas priced per joule: give the gross heating value of the gas sold", y.Year, y.SalesGas)
	}
	return nil
}

// NPV is the net present value at rate r (a fraction per year, above −1) of
// the yearly net cash flows net, net[0] that of the first year, discounted
// to 1 January of that year: net[k] is divided by (1 + r)^(k + 0.5) for
// MidYear and by (1 + r)^(k + 1) for EndOfYear (Jahn, Cook and Graham 2008,
// §14.3.3; see CashFlow).
//
// Special cases: NPV is NaN for r <= −1, r NaN or +Inf, or an unknown d; 0
// for no cash flows.
func NPV(rate float64, net []float64, d Discounting) float64 {
	if !(rate > -1) || math.IsInf(rate, 1) || !d.known() {
		return math.NaN()
	}
	s := 0.0
	for k, c := range net {
		s += c / discountDivisor(rate, k, d)
	}
	return s
}

// discountDivisor is (1 + r)^(k + 0.5) for MidYear and (1 + r)^(k + 1) for
// EndOfYear, written (1 + r)^k √(1 + r) and (1 + r)^k (1 + r): the integer
// power is math.Pow's repeated squaring, exact whenever the products are
// representable (as for 1 + r = 1.5625 = 1.25², which the tests use).
func discountDivisor(r float64, k int, d Discounting) float64 {
	x := 1 + r
	p := math.Pow(x, float64(k))
	if d == MidYear {
		return p * math.Sqrt(x)
	}
	return p * x
}

// The range of discount rates IRR searches: above MinIRR (−99 % a year) and
// up to MaxIRR (1000 % a year).
const (
	MinIRR = -0.99
	MaxIRR = 10.0
)

// irrGridStep is the step of IRR's scan in ln(1 + r): about 0.2 % of 1 + r,
// some 3500 points over the range.
const irrGridStep = 0.002

// IRR is the internal rate of return of the yearly net cash flows net: the
// discount rate r, a fraction per year, at which NPV(r, net, d) = 0. It
// searches r in (MinIRR, MaxIRR], (−0.99, 10]: a scan of the NPV's sign on
// a grid even in ln(1 + r), of step 0.002, then Brent's (1973) method in
// each interval where the sign changes, to the precision of float64. The
// convention d does not move the roots: mid-year discounting multiplies the
// end-of-year NPV by √(1 + r) > 0. The IRR is the same for both; d is
// checked all the same.
//
// ok is false, irr 0 and why says in words why there is no single IRR,
// when: the net cash flows never turn negative, or are never positive (the
// project never pays back its costs), or are all zero; no rate in the range
// gives NPV = 0; several do (the IRR is ambiguous: why lists them); net is
// empty or holds a value that is not finite; d is unknown. Two roots closer
// together than the grid's step (0.2 % of 1 + r), as a double root, may go
// unseen.
//
// References:
//   - Brent, R.P. (1973). Algorithms for Minimization without Derivatives.
//     Prentice-Hall, Englewood Cliffs. Chapter 4, the zero of a function in
//     a bracket by bisection, secant and inverse quadratic interpolation.
func IRR(net []float64, d Discounting) (irr float64, ok bool, why string) {
	roots, why := irrSolve(net, d)
	if why != "" {
		return 0, false, why
	}
	return roots[0], true, ""
}

// irrSolve returns the rates in (MinIRR, MaxIRR] where the NPV of net is
// zero, in increasing order, and why, empty exactly when there is one.
func irrSolve(net []float64, d Discounting) (roots []float64, why string) {
	if !d.known() {
		return nil, fmt.Sprintf("the discounting convention %d is unknown", int(d))
	}
	if len(net) == 0 {
		return nil, "there are no cash flows"
	}
	// The signs of the nonzero flows: whether any is positive or negative,
	// the first one's and how often it changes.
	pos, neg, signChanges, firstSign, last := false, false, 0, 0.0, 0.0
	for k, c := range net {
		if math.IsNaN(c) || math.IsInf(c, 0) {
			return nil, fmt.Sprintf("the net cash flow of year %d of the table is %g: not finite", k+1, c)
		}
		if c == 0 {
			continue
		}
		s := math.Copysign(1, c)
		if last == 0 {
			firstSign = s
		} else if s != last {
			signChanges++
		}
		last = s
		pos, neg = pos || c > 0, neg || c < 0
	}
	switch {
	case !pos && !neg:
		return nil, "the net cash flows are all zero: every discount rate gives NPV = 0"
	case !neg:
		return nil, "the net cash flows never turn negative: there is no cost to earn a return on, and the NPV is positive at every rate"
	case !pos:
		return nil, "the project never pays back its costs: the net cash flows are never positive"
	}

	f := func(r float64) float64 { return npvScaled(net, r) }
	grid := irrRates
	prevR, prevF := grid[0], f(grid[0])
	if prevF == 0 {
		roots = append(roots, prevR)
	}
	for _, r := range grid[1:] {
		fr := f(r)
		switch {
		case fr == 0:
			roots = append(roots, r)
		case prevF != 0 && (fr > 0) != (prevF > 0):
			roots = append(roots, brentZero(f, prevR, r, prevF, fr))
		}
		prevR, prevF = r, fr
	}

	switch {
	case len(roots) == 1:
		return roots, ""
	case len(roots) > 1:
		rates := make([]string, len(roots))
		for i, r := range roots {
			rates[i] = percent(r)
		}
		list := strings.Join(rates[:len(rates)-1], ", ") + " and " + rates[len(rates)-1]
		return roots, "several discount rates give NPV = 0, " + list + " a year: the IRR is ambiguous"
	}
	lo, hi := f(grid[0]), f(MaxIRR)
	conventional := firstSign < 0 && signChanges == 1
	switch {
	case conventional && lo > 0 && hi > 0:
		return nil, "the NPV is still positive at " + percent(MaxIRR) + " a year: the return is above the highest rate searched"
	case conventional && lo < 0 && hi < 0:
		return nil, "the NPV is negative even at " + percent(MinIRR) + " a year: the project loses nearly all it invests"
	case lo > 0:
		return nil, "no discount rate from " + percent(MinIRR) + " to " + percent(MaxIRR) + " a year gives NPV = 0: the NPV stays positive"
	}
	return nil, "no discount rate from " + percent(MinIRR) + " to " + percent(MaxIRR) + " a year gives NPV = 0: the NPV stays negative"
}

// npvScaled has the sign and the zeros of the NPV of net at rate r, without
// overflow over the whole range: for r >= 0 it is the end-of-year NPV
// Σ net[k] v^(k+1), v = 1/(1 + r) <= 1; for r < 0 that times (1 + r)^n, the
// polynomial Σ net[k] (1 + r)^(n−1−k) with 1 + r < 1. Both are Σ net[k] at
// r = 0, so the function is continuous; each is summed by Horner's rule.
func npvScaled(net []float64, r float64) float64 {
	x := 1 + r
	s := 0.0
	if r < 0 {
		for _, c := range net {
			s = s*x + c
		}
		return s
	}
	v := 1 / x
	for k := len(net) - 1; k >= 0; k-- {
		s = (s + net[k]) * v
	}
	return s
}

// irrRates is the grid of IRR's scan, computed once; it is never written.
var irrRates = irrGrid()

// irrGrid is the scan of IRR: rates even in ln(1 + r) with a step of about
// irrGridStep, from just above MinIRR through 0 (a grid point, where the two
// forms of npvScaled meet) to MaxIRR, increasing.
func irrGrid() []float64 {
	uLow, uHigh := math.Log(1+MinIRR), math.Log(1+MaxIRR)
	nLow := int(math.Ceil(-uLow / irrGridStep))
	nHigh := int(math.Ceil(uHigh / irrGridStep))
	grid := make([]float64, 0, nLow+nHigh+1)
	grid = append(grid, math.Nextafter(MinIRR, 0))
	for i := 1; i < nLow; i++ {
		grid = append(grid, math.Expm1(uLow*float64(nLow-i)/float64(nLow)))
	}
	grid = append(grid, 0)
	for i := 1; i < nHigh; i++ {
		grid = append(grid, math.Expm1(uHigh*float64(i)/float64(nHigh)))
	}
	return append(grid, MaxIRR)
}

// brentZero finds the zero of f between a and b, where fa = f(a) and fb =
// f(b) have opposite signs, by Brent's (1973, ch. 4) method: inverse
// quadratic interpolation or the secant step when it falls well inside the
// bracket and shrinks it fast enough, bisection otherwise; to within
// 4 ε |x| + 1e-15 of the zero (ε the float64 epsilon).
func brentZero(f func(float64) float64, a, b, fa, fb float64) float64 {
	const (
		eps  = 0x1p-52
		xtol = 1e-15
	)
	// b is the best estimate, a the previous one, c the point with the
	// other sign that keeps the zero bracketed between b and c.
	c, fc := a, fa
	d := b - a // the last step
	e := d     // the step before it
	for range 200 {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 2*eps*math.Abs(b) + xtol/2
		m := (c - b) / 2
		if math.Abs(m) <= tol || fb == 0 {
			return b
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			// Interpolate: the secant through a and b when a = c, else
			// inverse quadratic through a, b and c; p/q is the step.
			var p, q float64
			s := fb / fa
			if a == c {
				p = 2 * m * s
				q = 1 - s
			} else {
				qa, rb := fa/fc, fb/fc
				p = s * (2*m*qa*(qa-rb) - (b-a)*(rb-1))
				q = (qa - 1) * (rb - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			// Accept the step if it lands inside the bracket, away from c,
			// and is less than half the step before last.
			if 2*p < math.Min(3*m*q-math.Abs(tol*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = m, m
			}
		} else {
			d, e = m, m
		}
		a, fa = b, fb
		switch {
		case math.Abs(d) > tol:
			b += d
		case m > 0:
			b += tol
		default:
			b -= tol
		}
		fb = f(b)
	}
	return b
}

// percent writes a rate as a percentage to 4 significant digits: "12.5 %".
func percent(r float64) string {
	return strconv.FormatFloat(100*r, 'g', 4, 64) + " %"
}
