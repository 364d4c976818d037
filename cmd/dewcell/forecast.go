package main

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"time"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/mbal"
)

// forecastGridSteps is the number of even pressure steps the depletion is
// tabulated on for the forecast (and the dew point among them).
const forecastGridSteps = 120

func forecastCommand() *cli.Command {
	return studyCommand("forecast",
		"production forecast of the depletion versus time: the wells' deliverability and the plateau of sales gas ([wells], [production]), "+
			"the gas plant ([plant]), the rates, cumulatives and pressure per step and per year, and the cash flow and its NPV and IRR ([economics])",
		[]cli.Flag{startAtDewPointFlag(), plotFlag()},
		func(c *cli.Context, o *options, st *study.Study) error {
			res, err := forecastRun(o, st, c.Bool(flagStartAtDew))
			if err != nil {
				return err
			}
			return o.emitPlots(c, forecastReport(st, o.sys, res))
		})
}

// forecastResult is a forecast and what it was made from.
type forecastResult struct {
	res   mbal.Reservoir
	rec   *mbal.Recovery
	model *mbal.DepletionModel
	fc    *mbal.Forecast
	sales *salesGas
	std   units.Conditions
	cash  *mbal.CashFlowResult // nil without [economics]
}

// forecastRun forecasts the study's field: the recovery tabulated on a
// fine pressure grid, the wells on it.
func forecastRun(o *options, st *study.Study, atDew bool) (*forecastResult, error) {
	switch {
	case st.Wells == nil:
		return nil, cli.Exit(fmt.Sprintf("%s has no [wells] section: the forecast needs the wells' count, start and test, such as "+
			`[wells] count = 6, start = "2027-01-01", test_rate = "9 MMscf/d", test_reservoir_pressure = "4050 psia", test_flowing_pressure = "3000 psia", deliverability_exponent = 0.85, minimum_flowing_pressure = "1000 psia"`, st.File), exitUsage)
	case st.Production == nil:
		return nil, cli.Exit(fmt.Sprintf("%s has no [production] section: the forecast needs the field's plateau and horizon, such as "+
			`[production] plateau_rate = "45 MMscf/d", uptime = 0.95, minimum_rate = "2 MMscf/d", end = "2060-01-01", step = "1 month"`, st.File), exitUsage)
	}
	fs, err := forecastSetupOf(o, st, "forecast", atDew, st.Plant)
	if err != nil {
		return nil, err
	}
	rec, model, err := depletionModelOf(st, o.sys, fs)
	if err != nil {
		return nil, err
	}
	p := st.Production
	fc, err := mbal.RunForecast(model, wellsOf(st.Wells), mbal.ForecastOptions{Plateau: p.PlateauRate, Uptime: p.Uptime, Minimum: p.MinimumRate, End: p.End, StepMonths: p.StepMonths})
	if err != nil {
		return nil, fmt.Errorf("the forecast: %w", err)
	}
	out := &forecastResult{res: fs.res, rec: rec, model: model, fc: fc, sales: fs.sales, std: st.StandardConditions(o.sys)}
	if st.Economics != nil {
		if out.cash, err = cashFlowOf(st, out); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// forecastSetup is what every forecast of a study shares: the reservoir,
// its dew point, the separator train, the gas plant and its sales gas at
// discovery.
type forecastSetup struct {
	res   mbal.Reservoir
	sat   eos.Saturation
	tr    cvd.Train
	plant mbal.Plant
	proc  mbal.GasProcessor
	sales *salesGas
}

func forecastSetupOf(o *options, st *study.Study, what string, atDew bool, plant *study.Plant) (*forecastSetup, error) {
	res, err := reservoirOf(o, st, what, true)
	if err != nil {
		return nil, err
	}
	if _, err := startAtDewPoint(o, st, &res, what, atDew); err != nil {
		return nil, err
	}
	if len(st.Separator) == 0 {
		o.warnOnce(noSeparator, fmt.Sprintf("%s gives no [[separator.stage]]: the produced stream goes straight to the stock tank", st.File))
	}
	sat, err := upperSaturation(st, o.sys, res.T)
	if err != nil {
		return nil, err
	}
	fs := &forecastSetup{res: res, sat: sat, tr: trainOf(st, o.sys)}
	if fs.plant, fs.proc, err = plantOf(st, plant, o.sys); err != nil {
		return nil, err
	}
	if fs.sales, err = salesGasOf(st, o.sys, fs.tr, fs.plant); err != nil {
		return nil, err
	}
	return fs, nil
}

// depletionModelOf is the depletion of the study tabulated for a forecast.
func depletionModelOf(st *study.Study, sys units.System, fs *forecastSetup) (*mbal.Recovery, *mbal.DepletionModel, error) {
	res := fs.res
	grid := mbal.DepletionGrid(res.Pi, res.Abandonment, fs.sat.P, forecastGridSteps)
	rec, err := mbal.Recover(st.Fluid, st.Z, res, fs.tr, mbal.RecoverOptions{Pressures: grid, SkipMaxSaturation: true})
	if err != nil {
		return nil, nil, reservoirError(st, sys, "depletion recovery for the forecast", err)
	}
	model, err := mbal.NewDepletionModel(st.Fluid, rec, fs.tr, fs.proc, nil)
	if err != nil {
		return nil, nil, fmt.Errorf("the depletion as the forecast's reservoir: %w", err)
	}
	return rec, model, nil
}

// wellsOf is [wells] as the forecast takes them.
func wellsOf(w *study.Wells) mbal.Wells {
	wells := mbal.Wells{Count: w.Count, Start: w.Start, TestRate: w.TestRate, TestPR: w.TestReservoirPressure, TestPwf: w.TestFlowingPressure,
		Exponent: w.Exponent, MinPwf: w.MinimumFlowingPressure, BankFactor: w.BankFactor}
	for _, a := range w.Add {
		wells.Add = append(wells.Add, mbal.WellAdd{Date: a.Date, Count: a.Count})
	}
	return wells
}

// cashFlowOf is the yearly cash flow of the forecast fr with the study's
// [economics]; the abandonment cost falls in the last year of production.
func cashFlowOf(st *study.Study, fr *forecastResult) (*mbal.CashFlowResult, error) {
	return cashFlowFor(st.File, st.Economics, fr.fc, fr.sales, nil, nil)
}

// cashFlowFor is the yearly cash flow of the forecast fc with economics e,
// extra capital costs and a cost of each year beyond e's opex (nil: none).
func cashFlowFor(file string, e *study.Economics, fc *mbal.Forecast, sales *salesGas, extra []mbal.Capex, other func(mbal.ForecastYear) float64) (*mbal.CashFlowResult, error) {
	me := mbal.Economics{Currency: e.Currency, GasPrice: e.GasPrice, CondensatePrice: e.CondensatePrice, NGLPrice: e.NGLPrice,
		Royalty: e.Royalty, DiscountRate: e.DiscountRate, OpexFixed: e.OpexFixed, OpexPerWell: e.OpexPerWell,
		OpexGas: e.OpexGas, OpexCondensate: e.OpexCondensate, AbandonmentCost: e.AbandonmentCost}
	if !e.GasPerEnergy {
		me.GasBasis = mbal.GasPerVolume
	}
	if !e.MidYear {
		me.Discounting = mbal.EndOfYear
	}
	for _, c := range e.Capex {
		me.Capex = append(me.Capex, mbal.Capex{Date: c.Date, Amount: c.Amount, What: c.What})
	}
	me.Capex = append(me.Capex, extra...)
	var ys []mbal.YearVolumes
	for _, y := range fc.Years {
		v := y.Volumes
		if math.IsNaN(v.SalesEnergy) {
			v.SalesEnergy = 0 // unknown, and not priced: the gas sells by volume
		}
		yv := mbal.YearVolumes{Year: y.Year, SalesGas: v.SalesGas, SalesEnergy: v.SalesEnergy, Condensate: v.Condensate, NGL: v.NGL,
			WellYears: y.WellYears, ProducingFraction: y.ProducingFraction}
		if other != nil {
			yv.OtherOpex = other(y)
		}
		ys = append(ys, yv)
	}
	if e.GasPerEnergy && math.IsNaN(fc.Final.Cum.SalesEnergy) {
		return nil, cli.Exit(fmt.Sprintf("%s: economics.gas_price is per energy, but the sales gas's heating value is unknown (%s): give the price per volume, such as \"3.6 %s/Mscf\"",
			file, sales.unknown, e.Currency), exitUsage)
	}
	last := fc.StopDate.Add(-time.Nanosecond).Year()
	cf, err := mbal.CashFlow(me, ys, last)
	var ee *mbal.EconomicsError
	switch {
	case errors.As(err, &ee):
		return nil, cli.Exit(fmt.Sprintf("%s: %s: %s (production runs from %s to %s, when %s)", file, economicsKey(ee.Field), ee.Why,
			fc.FirstProduction.Format(time.DateOnly), fc.StopDate.Format(time.DateOnly), fc.Stop), exitUsage)
	case err != nil:
		return nil, cli.Exit(fmt.Sprintf("%s: [economics]: %v", file, cause(err)), exitUsage)
	}
	return cf, nil
}

// economicsKey is the study's key of a field of the cash-flow model:
// "Capex[0].Date" is economics.capex[1].date, "OpexPerWell"
// economics.opex_per_well.
func economicsKey(field string) string {
	var i int
	var rest string
	if n, _ := fmt.Sscanf(field, "Capex[%d]", &i); n == 1 {
		if j := strings.Index(field, "]"); j >= 0 {
			rest = strings.ToLower(field[j+1:])
		}
		return fmt.Sprintf("economics.capex[%d]%s", i+1, rest)
	}
	if strings.HasPrefix(field, "years") || field == "abandonYear" {
		return "the forecast's yearly volumes (" + field + ")" // not an input: a fault of the forecast
	}
	var b strings.Builder
	for k, r := range field {
		if k > 0 && r >= 'A' && r <= 'Z' {
			b.WriteByte('_')
		}
		b.WriteRune(r)
	}
	return "economics." + strings.ToLower(b.String())
}

// plantOf is the study's gas plant ([plant]; without it, a plant that
// sells the separator gas as it is) as the forecast uses it: the sales gas,
// its energy by the gross heating value of its composition, the NGL, fuel
// and gas removed, in standard volumes at the study's conditions.
func plantOf(st *study.Study, plant *study.Plant, sys units.System) (mbal.Plant, mbal.GasProcessor, error) {
	comps := st.Fluid.Components()
	var pl mbal.Plant
	if p := plant; p != nil {
		pl = mbal.Plant{Remove: p.Remove, NGL: p.NGL, Fuel: p.Fuel}
	}
	if err := pl.Check(comps); err != nil {
		return pl, nil, cli.Exit(fmt.Sprintf("%s: [plant]: %v", st.File, cause(err)), exitUsage)
	}
	std := st.StandardConditions(sys)
	vsc := cvd.Conditions{T: std.T, P: std.P}.IdealGasVolume()
	return pl, func(gas []float64, moles float64) (mbal.Processed, error) {
		r, err := pl.Process(comps, gas, moles)
		if err != nil {
			return mbal.Processed{}, err
		}
		out := mbal.Processed{SalesGas: r.Sales * vsc, NGL: r.NGLVolume, Fuel: r.Fuel * vsc, Removed: r.Removed * vsc, SalesComposition: r.SalesComposition}
		if r.Sales > 0 {
			hv, err := mbal.GrossHeatingValue(comps, r.SalesComposition)
			switch {
			case errors.Is(err, mbal.ErrNoProperty):
				hv = math.NaN() // a component without a heating value: the energy is unknown
			case err != nil:
				return mbal.Processed{}, fmt.Errorf("heating value of the sales gas: %w", err)
			}
			out.SalesEnergy = r.Sales * hv
		}
		return out, nil
	}, nil
}

// salesGas is the sales gas the plant makes at discovery, from the
// reservoir fluid through the separators and the plant: its composition,
// its ideal gross heating value per mole and its Z at standard conditions.
type salesGas struct {
	composition []float64
	hv, z       float64
	unknown     string // why the heating value is unknown, "" when it is known
	// perMole is the sales gas, moles, of a mole of the reservoir fluid
	// through the separators and the plant.
	perMole float64
}

func salesGasOf(st *study.Study, sys units.System, tr cvd.Train, pl mbal.Plant) (*salesGas, error) {
	sep, err := cvd.NewSeparator(st.Fluid, tr, nil)
	if err != nil {
		return nil, err
	}
	sr, err := sep.Separate(st.Z)
	if err != nil {
		return nil, fmt.Errorf("the reservoir fluid through the separators: %w", err)
	}
	comps := st.Fluid.Components()
	r, err := pl.Process(comps, sr.Gas, 1)
	if err != nil {
		return nil, fmt.Errorf("the separator gas through the plant: %w", err)
	}
	hv, err := mbal.GrossHeatingValue(comps, r.SalesComposition)
	var unknown string
	switch {
	case errors.Is(err, mbal.ErrNoProperty):
		hv, unknown = math.NaN(), cause(err).Error()
	case err != nil:
		return nil, fmt.Errorf("heating value of the sales gas: %w", err)
	}
	std := st.StandardConditions(sys)
	pp, _ := st.Fluid.Props(std.T, std.P, r.SalesComposition)
	return &salesGas{composition: r.SalesComposition, hv: hv, z: pp.Z, unknown: unknown, perMole: sr.GasMoles * r.Sales}, nil
}

// decimalYear is t as a year with its fraction, for the figures' time
// axis.
func decimalYear(t time.Time) float64 {
	y := t.Year()
	start := time.Date(y, 1, 1, 0, 0, 0, 0, t.Location())
	return float64(y) + t.Sub(start).Seconds()/mbal.YearSeconds(y)
}

// forecastReport shows the forecast res in sys.
func forecastReport(st *study.Study, sys units.System, res *forecastResult) *Report {
	pU := sys.Unit(units.Pressure)
	gU, lU := sys.Unit(units.GasVolume), sys.Unit(units.LiquidVolume)
	grU, lrU := sys.Unit(units.GasRate), sys.Unit(units.LiquidRate)
	fc := res.fc
	ip := res.rec.InPlace
	fin := fc.Final.Cum
	r := &Report{
		Name:    "forecast",
		Section: "Production forecast",
		Title:   fmt.Sprintf("Production forecast of %s: depletion with %s and a plateau of %s sales gas", fluidName(st), wellsText(st.Wells), rateText(grU, st.Production.PlateauRate)),
	}
	date := func(t time.Time) string { return t.Format(time.DateOnly) }
	plateau := "never reached"
	if !fc.PlateauEnd.IsZero() {
		plateau = date(fc.PlateauEnd)
	}
	r.Fields = []Field{
		{Column: Column{Name: "start", Label: "First production"}, Value: date(fc.FirstProduction)},
		{Column: Column{Name: "plateau_rate", Label: "Plateau, sales gas", Unit: grU}, Value: grU.FromSI(st.Production.PlateauRate)},
		{Column: Column{Name: "plateau_end", Label: "End of the plateau"}, Value: plateau},
		{Column: Column{Name: "stop_date", Label: "End of production"}, Value: date(fc.StopDate)},
		{Column: Column{Name: "stop_reason", Label: "Production ends because"}, Value: fc.Stop.String()},
		{Column: Column{Name: "final_pressure", Label: "Reservoir pressure at the end", Unit: pU}, Value: pU.FromSI(fc.Final.P)},
		{Column: Column{Name: "ultimate_wet_gas", Label: "Ultimate wet gas", Unit: gU}, Value: gU.FromSI(fin.WetGas)},
		{Column: Column{Name: "ultimate_sales_gas", Label: "Ultimate sales gas", Unit: gU}, Value: gU.FromSI(fin.SalesGas)},
		{Column: Column{Name: "ultimate_condensate", Label: "Ultimate condensate", Unit: lU}, Value: lU.FromSI(fin.Condensate)},
		{Column: Column{Name: "ultimate_ngl", Label: "Ultimate NGL", Unit: lU}, Value: lU.FromSI(fin.NGL)},
		{Column: Column{Name: "wet_gas_recovery", Label: "Wet gas recovery", Unit: units.Percent, Format: report.Fixed(1)}, Value: units.Percent.FromSI(fin.WetGas / ip.WetGas)},
		{Column: Column{Name: "condensate_recovery", Label: "Condensate recovery", Unit: units.Percent, Format: report.Fixed(1)}, Value: units.Percent.FromSI(fin.Condensate / ip.Condensate)},
		{Column: Column{Name: "ultimate_sales_energy", Label: "Ultimate sales gas, gross heating value", Unit: sys.Unit(units.Energy), Format: report.Format{Scaled: true}}, Value: sys.Unit(units.Energy).FromSI(fin.SalesEnergy)},
	}
	if sg := res.sales; sg != nil && sg.unknown != "" {
		r.Note("the sales gas's heating value is unknown, and with it its energy: " + sg.unknown)
	}
	if sg := res.sales; sg != nil {
		perVol := mbal.HeatingValuePerVolume(sg.hv, sg.z, res.std.T, res.std.P)
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: "heating_value", Label: "Sales gas at discovery: gross heating value", Unit: units.BtuPerScf, Format: report.Fixed(1)}, Value: units.BtuPerScf.FromSI(perVol)},
			Field{Column: Column{Name: "heating_value", Label: "Sales gas at discovery: gross heating value", Unit: units.MegajoulePerSm3, Format: report.Fixed(3)}, Value: units.MegajoulePerSm3.FromSI(perVol)},
			Field{Column: Column{Name: "heating_value_ideal", Label: "Gross heating value per mole (ideal gas)", Unit: kjPerMol, Format: report.Fixed(2)}, Value: sg.hv / 1000},
			Field{Column: Column{Name: "sales_gas_z", Label: "Z of the sales gas at standard conditions", Format: report.Format{Decimals: 5}}, Value: sg.z})
		names := make([]string, st.Fluid.N())
		for i := range names {
			names[i] = st.Fluid.Component(i).Name
		}
		r.Vectors = append(r.Vectors, report.Vector{Name: "sales_gas_composition", Title: "sales gas at discovery, mole fractions", Label: "component", Labels: names, Values: sg.composition})
	}
	steps := Table{Name: "steps", Title: "forecast per step (rates are the step's averages per calendar day; cumulatives at its end)",
		Columns: []Column{
			{Name: "date", Label: "End of step"},
			{Name: "pressure", Unit: pU},
			{Name: "wells"},
			{Name: "wet_gas_rate", Unit: grU},
			{Name: "sales_gas_rate", Unit: grU},
			{Name: "condensate_rate", Unit: lrU},
			{Name: "ngl_rate", Label: "NGL rate", Unit: lrU},
			{Name: "cgr", Label: "CGR", Unit: surfaceUnitsOf(sys).cgr.Unit},
			{Name: "deliverability", Label: "Deliverability, wet gas", Unit: grU},
			{Name: "on_plateau"},
			{Name: "cum_wet_gas", Unit: gU},
			{Name: "cum_sales_gas", Unit: gU},
			{Name: "cum_condensate", Unit: lU},
			{Name: "cum_ngl", Label: "Cum NGL", Unit: lU},
			{Name: "wet_gas_recovery", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "condensate_recovery", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "fuel_rate", Unit: grU},
			{Name: "removed_rate", Label: "Gas removed, rate", Unit: grU},
		}}
	cgrU := surfaceUnitsOf(sys).cgr
	for _, s := range fc.Steps {
		cgr := any(nil)
		if s.Rates.SeparatorGas > 0 {
			cgr = cgrU.of(s.Rates.Condensate / s.Rates.SeparatorGas)
		}
		c := s.State.Cum
		steps.Rows = append(steps.Rows, []any{date(s.End), pU.FromSI(s.State.P), s.Wells,
			grU.FromSI(s.Rates.WetGas), grU.FromSI(s.Rates.SalesGas), lrU.FromSI(s.Rates.Condensate), lrU.FromSI(s.Rates.NGL), cgr,
			grU.FromSI(s.Deliverability), s.OnPlateau,
			gU.FromSI(c.WetGas), gU.FromSI(c.SalesGas), lU.FromSI(c.Condensate), lU.FromSI(c.NGL),
			units.Percent.FromSI(c.WetGas / ip.WetGas), units.Percent.FromSI(c.Condensate / ip.Condensate),
			grU.FromSI(s.Rates.Fuel), grU.FromSI(s.Rates.Removed)})
	}
	steps.Detail = len(steps.Rows) > 60
	years := Table{Name: "years", Title: "forecast per calendar year",
		Columns: []Column{
			{Name: "year"},
			{Name: "wells"},
			{Name: "pressure", Label: "Pressure at the year's end", Unit: pU},
			{Name: "wet_gas", Unit: gU},
			{Name: "sales_gas", Unit: gU},
			{Name: "sales_energy", Label: "Sales gas, gross heating value", Unit: sys.Unit(units.Energy), Format: report.Format{Scaled: true}},
			{Name: "condensate", Unit: lU},
			{Name: "ngl", Label: "NGL", Unit: lU},
			{Name: "fuel", Unit: gU},
			{Name: "removed", Label: "Gas removed", Unit: gU},
			{Name: "sales_gas_rate", Label: "Sales gas, average rate while producing", Unit: grU},
			{Name: "condensate_rate", Label: "Condensate, average rate while producing", Unit: lrU},
			{Name: "cgr", Label: "CGR", Unit: surfaceUnitsOf(sys).cgr.Unit},
			{Name: "cum_wet_gas", Unit: gU},
			{Name: "cum_sales_gas", Unit: gU},
			{Name: "cum_condensate", Unit: lU},
			{Name: "cum_ngl", Label: "Cum NGL", Unit: lU},
			{Name: "wet_gas_recovery", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "condensate_recovery", Unit: units.Percent, Format: report.Fixed(2)},
		}}
	var cum mbal.Streams
	for _, y := range fc.Years {
		v := y.Volumes
		sec := mbal.YearSeconds(y.Year) * y.ProducingFraction // the average over the time the field produced
		cum.WetGas, cum.SalesGas, cum.Condensate, cum.NGL = cum.WetGas+v.WetGas, cum.SalesGas+v.SalesGas, cum.Condensate+v.Condensate, cum.NGL+v.NGL
		cgr := any(nil)
		if v.SeparatorGas > 0 {
			cgr = cgrU.of(v.Condensate / v.SeparatorGas)
		}
		years.Rows = append(years.Rows, []any{y.Year, y.Wells, pU.FromSI(y.End.P), gU.FromSI(v.WetGas), gU.FromSI(v.SalesGas), sys.Unit(units.Energy).FromSI(v.SalesEnergy), lU.FromSI(v.Condensate),
			lU.FromSI(v.NGL), gU.FromSI(v.Fuel), gU.FromSI(v.Removed), grU.FromSI(v.SalesGas / sec), lrU.FromSI(v.Condensate / sec), cgr,
			gU.FromSI(cum.WetGas), gU.FromSI(cum.SalesGas), lU.FromSI(cum.Condensate), lU.FromSI(cum.NGL),
			units.Percent.FromSI(cum.WetGas / ip.WetGas), units.Percent.FromSI(cum.Condensate / ip.Condensate)})
	}
	r.Tables = append(r.Tables, years, steps)
	r.Figures = forecastFigures(sys, res)
	if res.cash != nil {
		cashFlowReport(r, st, sys, res)
	}
	r.Note(fmt.Sprintf("the reservoir is the step-converged depletion of recover, tabulated at %d pressures from %s to %s; the cumulative withdrawal is integrated in daily steps",
		len(res.rec.Steps), pressureNote(sys, res.res.Pi), pressureNote(sys, res.res.Abandonment)))
	return r
}

// wellsText says how many wells produce: "6 wells", "6 wells, 8 from 2023-01-01".
func wellsText(w *study.Wells) string {
	plural := func(n int) string {
		if n == 1 {
			return "1 well"
		}
		return fmt.Sprintf("%d wells", n)
	}
	n, out := w.Count, ""
	if n > 0 {
		out = plural(n)
	}
	for _, a := range w.Add {
		n += a.Count
		if out != "" {
			out += ", "
		}
		out += fmt.Sprintf("%s from %s", plural(n), a.Date.Format(time.DateOnly))
	}
	return out
}

// kjPerMol labels heating values per mole.
var kjPerMol = units.Unit{Symbol: "kJ/mol", Key: "kj_mol"}

// rateText is a rate with its unit, for titles.
func rateText(u units.Unit, q float64) string { return report.Quantity(u.FromSI(q), u) }

// forecastFigures draws the rates, the pressure and the cumulatives
// against time.
func forecastFigures(sys units.System, res *forecastResult) []*report.Figure {
	pU := sys.Unit(units.Pressure)
	grU, lrU := sys.Unit(units.GasRate), sys.Unit(units.LiquidRate)
	fc := res.fc
	tAxis := report.Axis{Label: "Year"}
	gas := &report.Figure{Name: "forecast-gas-rate", Title: "Gas rates", Caption: "Wet gas and sales gas rates of the field, averages per calendar day of each step, and the wells' deliverability.",
		X: tAxis, Y: report.Axis{Label: "Gas rate", Unit: grU}}
	cond := &report.Figure{Name: "forecast-condensate-rate", Title: "Condensate and NGL rates", Caption: "Stock-tank condensate and natural-gas liquids, averages per calendar day of each step.",
		X: tAxis, Y: report.Axis{Label: "Liquid rate", Unit: lrU}}
	pres := &report.Figure{Name: "forecast-pressure", Title: "Reservoir pressure", Caption: "Average reservoir pressure at the end of each step, with the dew point.",
		X: tAxis, Y: report.Axis{Label: "Pressure", Unit: pU}}
	gU, lU := sys.Unit(units.GasVolume), sys.Unit(units.LiquidVolume)
	last := fc.Final.Cum
	gFig, gF := report.FigureUnit(gU, gU.FromSI(last.WetGas))
	lFig, lF := report.FigureUnit(lU, lU.FromSI(last.Condensate))
	cumGas := &report.Figure{Name: "forecast-cumulative-gas", Title: "Cumulative gas", Caption: "Cumulative wet gas (the well stream) and sales gas.",
		X: tAxis, Y: report.Axis{Label: "Cumulative gas", Unit: gFig}}
	cumLiq := &report.Figure{Name: "forecast-cumulative-liquid", Title: "Cumulative condensate and NGL", Caption: "Cumulative stock-tank condensate and natural-gas liquids.",
		X: tAxis, Y: report.Axis{Label: "Cumulative liquid", Unit: lFig}}
	wet := report.Series{Label: "Wet gas", Style: report.Line}
	sales := report.Series{Label: "Sales gas", Style: report.Line}
	deliv := report.Series{Label: "Deliverability", Style: report.Dashed}
	oil := report.Series{Label: "Condensate", Style: report.Line}
	ngl := report.Series{Label: "NGL", Style: report.Line}
	pr := report.Series{Label: "Reservoir pressure", Style: report.Line}
	cw := report.Series{Label: "Wet gas", Style: report.Line}
	cg := report.Series{Label: "Sales gas", Style: report.Line}
	co := report.Series{Label: "Condensate", Style: report.Line}
	cn := report.Series{Label: "NGL", Style: report.Line}
	if len(fc.Steps) == 0 {
		return nil
	}
	start := decimalYear(fc.Steps[0].Start)
	pr.X, pr.Y = append(pr.X, start), append(pr.Y, pU.FromSI(res.model.Initial().P))
	for _, sr := range []*report.Series{&cw, &cg, &co, &cn} {
		sr.X, sr.Y = []float64{start}, []float64{0}
	}
	hasNGL := false
	for _, s := range fc.Steps {
		t0, t1 := decimalYear(s.Start), decimalYear(s.End)
		// Rates as steps: the average over each step, drawn across it.
		for _, t := range []float64{t0, t1} {
			wet.X, wet.Y = append(wet.X, t), append(wet.Y, grU.FromSI(s.Rates.WetGas))
			sales.X, sales.Y = append(sales.X, t), append(sales.Y, grU.FromSI(s.Rates.SalesGas))
			oil.X, oil.Y = append(oil.X, t), append(oil.Y, lrU.FromSI(s.Rates.Condensate))
			ngl.X, ngl.Y = append(ngl.X, t), append(ngl.Y, lrU.FromSI(s.Rates.NGL))
		}
		hasNGL = hasNGL || s.Rates.NGL > 0
		deliv.X, deliv.Y = append(deliv.X, t1), append(deliv.Y, grU.FromSI(s.Deliverability))
		pr.X, pr.Y = append(pr.X, t1), append(pr.Y, pU.FromSI(s.State.P))
		c := s.State.Cum
		cw.X, cw.Y = append(cw.X, t1), append(cw.Y, gU.FromSI(c.WetGas)*gF)
		cg.X, cg.Y = append(cg.X, t1), append(cg.Y, gU.FromSI(c.SalesGas)*gF)
		co.X, co.Y = append(co.X, t1), append(co.Y, lU.FromSI(c.Condensate)*lF)
		cn.X, cn.Y = append(cn.X, t1), append(cn.Y, lU.FromSI(c.NGL)*lF)
	}
	gas.Series = []report.Series{wet, sales, deliv}
	cond.Series = []report.Series{oil}
	if hasNGL {
		cond.Series = append(cond.Series, ngl)
	}
	pres.Series = []report.Series{pr}
	if d := res.model.DewPressure(); d > 0 {
		pres.Lines = []report.RefLine{{Label: "Dew point", Value: pU.FromSI(d)}}
	}
	cumGas.Series = []report.Series{cw, cg}
	cumLiq.Series = []report.Series{co}
	if hasNGL {
		cumLiq.Series = append(cumLiq.Series, cn)
	}
	return []*report.Figure{gas, cond, pres, cumGas, cumLiq}
}

// cashFlowReport adds the economics of the forecast to r: NPV, IRR,
// payback, profit and unit costs, the yearly cash flow and its figure.
func cashFlowReport(r *Report, st *study.Study, sys units.System, res *forecastResult) {
	cf, e := res.cash, st.Economics
	cur := e.Currency
	money := report.Format{Decimals: 0, MinDigits: 1}
	conv := "mid-year"
	if !e.MidYear {
		conv = "end-of-year"
	}
	first := cf.Years[0].Year
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "currency"}, Value: cur},
		Field{Column: Column{Name: "npv", Label: fmt.Sprintf("NPV at %s %% a year (%s, to 1 January %d)", report.Sig(100*e.DiscountRate, 3), conv, first), Symbol: cur, Format: money}, Value: cf.NPV},
		Field{Column: Column{Name: "undiscounted_profit", Label: "Undiscounted profit", Symbol: cur, Format: money}, Value: cf.UndiscountedProfit})
	irr, known := rateOfReturn(cf, e)
	switch {
	case known && !cf.IRRKnown:
		r.Note(fmt.Sprintf("the net cash flow changes sign more than once (%s), so NPV = 0 at more than one rate; the IRR given is the rate above which NPV turns negative",
			cf.IRRWhy))
	case !known && cf.IRRKnown:
		// The one root has the NPV rising through it: money is made at
		// every rate above it, lost below; not a rate of return.
		cf.IRRWhy = fmt.Sprintf("the NPV is zero at %s %% a year but rises through it: the cash flow begins positive and turns negative only at the end, so no rate of return measures it", report.Sig(100*cf.IRR, 4))
	}
	if known {
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: "irr", Label: "IRR (fraction a year)", Verbose: true}, Value: irr},
			Field{Column: Column{Name: "irr", Label: "IRR", Unit: units.Percent, Format: report.Fixed(1)}, Value: units.Percent.FromSI(irr)})
	} else {
		r.Fields = append(r.Fields, Field{Column: Column{Name: "irr_note", Label: "IRR"}, Value: "none: " + cf.IRRWhy})
		r.Warn("the cash flow has no single internal rate of return: " + cf.IRRWhy)
	}
	if cf.PaybackKnown {
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: "payback_date", Label: "Payback"}, Value: cf.Payback.Format(time.DateOnly)},
			Field{Column: Column{Name: "payback_years", Label: fmt.Sprintf("Payback, years from 1 January %d", first), Format: report.Fixed(1)}, Value: cf.PaybackYears})
	} else {
		r.Fields = append(r.Fields, Field{Column: Column{Name: "payback_date", Label: "Payback"}, Value: "never"})
	}
	gasUnit, gasPer := "Mscf", 1e3*units.M3PerFt3
	eUnit, ePer := "MMBtu", units.MMBtu.ToSI(1)
	boe, boePer := "boe", units.M3PerBbl
	if sys == units.Metric {
		gasUnit, gasPer, eUnit, ePer, boe, boePer = "1e3 sm3", 1e3, "GJ", 1e9, "m3 oe", 1
	}
	key := func(s string) string { return strings.NewReplacer(" ", "", "/", "_").Replace(strings.ToLower(s)) }
	show := func(s string) string { return strings.Replace(s, "1e3 ", "10^3 ", 1) }
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "unit_cost_per_" + key(gasUnit), Label: "Unit cost per sales gas (capex, opex, abandonment)", Symbol: cur + "/" + show(gasUnit), Format: report.Fixed(2)}, Value: cf.UnitCostPerSalesGas * gasPer},
		Field{Column: Column{Name: "unit_cost_per_" + key(eUnit), Label: "Unit cost per energy sold", Symbol: cur + "/" + eUnit, Format: report.Fixed(2)}, Value: energyKnown(res, cf.UnitCostPerEnergy*ePer)},
		Field{Column: Column{Name: "unit_technical_cost_per_" + key(boe), Label: fmt.Sprintf("Unit technical cost per oil equivalent (gas at %s scf/bbl)", report.Sig(cf.GasPerOilEquivalent*units.M3PerBbl/units.M3PerFt3, 4)), Symbol: cur + "/" + boe, Format: report.Fixed(2)}, Value: cf.UnitTechnicalCost * boePer})
	t := Table{Name: "cash_flow", Title: fmt.Sprintf("yearly cash flow, %s (discounted to 1 January %d, %s)", cur, first, conv),
		Columns: []Column{
			{Name: "year"},
			{Name: "gas_revenue", Symbol: cur, Format: money},
			{Name: "condensate_revenue", Symbol: cur, Format: money},
			{Name: "ngl_revenue", Label: "NGL revenue", Symbol: cur, Format: money},
			{Name: "royalty", Symbol: cur, Format: money},
			{Name: "opex", Symbol: cur, Format: money},
			{Name: "capex", Symbol: cur, Format: money},
			{Name: "abandonment", Symbol: cur, Format: money},
			{Name: "net_cash_flow", Symbol: cur, Format: money},
			{Name: "discount_factor", Format: report.Fixed(4)},
			{Name: "discounted_cash_flow", Symbol: cur, Format: money},
			{Name: "cumulative_cash_flow", Symbol: cur, Format: money},
			{Name: "cumulative_discounted_cash_flow", Symbol: cur, Format: money},
		}}
	fig := &report.Figure{Name: "forecast-cash-flow", Title: "Yearly cash flow", Caption: fmt.Sprintf("Net cash flow of each year (bars) and the cumulative discounted cash flow at %s %% a year, %s.", report.Sig(100*e.DiscountRate, 3), cur),
		X: report.Axis{Label: "Year"}, Y: report.Axis{Label: "Cash flow [10^6 " + cur + "]"}}
	bars := report.Series{Label: "Net cash flow", Style: report.Bars}
	cum := report.Series{Label: "Cumulative discounted", Style: report.LinePoints}
	for _, y := range cf.Years {
		t.Rows = append(t.Rows, []any{y.Year, y.GasRevenue, y.CondensateRevenue, y.NGLRevenue, y.Royalty, y.Opex, y.Capex, y.Abandonment, y.Net,
			y.DiscountFactor, y.Discounted, y.Cumulative, y.CumulativeDiscounted})
		bars.X, bars.Y = append(bars.X, float64(y.Year)+0.5), append(bars.Y, y.Net/1e6)
		cum.X, cum.Y = append(cum.X, float64(y.Year)+1), append(cum.Y, y.CumulativeDiscounted/1e6)
	}
	fig.Series = []report.Series{bars, cum}
	fig.Lines = []report.RefLine{{Value: 0}}
	r.Tables = append(r.Tables, t)
	r.Figures = append(r.Figures, fig)
	if !res.fc.StopDate.Before(st.Production.End) {
		r.Note("the forecast reaches its end while the field still produces: the cash flow stops there, with the abandonment cost in its last year")
	}
	r.Note("no tax beyond the royalty; the economics are a screening estimate at constant prices and costs")
}

// energyKnown is v, or NaN (left out) when the sales gas's energy is not
// known.
func energyKnown(res *forecastResult, v float64) float64 {
	if math.IsNaN(res.fc.Final.Cum.SalesEnergy) {
		return math.NaN()
	}
	return v
}

// rateOfReturn is the IRR of cf as the report gives it: the rate at which
// its NPV turns from positive to negative (turningRate).
func rateOfReturn(cf *mbal.CashFlowResult, e *study.Economics) (float64, bool) {
	net := make([]float64, len(cf.Years))
	for i, y := range cf.Years {
		net[i] = y.Net
	}
	return turningRate(net, e)
}

// turningRate is the highest discount rate at which the NPV of the yearly
// net cash flows turns from positive below to negative above: the IRR of
// an investment, also when the flows change sign again only at the end (an
// abandonment cost). Rates from −99 % to 1000 % a year are searched on a
// grid even in ln(1 + r), each bracket refined by bisection.
func turningRate(flow []float64, e *study.Economics) (float64, bool) {
	d := mbal.MidYear
	if !e.MidYear {
		d = mbal.EndOfYear
	}
	const steps = 4000
	lo, hi := math.Log(1-0.99), math.Log(1+10.0)
	rate := func(k int) float64 { return math.Exp(lo+(hi-lo)*float64(k)/steps) - 1 }
	best, ok := 0.0, false
	prev := mbal.NPV(rate(0), flow, d)
	for k := 1; k <= steps; k++ {
		r := rate(k)
		v := mbal.NPV(r, flow, d)
		if prev > 0 && v < 0 {
			a, b := rate(k-1), r
			for range 100 {
				m := (a + b) / 2
				if mbal.NPV(m, flow, d) > 0 {
					a = m
				} else {
					b = m
				}
			}
			best, ok = (a+b)/2, true
		}
		prev = v
	}
	return best, ok
}
