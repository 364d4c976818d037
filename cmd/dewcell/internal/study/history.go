package study

import (
	"fmt"
	"strconv"
	"time"

	"dewcell/cmd/dewcell/internal/units"
)

// A HistoryRow is one [[history]] table: the average reservoir pressure and
// the cumulative production at one time. Rows come in time order.
type HistoryRow struct {
	// Label is the row's date (YYYY-MM-DD) or step number as written, or
	// its position in the file ("1", "2", …) when the table gives neither.
	Label string
	Date  time.Time // zero when the row gives a step or nothing
	Step  int       // 0 when the row gives a date or nothing

	Pressure   float64 // average reservoir pressure, Pa
	SalesGas   float64 // cumulative sales (surface) gas, standard m³
	Condensate float64 // cumulative stock-tank condensate, m³ at standard conditions
	Water      float64 // cumulative water, m³ at standard conditions; 0 when not given
}

// Production is true when the row records any gas or condensate produced.
func (h HistoryRow) Production() bool { return h.SalesGas > 0 || h.Condensate > 0 }

type fileHistory struct {
	Date       value `toml:"date"`
	Step       value `toml:"step"`
	Pressure   value `toml:"pressure"`
	SalesGas   value `toml:"sales_gas"`
	Condensate value `toml:"condensate"`
	Water      value `toml:"water"`
}

// dateLayout is the written form of a history date.
const dateLayout = "2006-01-02"

// history reads the [[history]] tables: each with a date or a step (the same
// in every row, or neither in any), a pressure and the cumulative sales gas
// and condensate, optionally water (once a row with production gives it,
// every later row must; a row without it before that has produced none).
// Dates and steps rise; cumulative volumes
// never fall; only the first row may record no production (the initial
// state); every pressure lies above zero and, when the row records
// production, below reservoir.initial_pressure, which [[history]] needs.
func (r *reader) history(s *Study, rows []fileHistory) {
	if len(rows) == 0 {
		return
	}
	if r.err == nil && s.Reservoir.InitialPressure == 0 {
		r.missing("reservoir.initial_pressure", "the initial pressure, which the [[history]] material balance starts from")
		return
	}
	var order string // "date", "step" or "" (file order), set by the first row
	waterFrom := 0   // the first row with production that gives water, from 1
	for i, f := range rows {
		k := fmt.Sprintf("history[%d]", i+1)
		h := HistoryRow{Label: strconv.Itoa(i + 1)}
		kind := ""
		switch {
		case f.Date.set && f.Step.set:
			r.failf(k+".step", "give a date or a step, not both")
		case f.Date.set:
			kind = "date"
			h.Date = r.date(k+".date", f.Date)
			h.Label = h.Date.Format(dateLayout)
		case f.Step.set:
			kind = "step"
			h.Step, _ = r.integer(k+".step", f.Step, "a step number", 0, 1e9)
			h.Label = strconv.Itoa(h.Step)
		}
		if r.err != nil {
			return
		}
		switch {
		case i == 0:
			order = kind
		case kind == order:
		case kind == "":
			r.missing(k+"."+order, fmt.Sprintf("a %s, as every row has when history[1] has one", order))
			return
		default:
			r.failf(k+"."+kind, "history[1] gives %s; every row must give the same", describeOrder(order))
			return
		}

		h.Pressure = r.positivePressure(k+".pressure", f.Pressure, true)
		h.SalesGas, _ = r.quantity(k+".sales_gas", f.SalesGas, units.GasVolume, true)
		h.Condensate, _ = r.quantity(k+".condensate", f.Condensate, units.LiquidVolume, true)
		var hasWater bool
		h.Water, hasWater = r.quantity(k+".water", f.Water, units.LiquidVolume, false)
		if r.err != nil {
			return
		}
		switch {
		case hasWater && h.Production():
			waterFrom = i + 1
		case !hasWater && h.Production() && waterFrom > 0:
			r.missing(k+".water", fmt.Sprintf("the cumulative water, as history[%d] gives it: once given, every row gives it", waterFrom))
			return
		}

		if i > 0 {
			prev := s.History[i-1]
			switch {
			case order == "date" && !h.Date.After(prev.Date):
				r.failf(k+".date", "%s is not after %s of history[%d]: the rows must be in time order", h.Label, prev.Label, i)
			case order == "step" && h.Step <= prev.Step:
				r.failf(k+".step", "%d is not after step %d of history[%d]: the rows must be in time order", h.Step, prev.Step, i)
			case h.SalesGas < prev.SalesGas:
				r.failf(k+".sales_gas", "falls below that of history[%d]: cumulative production never falls; are the rows in time order?", i)
			case h.Condensate < prev.Condensate:
				r.failf(k+".condensate", "falls below that of history[%d]: cumulative production never falls; are the rows in time order?", i)
			case h.Water < prev.Water:
				r.failf(k+".water", "falls below that of history[%d]: cumulative production never falls; are the rows in time order?", i)
			case !h.Production():
				r.failf(k+".sales_gas", "no gas or condensate produced: only history[1] may be the initial state")
			}
		}
		if h.Production() && h.Pressure >= s.Reservoir.InitialPressure {
			r.failf(k+".pressure", "is not below reservoir.initial_pressure: the pressure of a reservoir that has produced lies below its initial pressure")
		}
		if r.err != nil {
			return
		}
		s.History = append(s.History, h)
	}
}

func describeOrder(order string) string {
	if order == "" {
		return "neither a date nor a step"
	}
	return "a " + order
}

// date reads a TOML date (date = 2021-07-01) or a string in the same form.
func (r *reader) date(k string, v value) time.Time {
	switch d := v.raw.(type) {
	case time.Time:
		return d
	case string:
		t, err := time.Parse(dateLayout, d)
		if err != nil {
			r.failf(k, "%q is not a date; write it as YYYY-MM-DD, such as 2021-07-01", d)
		}
		return t
	}
	r.failf(k, "%s was given; want a date such as 2021-07-01", describe(v.raw))
	return time.Time{}
}
