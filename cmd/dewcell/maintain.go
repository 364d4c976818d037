package main

import (
	"fmt"
	"math"
	"reflect"
	"sort"
	"strings"
	"time"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/mbal"
)

// maintainSubstep is the integration step of the scenarios whose
// reservoir is a set of cells: each withdrawal flashes every cell, and a
// month keeps the run to seconds.
const maintainSubstep = 30 * 24 * time.Hour

const flagSensitivity = "sensitivity"

func maintainCommand() *cli.Command {
	return studyCommand("maintain",
		"pressure maintenance against depletion: every [[scenario]] of the study (depletion, gas cycling, water injection) forecast with its economics, "+
			"side by side: incremental condensate, sales gas and NPV against depletion, the verdict, and the sensitivity of each scenario's gain",
		[]cli.Flag{
			startAtDewPointFlag(), plotFlag(),
			&cli.Float64Flag{Name: flagSensitivity, Value: 0.2, Usage: "the relative change of each input of the sensitivity table, both ways (0.2: ±20 %)"},
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			f := c.Float64(flagSensitivity)
			if !(f > 0 && f < 1) {
				return cli.Exit(fmt.Sprintf("--%s %g: want a fraction between 0 and 1, such as 0.2 for ±20 %%", flagSensitivity, f), exitUsage)
			}
			runs, err := maintainRun(o, st, c.Bool(flagStartAtDew), f)
			if err != nil {
				return err
			}
			return o.emitPlots(c, maintainReport(st, o.sys, runs))
		})
}

// scenarioRun is one scenario forecast with its economics.
type scenarioRun struct {
	sc      study.Scenario
	fc      *mbal.Forecast
	cash    *mbal.CashFlowResult // nil without [economics]
	balance float64              // largest relative component-balance error (NaN when the model keeps none)
	minP    float64
	ip      *mbal.InPlace
	// trappedGas and trappedCondensate are what water injection leaves
	// behind its front, as wet gas and stock-tank condensate.
	trappedGas, trappedCondensate float64
	// salesInPlace is the sales gas the fluid in place would make through
	// the separators and the plant, standard m³: the base of the sales-gas
	// recovery.
	salesInPlace float64
}

// maintainResult is every scenario and the sensitivity of each one's gain.
type maintainResult struct {
	runs      []scenarioRun
	base      int // the depletion's index, −1 when the study has none
	sens      []sensitivityRow
	change    float64
	setup     *forecastSetup
	currency  string
	dew       float64
	noEconomy bool
}

type sensitivityRow struct {
	input, scenario string
	low, high       float64 // incremental NPV with the input lowered and raised
	base            float64
}

// maintainRun forecasts every scenario of the study, and the sensitivity
// of each gain to its inputs changed by the fraction change both ways (0:
// none).
func maintainRun(o *options, st *study.Study, atDew bool, change float64) (*maintainResult, error) {
	if len(st.Scenarios) == 0 {
		return nil, cli.Exit(fmt.Sprintf("%s has no [[scenario]]: name the ways to produce the field, such as "+
			`[[scenario]] name = "depletion", kind = "depletion" and [[scenario]] name = "cycling", kind = "gas-cycling", return_fraction = 0.85, cycling_years = 10, sweep_efficiency = 0.7`, st.File), exitUsage)
	}
	out := &maintainResult{base: -1, change: change}
	for i, sc := range st.Scenarios {
		if sc.Wells == nil || sc.Production == nil {
			return nil, cli.Exit(fmt.Sprintf("%s: scenario %q has no [wells] and [production]: give them to the study or to the scenario", st.File, sc.Name), exitUsage)
		}
		if sc.Kind == study.ScenarioDepletion && out.base < 0 {
			out.base = i
		}
	}
	for _, sc := range st.Scenarios {
		r, fs, err := runScenario(o, st, sc, atDew, nil)
		if err != nil {
			return nil, err
		}
		out.runs = append(out.runs, *r)
		out.setup, out.dew = fs, fs.sat.P
		if sc.Economics != nil {
			out.currency = sc.Economics.Currency
		} else {
			out.noEconomy = true
		}
	}
	if out.base < 0 || out.noEconomy || change == 0 { // change 0: no sensitivity
		return out, nil
	}
	// The sensitivity of each scenario's gain over depletion to the inputs
	// that matter: the prices (economics alone), and the sweep efficiency,
	// the residual gas saturation and the unit costs of each scenario.
	type input struct {
		name  string
		apply func(sc *study.Scenario, f float64) bool // false: not an input of this scenario
		model bool                                     // the reservoir model changes: rerun the forecast
	}
	scale := func(e *study.Economics, f func(*study.Economics)) *study.Economics {
		c := *e
		f(&c)
		return &c
	}
	inputs := []input{
		{"gas price", func(sc *study.Scenario, f float64) bool {
			sc.Economics = scale(sc.Economics, func(e *study.Economics) { e.GasPrice *= f })
			return true
		}, false},
		{"condensate price", func(sc *study.Scenario, f float64) bool {
			sc.Economics = scale(sc.Economics, func(e *study.Economics) { e.CondensatePrice *= f })
			return true
		}, false},
		{"compression cost", func(sc *study.Scenario, f float64) bool {
			sc.CompressionCost *= f
			return sc.Kind == study.ScenarioCycling && sc.CompressionCost > 0
		}, false},
		{"injection cost", func(sc *study.Scenario, f float64) bool {
			sc.InjectionCost *= f
			return sc.Kind == study.ScenarioWater && sc.InjectionCost > 0
		}, false},
		{"sweep efficiency", func(sc *study.Scenario, f float64) bool {
			sc.Sweep *= f
			return sc.Kind != study.ScenarioDepletion && sc.Sweep <= 1 // a sweep beyond the whole volume has no meaning
		}, true},
		{"residual gas saturation", func(sc *study.Scenario, f float64) bool {
			sc.Sgr *= f
			return sc.Kind == study.ScenarioWater && sc.Sgr < 1-st.Reservoir.WaterSaturation
		}, true},
	}
	baseRun := out.runs[out.base]
	for i, r := range out.runs {
		if i == out.base {
			continue
		}
		gain0 := r.cash.NPV - baseRun.cash.NPV
		for _, in := range inputs {
			row := sensitivityRow{input: in.name, scenario: r.sc.Name, base: gain0}
			ok := true
			for k, f := range []float64{1 - change, 1 + change} {
				sc, dep := r.sc, baseRun.sc
				if !in.apply(&sc, f) {
					ok = false
					break
				}
				in.apply(&dep, f) // prices change for depletion as well
				var npv, npvDep float64
				if in.model {
					rr, _, err := runScenario(o, st, sc, atDew, out.setup)
					if err != nil {
						return nil, err
					}
					npv, npvDep = rr.cash.NPV, baseRun.cash.NPV
				} else {
					cf, err := scenarioCash(st, sc, r.fc, out.setup)
					if err != nil {
						return nil, err
					}
					cfd, err := scenarioCash(st, dep, baseRun.fc, out.setup)
					if err != nil {
						return nil, err
					}
					npv, npvDep = cf.NPV, cfd.NPV
				}
				if k == 0 {
					row.low = npv - npvDep
				} else {
					row.high = npv - npvDep
				}
			}
			if ok {
				out.sens = append(out.sens, row)
			}
		}
	}
	return out, nil
}

// runScenario forecasts scenario sc of the study, with its economics; fs
// is the shared setup when known (nil: made here).
func runScenario(o *options, st *study.Study, sc study.Scenario, atDew bool, fs *forecastSetup) (*scenarioRun, *forecastSetup, error) {
	var err error
	if fs == nil || !reflect.DeepEqual(sc.Plant, st.Plant) {
		if fs, err = forecastSetupOf(o, st, "scenario "+sc.Name, atDew, sc.Plant); err != nil {
			return nil, nil, err
		}
	}
	p := sc.Production
	fo := mbal.ForecastOptions{Plateau: p.PlateauRate, Uptime: p.Uptime, Minimum: p.MinimumRate, End: p.End, StepMonths: p.StepMonths}
	var model mbal.ReservoirModel
	balance := func(mbal.ReservoirState) float64 { return math.NaN() }
	switch sc.Kind {
	case study.ScenarioDepletion:
		_, dm, err := depletionModelOf(st, o.sys, fs)
		if err != nil {
			return nil, nil, err
		}
		model, balance = dm, dm.BalanceError
	case study.ScenarioCycling:
		co := mbal.CyclingOptions{ReturnFraction: sc.ReturnFraction, Sweep: sc.Sweep, Cells: sc.Cells, StopCGR: sc.StopCGR}
		if sc.CyclingYears > 0 {
			co.End = sc.Wells.Start.Add(time.Duration(sc.CyclingYears * 365.2425 * 24 * float64(time.Hour)))
		}
		cm, err := mbal.NewCyclingModel(st.Fluid, st.Z, fs.res, fs.tr, fs.proc, co, nil)
		if err != nil {
			return nil, nil, reservoirError(st, o.sys, "scenario "+sc.Name, err)
		}
		model, balance = cm, cm.BalanceError
		fo.Inject, fo.Substep, fo.Midpoint = sc.MakeupGas, maintainSubstep, true
	case study.ScenarioWater:
		wm, err := mbal.NewWaterModel(st.Fluid, st.Z, fs.res, fs.tr, fs.proc, mbal.WaterOptions{Voidage: sc.Voidage, Sgr: sc.Sgr, Sweep: sc.Sweep}, nil)
		if err != nil {
			return nil, nil, reservoirError(st, o.sys, "scenario "+sc.Name, err)
		}
		model, balance = wm, wm.BalanceError
		fo.Substep, fo.Midpoint = maintainSubstep, true
	}
	fc, err := mbal.RunForecast(model, wellsOf(sc.Wells), fo)
	if err != nil {
		return nil, nil, fmt.Errorf("scenario %s: the forecast: %w", sc.Name, err)
	}
	ip, err := mbal.InPlaceEOS(st.Fluid, st.Z, fs.res, fs.tr, nil)
	if err != nil {
		return nil, nil, err
	}
	r := &scenarioRun{sc: sc, fc: fc, ip: ip, minP: fs.res.Pi, salesInPlace: ip.SalesGas}
	if fs.sales != nil && fs.sales.perMole > 0 {
		r.salesInPlace = ip.Moles * fs.sales.perMole * fs.setupVsc()
	}
	for _, s := range fc.Steps {
		r.minP = math.Min(r.minP, s.State.P)
	}
	if wm, ok := model.(*mbal.WaterModel); ok {
		if r.trappedGas, r.trappedCondensate, err = wm.TrappedStreams(fc.Final); err != nil {
			return nil, nil, fmt.Errorf("scenario %s: the trapped gas through the separators: %w", sc.Name, err)
		}
	}
	r.balance = balance(fc.Final)
	for _, s := range fc.Steps { // the largest over all steps
		r.balance = math.Max(r.balance, balance(s.State))
	}
	if sc.Economics != nil {
		if r.cash, err = scenarioCash(st, sc, fc, fs); err != nil {
			return nil, nil, err
		}
	}
	return r, fs, nil
}

// scenarioCash is the cash flow of scenario sc's forecast fc: the study's
// economics as the scenario leaves them, its capital cost on the first
// day of production, and its compression or injection cost on each year's
// injected gas or water (bought gas at the gas price).
func scenarioCash(st *study.Study, sc study.Scenario, fc *mbal.Forecast, fs *forecastSetup) (*mbal.CashFlowResult, error) {
	var extra []mbal.Capex
	start := fc.FirstProduction
	switch {
	case sc.Kind == study.ScenarioCycling && sc.CompressionCapex > 0:
		extra = append(extra, mbal.Capex{Date: start, Amount: sc.CompressionCapex, What: "compression for cycling"})
	case sc.Kind == study.ScenarioWater && sc.InjectionCapex > 0:
		extra = append(extra, mbal.Capex{Date: start, Amount: sc.InjectionCapex, What: "water injection"})
	}
	e := sc.Economics
	gasPerVolume := e.GasPrice
	if e.GasPerEnergy {
		gasPerVolume = math.NaN()
		if fs.sales != nil && !math.IsNaN(fs.sales.hv) {
			gasPerVolume = e.GasPrice * fs.sales.hv / fs.setupVsc()
		}
	}
	other := func(y mbal.ForecastYear) float64 {
		v := y.Volumes
		// The plant treats the gas it returns as it treats the gas it
		// sells (economics.opex_gas); compression costs every m³ injected.
		cost := sc.CompressionCost*v.Injected + sc.InjectionCost*v.Water + e.OpexGas*v.Returned
		if sc.MakeupGas > 0 && !math.IsNaN(gasPerVolume) {
			bought := sc.MakeupGas * y.ProducingFraction * mbal.YearSeconds(y.Year)
			cost += gasPerVolume * bought // its compression is in v.Injected
		}
		return cost
	}
	return cashFlowFor(st.File, e, fc, fs.sales, extra, other)
}

// setupVsc is the ideal molar volume at the train's standard conditions.
func (fs *forecastSetup) setupVsc() float64 { return fs.tr.StandardConditions().IdealGasVolume() }

// maintainReport shows the scenarios side by side.
func maintainReport(st *study.Study, sys units.System, mr *maintainResult) *Report {
	pU := sys.Unit(units.Pressure)
	gU, lU := sys.Unit(units.GasVolume), sys.Unit(units.LiquidVolume)
	money := report.Format{Decimals: 0, MinDigits: 1}
	cur := mr.currency
	r := &Report{Name: "maintain", Section: "Pressure maintenance",
		Title: fmt.Sprintf("Pressure maintenance of %s: %s", fluidName(st), scenariosText(mr))}
	t := Table{Name: "scenarios", Title: "scenarios side by side (incremental values against depletion)",
		Columns: []Column{
			{Name: "name"}, {Name: "kind"},
			{Name: "npv", Label: "NPV", Symbol: cur, Format: money},
			{Name: "irr", Label: "IRR (fraction a year)", Format: report.Fixed(3)},
			{Name: "condensate_recovery", Unit: units.Percent, Format: report.Fixed(1)},
			{Name: "sales_gas_recovery", Unit: units.Percent, Format: report.Fixed(1)},
			{Name: "ultimate_sales_gas", Unit: gU},
			{Name: "ultimate_condensate", Unit: lU},
			{Name: "ultimate_ngl", Label: "Ultimate NGL", Unit: lU},
			{Name: "gas_injected", Unit: gU},
			{Name: "water_injected", Unit: lU},
			{Name: "trapped_gas", Label: "Wet gas trapped behind the water", Unit: gU},
			{Name: "trapped_condensate", Label: "Condensate trapped behind the water", Unit: lU},
			{Name: "stop_date", Label: "End of production"},
			{Name: "min_pressure", Label: "Lowest pressure", Unit: pU},
			{Name: "mass_balance_error", Label: "Component balance error", Format: report.Format{Scientific: true}, Verbose: true},
			{Name: "incremental_condensate", Unit: lU},
			{Name: "incremental_sales_gas", Unit: gU},
			{Name: "incremental_npv", Label: "Incremental NPV", Symbol: cur, Format: money},
			{Name: "incremental_irr", Label: "IRR of the incremental investment (fraction a year)", Format: report.Fixed(3)},
		}}
	var base *scenarioRun
	if mr.base >= 0 {
		base = &mr.runs[mr.base]
	}
	best := -1
	for i, run := range mr.runs {
		fin := run.fc.Final.Cum
		row := []any{run.sc.Name, run.sc.Kind, nil, nil,
			units.Percent.FromSI(fin.Condensate / run.ip.Condensate), units.Percent.FromSI(fin.SalesGas / run.salesInPlace),
			gU.FromSI(fin.SalesGas), lU.FromSI(fin.Condensate), lU.FromSI(fin.NGL), gU.FromSI(fin.Injected), lU.FromSI(fin.Water),
			gU.FromSI(run.trappedGas), lU.FromSI(run.trappedCondensate),
			run.fc.StopDate.Format(time.DateOnly), pU.FromSI(run.minP), run.balance, nil, nil, nil, nil}
		if run.cash != nil {
			row[2] = run.cash.NPV
			if irr, ok := rateOfReturn(run.cash, run.sc.Economics); ok {
				row[3] = irr
			}
			if best < 0 || run.cash.NPV > mr.runs[best].cash.NPV {
				best = i
			}
		}
		if base != nil && i != mr.base {
			b := base.fc.Final.Cum
			row[16], row[17] = lU.FromSI(fin.Condensate-b.Condensate), gU.FromSI(fin.SalesGas-b.SalesGas)
			if run.cash != nil && base.cash != nil {
				row[18] = run.cash.NPV - base.cash.NPV
				if irr, ok := incrementalIRR(run.cash, base.cash, run.sc.Economics); ok {
					row[19] = irr
				}
			}
		}
		t.Rows = append(t.Rows, row)
	}
	r.Tables = append(r.Tables, t)
	for i, row := range t.Rows {
		if i != mr.base && base != nil && row[18] != nil && row[19] == nil {
			r.Note(fmt.Sprintf("%s has no IRR of its incremental investment: its cash flow less depletion's does not turn from investment to return (it begins positive, or changes sign more than once)", mr.runs[i].sc.Name))
		}
	}
	switch {
	case best >= 0 && base != nil && base.cash != nil:
		w := mr.runs[best]
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: "verdict"}, Value: verdictText(w, base, cur)},
			Field{Column: Column{Name: "best_scenario", Label: "Scenario of the highest NPV"}, Value: w.sc.Name},
			Field{Column: Column{Name: "npv_gain", Label: "Its NPV over depletion", Symbol: cur, Format: money}, Value: w.cash.NPV - base.cash.NPV},
			Field{Column: Column{Name: "currency"}, Value: cur})
	case base == nil:
		r.Note("the study has no depletion scenario: the incremental values and the verdict need one, such as [[scenario]] name = \"depletion\", kind = \"depletion\"")
	default:
		r.Note("the study has no [economics]: the scenarios are compared on volumes only")
	}
	for _, run := range mr.runs {
		r.Tables = append(r.Tables, scenarioYears(sys, run))
	}
	if len(mr.sens) > 0 {
		s := Table{Name: "sensitivity", Title: fmt.Sprintf("incremental NPV against depletion with each input %s %% lower and higher", report.Sig(100*mr.change, 3)),
			Columns: []Column{{Name: "scenario"}, {Name: "input"},
				{Name: "incremental_npv_low", Label: "Input lower", Symbol: cur, Format: money},
				{Name: "incremental_npv", Label: "As given", Symbol: cur, Format: money},
				{Name: "incremental_npv_high", Label: "Input higher", Symbol: cur, Format: money},
				{Name: "swing", Symbol: cur, Format: money}}}
		for _, row := range mr.sens {
			s.Rows = append(s.Rows, []any{row.scenario, row.input, row.low, row.base, row.high, math.Abs(row.high - row.low)})
		}
		r.Tables = append(r.Tables, s)
	}
	r.Figures = maintainFigures(sys, mr)
	r.Note("the scenarios with cells (gas cycling, water injection) are integrated in monthly steps; each withdrawal flashes every cell at the common pressure")
	r.Note("injecting gas at high pressure, or cycling it, follows the local codes for pressure equipment and operations; the economics are screening estimates at constant prices and costs")
	return r
}

// scenariosText counts the scenarios, against depletion when there is one.
func scenariosText(mr *maintainResult) string {
	n := len(mr.runs)
	if mr.base < 0 {
		if n == 1 {
			return "1 scenario"
		}
		return fmt.Sprintf("%d scenarios", n)
	}
	if n == 2 {
		return "1 scenario against depletion"
	}
	return fmt.Sprintf("%d scenarios against depletion", n-1)
}

// verdictText says which scenario pays best and by how much.
func verdictText(w scenarioRun, base *scenarioRun, cur string) string {
	gain := w.cash.NPV - base.cash.NPV
	if w.sc.Name == base.sc.Name || gain <= 0 {
		return fmt.Sprintf("depletion (%s) has the highest NPV: no pressure maintenance pays", base.sc.Name)
	}
	return fmt.Sprintf("%s pays best: its NPV beats depletion's by %s %s", w.sc.Name, report.Sig(gain/1e6, 4)+" million", cur)
}

// incrementalIRR is the IRR of the scenario's cash flow minus depletion's,
// year by year.
func incrementalIRR(a, b *mbal.CashFlowResult, e *study.Economics) (float64, bool) {
	net := map[int]float64{}
	years := map[int]bool{}
	for _, y := range a.Years {
		net[y.Year] += y.Net
		years[y.Year] = true
	}
	for _, y := range b.Years {
		net[y.Year] -= y.Net
		years[y.Year] = true
	}
	var ys []int
	for y := range years {
		ys = append(ys, y)
	}
	sort.Ints(ys)
	var flow []float64
	for y := ys[0]; y <= ys[len(ys)-1]; y++ {
		flow = append(flow, net[y])
	}
	return turningRate(flow, e)
}

// nameStem is a name as part of a file or key name: lower case, with sep
// for anything but letters and digits.
func nameStem(name string, sep rune) string {
	return strings.Map(func(r rune) rune {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			return r
		case r >= 'A' && r <= 'Z':
			return r + 'a' - 'A'
		}
		return sep
	}, name)
}

// scenarioYears is a scenario's forecast per calendar year.
func scenarioYears(sys units.System, run scenarioRun) Table {
	pU := sys.Unit(units.Pressure)
	gU, lU := sys.Unit(units.GasVolume), sys.Unit(units.LiquidVolume)
	name := nameStem(run.sc.Name, '_')
	t := Table{Name: "years_" + name, Title: fmt.Sprintf("scenario %s per calendar year", run.sc.Name),
		Columns: []Column{{Name: "year"}, {Name: "wells"}, {Name: "pressure", Unit: pU},
			{Name: "wet_gas", Unit: gU}, {Name: "sales_gas", Unit: gU}, {Name: "condensate", Unit: lU}, {Name: "ngl", Label: "NGL", Unit: lU},
			{Name: "gas_injected", Unit: gU}, {Name: "water_injected", Unit: lU},
			{Name: "cum_sales_gas", Unit: gU}, {Name: "cum_condensate", Unit: lU}, {Name: "cum_gas_injected", Unit: gU}, {Name: "cum_water_injected", Unit: lU},
			{Name: "net_cash_flow", Format: report.Format{Decimals: 0, MinDigits: 1}}}}
	var cum mbal.Streams
	net := map[int]float64{}
	if run.cash != nil {
		for _, y := range run.cash.Years {
			net[y.Year] = y.Net
		}
	}
	for _, y := range run.fc.Years {
		v := y.Volumes
		var n any
		if run.cash != nil {
			n = net[y.Year]
		}
		cum.SalesGas, cum.Condensate, cum.Injected, cum.Water = cum.SalesGas+v.SalesGas, cum.Condensate+v.Condensate, cum.Injected+v.Injected, cum.Water+v.Water
		t.Rows = append(t.Rows, []any{y.Year, y.Wells, pU.FromSI(y.End.P), gU.FromSI(v.WetGas), gU.FromSI(v.SalesGas), lU.FromSI(v.Condensate), lU.FromSI(v.NGL),
			gU.FromSI(v.Injected), lU.FromSI(v.Water), gU.FromSI(cum.SalesGas), lU.FromSI(cum.Condensate), gU.FromSI(cum.Injected), lU.FromSI(cum.Water), n})
	}
	return t
}

// maintainFigures: condensate rate and cumulative, pressure and producing
// CGR against time per scenario, the NPV of each and the sensitivity.
func maintainFigures(sys units.System, mr *maintainResult) []*report.Figure {
	pU, lrU := sys.Unit(units.Pressure), sys.Unit(units.LiquidRate)
	lU := sys.Unit(units.LiquidVolume)
	cgrU := surfaceUnitsOf(sys).cgr
	tAxis := report.Axis{Label: "Year"}
	var maxCum float64
	for _, run := range mr.runs {
		maxCum = math.Max(maxCum, lU.FromSI(run.fc.Final.Cum.Condensate))
	}
	lFig, lF := report.FigureUnit(lU, maxCum)
	rate := &report.Figure{Name: "maintain-condensate-rate", Title: "Condensate rate by scenario", Caption: "Stock-tank condensate rate of each scenario, yearly averages.",
		X: tAxis, Y: report.Axis{Label: "Condensate rate", Unit: lrU}}
	cum := &report.Figure{Name: "maintain-condensate-cumulative", Title: "Cumulative condensate by scenario", Caption: "Cumulative stock-tank condensate of each scenario.",
		X: tAxis, Y: report.Axis{Label: "Cumulative condensate", Unit: lFig}}
	pres := &report.Figure{Name: "maintain-pressure", Title: "Reservoir pressure by scenario", Caption: "Average reservoir pressure of each scenario, with the dew point.",
		X: tAxis, Y: report.Axis{Label: "Pressure", Unit: pU}}
	cgr := &report.Figure{Name: "maintain-cgr", Title: "Producing CGR by scenario", Caption: "Condensate over separator gas of the stream produced, yearly: the breakthrough of the lean cycled gas shows as its fall.",
		X: tAxis, Y: report.Axis{Label: "CGR", Unit: cgrU.Unit}}
	for _, run := range mr.runs {
		r := report.Series{Label: run.sc.Name, Style: report.LinePoints}
		c := report.Series{Label: run.sc.Name, Style: report.Line}
		p := report.Series{Label: run.sc.Name, Style: report.Line}
		g := report.Series{Label: run.sc.Name, Style: report.LinePoints}
		start := decimalYear(run.fc.Steps[0].Start)
		c.X, c.Y = []float64{start}, []float64{0}
		p.X, p.Y = []float64{start}, []float64{pU.FromSI(mr.setup.res.Pi)}
		var acc float64
		for _, y := range run.fc.Years {
			sec := mbal.YearSeconds(y.Year) * y.ProducingFraction
			mid := float64(y.Year) + 0.5
			if sec > 0 {
				r.X, r.Y = append(r.X, mid), append(r.Y, lrU.FromSI(y.Volumes.Condensate/sec))
			}
			if y.Volumes.SeparatorGas > 0 {
				g.X, g.Y = append(g.X, mid), append(g.Y, y.Volumes.Condensate/y.Volumes.SeparatorGas*cgrU.perSI)
			}
			acc += y.Volumes.Condensate
			c.X, c.Y = append(c.X, float64(y.Year+1)), append(c.Y, lU.FromSI(acc)*lF)
			p.X, p.Y = append(p.X, float64(y.Year+1)), append(p.Y, pU.FromSI(y.End.P))
		}
		rate.Series, cum.Series, pres.Series, cgr.Series = append(rate.Series, r), append(cum.Series, c), append(pres.Series, p), append(cgr.Series, g)
	}
	if mr.dew > 0 {
		pres.Lines = []report.RefLine{{Label: "Dew point", Value: pU.FromSI(mr.dew)}}
	}
	out := []*report.Figure{rate, cum, pres, cgr}
	if mr.currency != "" && !mr.noEconomy {
		npv := &report.Figure{Name: "maintain-npv", Title: "NPV by scenario", Caption: "Net present value of each scenario; the labels name them.",
			X: report.Axis{Label: "Scenario", Min: 0.3, Max: float64(len(mr.runs)) + 0.7}, Y: report.Axis{Label: "NPV [10^6 " + mr.currency + "]"}}
		bars := report.Series{Label: "NPV", Style: report.Bars}
		for i, run := range mr.runs {
			bars.X, bars.Y = append(bars.X, float64(i+1)), append(bars.Y, run.cash.NPV/1e6)
			npv.Marks = append(npv.Marks, report.Mark{Label: run.sc.Name, X: float64(i + 1), Y: run.cash.NPV / 1e6})
		}
		npv.Series = []report.Series{bars}
		npv.Lines = []report.RefLine{{Value: 0}}
		out = append(out, npv)
	}
	// A tornado per scenario: the span of its gain over depletion as each
	// input moves, widest first, about the gain as given.
	var order []string
	by := map[string][]sensitivityRow{}
	for _, row := range mr.sens {
		if by[row.scenario] == nil {
			order = append(order, row.scenario)
		}
		by[row.scenario] = append(by[row.scenario], row)
	}
	for _, name := range order {
		rows := by[name]
		sort.SliceStable(rows, func(i, j int) bool { return math.Abs(rows[i].high-rows[i].low) > math.Abs(rows[j].high-rows[j].low) })
		tor := &report.Figure{Name: "maintain-sensitivity-" + strings.Trim(nameStem(name, '-'), "-"), Title: "Sensitivity of the gain of " + name,
			Caption: fmt.Sprintf("Incremental NPV of %s over depletion as each input goes from %s %% lower to %s %% higher (widest first); the dotted line is the gain as given.",
				name, report.Sig(100*mr.change, 3), report.Sig(100*mr.change, 3)),
			X: report.Axis{Label: "Input (labelled)", Min: 0.3, Max: float64(len(rows)) + 0.7}, Y: report.Axis{Label: "Incremental NPV [10^6 " + mr.currency + "]"}}
		span := report.Series{Label: "Input lower to higher", Style: report.Ranges}
		for i, row := range rows {
			x := float64(i + 1)
			span.X, span.Y = append(span.X, x, x), append(span.Y, row.low/1e6, row.high/1e6)
			tor.Marks = append(tor.Marks, report.Mark{Label: row.input, X: x, Y: math.Max(row.low, row.high) / 1e6})
		}
		tor.Series = []report.Series{span}
		tor.Lines = []report.RefLine{{Label: "as given", Value: rows[0].base / 1e6}}
		out = append(out, tor)
	}
	return out
}
