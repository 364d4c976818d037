package main

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/mbal"
)

// Flags of history.
const flagConfidence = "confidence"

func historyCommand() *cli.Command {
	return studyCommand("history",
		"original wet gas in place from the [[history]] table: the two-phase p/z straight line in its Havlena–Odeh form, with its confidence interval and a test for water influx, against the volumetric figure",
		[]cli.Flag{
			&cli.Float64Flag{Name: flagConfidence, Value: mbal.DefaultConfidence, Usage: "two-sided confidence `LEVEL` of the interval on the gas in place and of the influx tests, between 0 and 1"},
			startAtDewPointFlag(),
			plotFlag(),
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			conf := c.Float64(flagConfidence)
			if !(conf > 0 && conf < 1) {
				return cli.Exit(fmt.Sprintf("--%s: %g, want a level between 0 and 1, such as 0.95", flagConfidence, conf), exitUsage)
			}
			h, err := historyRunAt(o, st, conf, c.Bool(flagStartAtDew))
			if err != nil {
				return err
			}
			return o.emitPlots(c, historyReportOf(st, o.sys, h))
		})
}

// historyResult is the material balance on a study's production history.
type historyResult struct {
	res      mbal.Reservoir
	tr       cvd.Train
	rec      *mbal.Recovery // the simulated depletion that gives Z₂
	rows     []study.HistoryRow
	first    int       // index in rows of the first point fitted (1 when rows[0] is the initial state)
	ge       float64   // gas equivalent of the initial fluid's condensate, standard m³ per m³
	geAt     []float64 // that of the condensate produced down to each point
	zi       float64
	points   []mbal.HistoryPoint
	ho       *havlenaOdeh
	plain    *mbal.PZFit // the p/z line without rock and water expansion
	vol      mbal.VolumetricComparison
	dewPoint float64 // Pa
	bwFrom   string  // where the water formation volume factor came from
	started  bool    // the reservoir was started at the model's dew point
}

// havlenaOdeh is the Havlena–Odeh analysis with its influx verdict in words.
type havlenaOdeh struct {
	*mbal.HavlenaOdehResult
	Reason string // influxReason of the verdict
}

// historyRun puts the study's [[history]] on a wet-gas basis
// (mbal.HistoryPoints: the sales gas plus the condensate's gas equivalent,
// Z₂ from a simulated depletion of the reservoir) and fits it.
//
// The water produced counts at its formation volume factor B_w:
// reservoir.water_formation_volume_factor when given, otherwise McCain's
// (1990) correlation at the reservoir temperature and each point's
// pressure, with a warning beyond the correlation's data when water is
// produced there.
func historyRun(o *options, st *study.Study, conf float64) (*historyResult, error) {
	return historyRunAt(o, st, conf, false)
}

// historyRunAt is historyRun, starting the reservoir at the model's dew
// point when atDew is set and that lies above the initial pressure.
func historyRunAt(o *options, st *study.Study, conf float64, atDew bool) (*historyResult, error) {
	if len(st.History) == 0 {
		return nil, cli.Exit(fmt.Sprintf("%s has no [[history]] table: history needs rows of date or step, pressure, sales_gas, condensate and optionally water", st.File), exitUsage)
	}
	res, err := reservoirOf(o, st, "history", false)
	if err != nil {
		return nil, err
	}
	started, err := startAtDewPoint(o, st, &res, "history", atDew)
	if err != nil {
		return nil, err
	}
	h := &historyResult{res: res, tr: trainOf(st, o.sys), rows: st.History, started: started}
	if !st.History[0].Production() {
		h.first = 1
		p0 := st.History[0].Pressure
		if math.Abs(p0-res.Pi) > 0.005*res.Pi {
			o.warn(fmt.Sprintf("%s: history[1] records no production at %s, but reservoir.initial_pressure is %s; the material balance starts from reservoir.initial_pressure",
				st.File, pressureNote(o.sys, p0), pressureNote(o.sys, res.Pi)))
		}
	}
	fitted := st.History[h.first:]
	if len(fitted) < mbal.MinHistoryPoints {
		return nil, cli.Exit(fmt.Sprintf("%s: [[history]] has %d rows with production; the straight-line fit needs at least %d",
			st.File, len(fitted), mbal.MinHistoryPoints), exitUsage)
	}
	records := make([]mbal.ProductionRecord, len(fitted))
	for i, row := range fitted {
		records[i] = mbal.ProductionRecord{P: row.Pressure, SalesGas: row.SalesGas, Condensate: row.Condensate, Water: row.Water}
	}
	wg, err := mbal.HistoryPoints(st.Fluid, st.Z, res, h.tr, records, &mbal.HistoryOptions{Bw: st.Reservoir.WaterFVF})
	var he *mbal.HistoryError
	switch {
	case errors.As(err, &he):
		return nil, historyError(st, h.first, err)
	case errors.Is(err, mbal.ErrNoStockTankOil):
		return nil, cli.Exit(fmt.Sprintf("%s: the separator train makes no stock-tank oil from the fluid, so the condensate of [[history]] has no gas equivalent", st.File), exitUsage)
	case err != nil:
		return nil, reservoirError(st, o.sys, "the simulated depletion that gives the two-phase Z", err)
	}
	h.rec, h.dewPoint, h.ge, h.geAt, h.zi, h.points = wg.Recovery, wg.DewPoint, wg.InitialGasEquivalent, wg.GasEquivalent, wg.Zi, wg.Points
	ip := h.rec.InPlace
	h.bwFrom = "reservoir.water_formation_volume_factor"
	if wg.BwCorrelated {
		h.bwFrom = "McCain (1990) correlation at each pressure"
	}
	if wg.BwExtrapolated {
		o.warn(fmt.Sprintf("%s: the water formation volume factor comes from McCain's (1990) correlation beyond its data (up to 260 degF and 5000 psia); give reservoir.water_formation_volume_factor if it is known", st.File))
	}
	std := h.tr.Standard
	par := mbal.HavlenaOdehParams{T: res.T, Sw: res.Sw, Cw: res.Cw, Cf: res.Cf, Std: std}
	popt := &mbal.PZOptions{Confidence: conf}
	ho, err := mbal.HavlenaOdeh(h.points, res.Pi, h.zi, par, popt)
	if err != nil {
		return nil, historyError(st, h.first, err)
	}
	h.ho = &havlenaOdeh{ho, influxReason(ho.Influx)}
	if h.plain, err = mbal.FitPZ(h.points, res.Pi, h.zi, popt); err != nil {
		return nil, historyError(st, h.first, err)
	}
	if h.vol, err = h.ho.Line.CompareVolumetric(ip.WetGas); err != nil {
		return nil, fmt.Errorf("history: %w", err)
	}
	return h, nil
}

// influxReason puts the verdict of the two influx tests into words.
func influxReason(v mbal.InfluxVerdict) string {
	var b strings.Builder
	dir := func(pos bool, up, down string) string {
		if pos {
			return up
		}
		return down
	}
	pct := func(f float64) string { return report.Sig(100*math.Abs(f), 2) + " %" }
	material := report.Sig(100*v.Materiality, 2) + " %"
	tr, cu := v.Trend, v.Curvature
	if tr.Significant {
		fmt.Fprintf(&b, "F/(Eg+Efw) %s with production (slope %s, %s, significant at %s) by %s of the gas in place over the history",
			dir(tr.Rising(), "rises", "falls"), report.Sig(tr.Estimate, 3), report.PValue(tr.P), report.Sig(v.Alpha, 2), pct(tr.Change))
		if !tr.Material {
			fmt.Fprintf(&b, ", below the %s taken as material", material)
		}
	} else {
		fmt.Fprintf(&b, "F/(Eg+Efw) shows no significant trend (%s)", report.PValue(tr.P))
	}
	if cu.Significant {
		fmt.Fprintf(&b, "; the corrected p/Z line %s (curvature %s, significant at %s) by %s of p/Z at mid-history",
			dir(cu.Rising(), "flattens", "steepens"), report.PValue(cu.P), report.Sig(v.Alpha, 2), pct(cu.Change))
		if !cu.Material {
			fmt.Fprintf(&b, ", below the %s taken as material", material)
		}
	} else {
		fmt.Fprintf(&b, "; the corrected p/Z line is straight (curvature %s)", report.PValue(cu.P))
	}
	switch v.Outcome {
	case mbal.NoInflux:
		b.WriteString(": consistent with a volumetric reservoir")
	case mbal.ConflictingTests:
		b.WriteString(": the two tests disagree in direction; the history is not volumetric, check the data and Z₂")
	case mbal.GrowingInflux:
		b.WriteString(": water influx growing with time, as from an active aquifer")
	default:
		b.WriteString(": pressure support that fades as pressure falls, as from a small (pot) aquifer, or rock and water expansion larger than Cw and Cf give")
	}
	return b.String()
}

// historyError names the [[history]] row of a *mbal.HistoryError; a fit
// whose p/z does not fall is a computation that failed.
func historyError(st *study.Study, first int, err error) error {
	var he *mbal.HistoryError
	if !errors.As(err, &he) {
		return fmt.Errorf("history: %w", err)
	}
	if errors.Is(err, mbal.ErrPZNotFalling) {
		return fmt.Errorf("%s: [[history]]: %s", st.File, he.Why)
	}
	where := "[[history]]"
	if he.Index >= 0 {
		key := map[string]string{"P": "pressure", "Z2": "pressure", "CumWetGas": "sales_gas", "CumWater": "water",
			"SalesGas": "sales_gas", "Condensate": "condensate", "Water": "water"}[he.Field]
		if key == "" {
			key = "pressure"
		}
		where = fmt.Sprintf("history[%d].%s", he.Index+first+1, key)
	}
	return cli.Exit(fmt.Sprintf("%s: %s: %s", st.File, where, he.Why), exitUsage)
}

// historyReportOf shows the history material balance in sys.
// withReason adds the influx test in words, a long line that the table for
// people leaves to standard error.
func historyReportOf(st *study.Study, sys units.System, h *historyResult) *Report {
	u := inPlaceUnitsOf(sys)
	su := surfaceUnitsOf(sys)
	pU, cU := u.press, sys.Unit(units.Compressibility)
	line := h.ho.Line
	ip := h.rec.InPlace
	// The gas in place, its interval and the volumetric figure to as many
	// digits as tell the interval's ends apart, and small departures with
	// their own digits.
	interval := report.Format{Scaled: true, Digits: max(4, 2+int(math.Ceil(math.Log10(math.Abs(line.G)/math.Max(line.GSE, 1e-300)))))}
	small := report.Format{Decimals: 3, MinDigits: 2, MaxDecimals: 6}
	r := &Report{
		Name:    "history",
		Section: "Production history: material balance",
		Title:   "production history of " + fluidName(st) + ": two-phase p/z material balance (Havlena–Odeh form)",
		Fields: []Field{
			{Column: Column{Name: "points_fitted"}, Value: len(h.points)},
			{Column: Column{Name: "initial_pressure", Unit: pU}, Value: pU.FromSI(h.res.Pi)},
			{Column: Column{Name: "z_initial", Format: report.ZFactor}, Value: h.zi},
			{Column: Column{Name: "p_over_z_initial", Unit: pU}, Value: pU.FromSI(h.res.Pi / h.zi)},
			{Column: Column{Name: "dew_pressure", Unit: pU}, Value: pU.FromSI(h.dewPoint)},
			{Column: Column{Name: "initial_condensate_gas_equivalent", Unit: su.gor.Unit}, Value: su.gor.of(h.ge)},
			{Column: Column{Name: "effective_compressibility", Unit: cU}, Value: cU.FromSI(h.ho.Ce)},
			{Column: Column{Name: "confidence", Label: "Confidence level", Format: report.Fixed(2)}, Value: line.Confidence},
			{Column: Column{Name: "wet_gas_in_place", Unit: u.gas, Format: interval}, Value: u.gas.FromSI(line.G)},
			{Column: Column{Name: "wet_gas_in_place_low", Label: "Wet gas in place, low end of the interval", Unit: u.gas, Format: interval}, Value: u.gas.FromSI(line.GLow)},
			{Column: Column{Name: "wet_gas_in_place_high", Label: "Wet gas in place, high end of the interval", Unit: u.gas, Format: interval}, Value: u.gas.FromSI(line.GHigh)},
			{Column: Column{Name: "wet_gas_in_place_standard_error", Unit: u.gas}, Value: u.gas.FromSI(line.GSE)},
			{Column: Column{Name: "r_squared", Format: report.Fixed(5)}, Value: line.R2},
			{Column: Column{Name: "p_over_z_residual_standard_error", Unit: pU}, Value: pU.FromSI(line.ResidualSE)},
			{Column: Column{Name: "uncorrected_p_over_z_wet_gas_in_place", Unit: u.gas}, Value: u.gas.FromSI(h.plain.G)},
			{Column: Column{Name: "volumetric_wet_gas_in_place", Unit: u.gas, Format: interval}, Value: u.gas.FromSI(ip.WetGas)},
			{Column: Column{Name: "difference_from_volumetric", Unit: u.gas}, Value: u.gas.FromSI(h.vol.Difference)},
			{Column: Column{Name: "difference_from_volumetric", Label: "Difference from volumetric, share", Unit: units.Percent}, Value: 100 * (h.vol.Ratio - 1)},
			{Column: Column{Name: "volumetric_inside_interval", Label: "Volumetric figure inside the interval"}, Value: h.vol.Inside},
			{Column: Column{Name: "f_over_expansion_trend", Label: "F/(Eg+Efw) slope against cumulative wet gas", Format: report.Format{Decimals: 4, MinDigits: 2, MaxDecimals: 8}}, Value: h.ho.TrendSlope},
			{Column: Column{Name: "f_over_expansion_trend_p_value", Label: "F/(Eg+Efw) trend, p-value", Format: report.Statistic}, Value: h.ho.TrendP},
			{Column: Column{Name: "f_over_expansion_change", Label: "F/(Eg+Efw) change over the history", Unit: units.Percent, Format: small}, Value: 100 * h.ho.TrendChange},
			{Column: Column{Name: "curvature_p_value", Label: "Curvature of the p/Z line, p-value", Format: report.Statistic}, Value: line.CurvatureP},
			{Column: Column{Name: "curvature_departure", Label: "Curvature departure from the line", Unit: units.Percent, Format: small}, Value: 100 * h.ho.CurvatureChange},
			{Column: Column{Name: "water_influx_suspected"}, Value: h.ho.WaterInfluxSuspected},
			{Column: Column{Name: "water_formation_volume_factor_source"}, Value: h.bwFrom},
			{Column: Column{Name: "started_at_model_dew_point"}, Value: h.started},
		},
	}
	r.Fields = append(r.Fields, Field{Column: Column{Name: "influx_test"}, Value: h.ho.Reason})
	if h.ho.WaterInfluxSuspected { // the summary's influx_test says it otherwise
		r.Warn("water influx suspected: " + h.ho.Reason)
	}
	labelName := "row"
	if len(h.rows) > 0 {
		switch {
		case !h.rows[0].Date.IsZero():
			labelName = "date"
		case h.rows[0].Step != 0 || h.rows[len(h.rows)-1].Step != 0:
			labelName = "step"
		}
	}
	pts := Table{
		Name:  "points",
		Title: "history points: wet gas = sales gas + condensate × gas equivalent; F/(Eg+Efw) is the gas in place each point implies without influx",
		Columns: []Column{
			{Name: labelName},
			{Name: "pressure", Unit: pU},
			{Name: "cum_sales_gas", Unit: u.gas},
			{Name: "cum_condensate", Unit: u.liquid},
			{Name: "cum_water", Unit: u.liquid},
			{Name: "water_formation_volume_factor", Label: "Bw", Format: report.Fixed(4)},
			{Name: "condensate_gas_equivalent", Unit: su.gor.Unit},
			{Name: "cum_wet_gas", Unit: u.gas},
			{Name: "z_two_phase", Format: report.ZFactor},
			{Name: "p_over_z", Unit: pU},
			{Name: "corrected_p_over_z", Unit: pU},
			{Name: "fitted_p_over_z", Unit: pU},
			{Name: "f_over_expansion", Unit: u.gas},
		},
	}
	for i, pt := range h.points {
		row := h.rows[i+h.first]
		hp := h.ho.Points[i]
		pts.Rows = append(pts.Rows, []any{
			row.Label,
			pU.FromSI(pt.P),
			u.gas.FromSI(row.SalesGas), u.liquid.FromSI(row.Condensate), u.liquid.FromSI(row.Water), hp.Bw,
			su.gor.of(h.geAt[i]),
			u.gas.FromSI(pt.CumWetGas),
			pt.Z2,
			pU.FromSI(pt.P / pt.Z2),
			pU.FromSI(hp.CorrectedPZ),
			pU.FromSI(line.PZAt(hp.Abscissa)),
			u.gas.FromSI(hp.FOverE),
		})
	}
	r.Tables = []Table{pts}
	r.Figures = []*report.Figure{pzFigure(h, u.gas, pU)}
	return r
}

// pzFigure draws p/Z against cumulative wet gas: the history's points as
// measured, the same corrected for the rock and water expansion (at the
// wet gas plus the produced water's reservoir volume as gas, the abscissa
// of the fit), and the fitted line down to p/Z = 0 at the gas in place.
func pzFigure(h *historyResult, gasU, pU units.Unit) *report.Figure {
	f := &report.Figure{
		Name:  "history-p-over-z",
		Title: "Material balance: p/Z against cumulative wet gas",
		Caption: "Two-phase p/Z of each history point against the cumulative wet gas produced, as measured and corrected for rock and water expansion " +
			"(where water is produced, its reservoir volume counts as gas), with the fitted straight line; it reaches p/Z = 0 at the original wet gas in place.",
		X: report.Axis{Label: "Cumulative wet gas", Unit: gasU},
		Y: report.Axis{Label: "p/Z", Unit: pU},
	}
	// The axis in the multiple the tables use (Bscf rather than MMscf).
	gasU, _ = report.FigureUnit(gasU, gasU.FromSI(h.ho.Line.G))
	f.X.Unit = gasU
	measured := report.Series{Label: "p/Z", Style: report.Points}
	corrected := report.Series{Label: "p/Z, corrected", Style: report.Points}
	for i, pt := range h.points {
		hp := h.ho.Points[i]
		x := pt.CumWetGas + pt.CumWater*hp.Bw/hp.Bg // G_p + W_p B_w/B_g
		measured.X, measured.Y = append(measured.X, gasU.FromSI(pt.CumWetGas)), append(measured.Y, pU.FromSI(pt.P/pt.Z2))
		corrected.X = append(corrected.X, gasU.FromSI(x))
		corrected.Y = append(corrected.Y, pU.FromSI(pt.P/pt.Z2*(1-h.ho.Ce*(h.res.Pi-pt.P))))
	}
	line := h.ho.Line
	fit := report.Series{Label: "Fitted line", Style: report.Dashed,
		X: []float64{0, gasU.FromSI(line.G)}, Y: []float64{pU.FromSI(line.PZAt(0)), 0}}
	f.Series = []report.Series{measured, corrected, fit}
	f.Marks = []report.Mark{{Label: "Wet gas in place", X: gasU.FromSI(line.G), Y: 0}}
	return f
}
