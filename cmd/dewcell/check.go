package main

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
)

func checkCommand() *cli.Command {
	return studyCommand("check",
		"quality check of the laboratory's constant-volume depletion ([lab] cvd) before tuning to it: the material balance of every step "+
			"(liquid compositions and K-values), the Hoffman plot, the liquid density, the two-phase Z and the final liquid, with a verdict per step",
		[]cli.Flag{plotFlag()},
		func(c *cli.Context, o *options, st *study.Study) error {
			lab, err := labOf(st)
			if err != nil {
				return err
			}
			res, err := checkLab(st, lab)
			if err != nil {
				return err
			}
			return o.emitPlots(c, checkReport(st, o.sys, lab, res))
		})
}

// checkLab runs the quality check of the study's laboratory CVD. When the
// report gives no Z-factor at the saturation pressure, the cell volume
// takes the model's, single phase at the laboratory's saturation pressure.
func checkLab(st *study.Study, lab cvd.LabReport) (*cvd.CheckResult, error) {
	if lab.CVD == nil {
		return nil, cli.Exit(fmt.Sprintf("%s: [lab] gives no cvd table: the check balances the constant-volume depletion; add cvd = \"lab/cvd.csv\" with its pressure, liquid_dropout, produced, z_gas and gas_<component> columns", st.File), exitUsage)
	}
	opt := &cvd.CheckOptions{}
	if pp, _ := st.Fluid.Props(lab.T, lab.SaturationP, st.Z); pp.Z > 0 {
		opt.DewZ = pp.Z
	}
	res, err := cvd.Check(lab, st.Fluid.Components(), st.Z, opt)
	if err != nil {
		var re *cvd.ReportError
		if errors.As(err, &re) {
			return nil, cli.Exit(fmt.Sprintf("%s: [lab] cvd = %s: %s", st.File, st.Lab.CVD, checkErrorText(re)), exitUsage)
		}
		return nil, fmt.Errorf("checking the laboratory CVD %s: %w", st.Lab.CVD, err)
	}
	return res, nil
}

// checkErrorText says in the laboratory table's terms what the check
// found it cannot evaluate.
func checkErrorText(re *cvd.ReportError) string {
	f := re.Field
	switch {
	case f == "CVD.Gas" && strings.HasPrefix(re.Msg, "is empty"):
		return "the table has no gas_<component> columns: the material balance needs the composition of the gas produced at every step"
	case f == "CVD.Gas" && strings.HasPrefix(re.Msg, "leaves out the model components "):
		names := strings.SplitN(strings.TrimPrefix(re.Msg, "leaves out the model components "), ":", 2)[0]
		var cols []string
		for _, n := range strings.Split(names, ", ") {
			cols = append(cols, "gas_"+n)
		}
		return fmt.Sprintf("its gas_<component> columns leave out %s of the study: the material balance needs the produced gas's every component; add the column %s", names, strings.Join(cols, ", "))
	case strings.HasPrefix(f, "CVD.Gas"):
		return "its gas_<component> columns " + plural(re.Msg)
	case strings.HasPrefix(f, "CVD.Liquid"):
		return "its liquid_<component> columns " + plural(re.Msg)
	case f == "CVD.Points":
		return "its rows " + re.Msg
	case f == "CVD":
		return "the table " + strings.Replace(re.Msg, "; give CheckOptions.DewZ", "; add z_gas or z_two_phase to the row at the saturation pressure", 1)
	}
	name := f
	if i := strings.LastIndex(f, "."); i >= 0 {
		name = f[i+1:]
	}
	col := map[string]string{"P": "pressure", "Dropout": "liquid_dropout", "Produced": "produced", "ZGas": "z_gas",
		"ZTwoPhase": "z_two_phase", "Gas": "gas_<component>", "Liquid": "liquid_<component>"}
	for k, v := range col {
		if name == k || strings.HasPrefix(name, k+"[") {
			row := ""
			if i := strings.Index(f, "["); i >= 0 && strings.HasPrefix(f, "CVD.Points[") {
				var n int
				if _, err := fmt.Sscanf(f[i:], "[%d]", &n); err == nil {
					row = fmt.Sprintf("row %d, ", n+1)
				}
			}
			return fmt.Sprintf("%scolumn %s %s", row, v, re.Msg)
		}
	}
	return f + " " + re.Msg
}

// plural puts the verb that opens msg in the plural: the subject is a
// set of columns.
func plural(msg string) string {
	for _, v := range [][2]string{{"leaves ", "leave "}, {"names ", "name "}, {"is ", "are "}} {
		if rest, ok := strings.CutPrefix(msg, v[0]); ok {
			return v[1] + rest
		}
	}
	return msg
}

// checkReport shows the check res of the laboratory report lab in sys: the
// verdict, the steps with their verdicts, the findings, the liquid
// compositions and K-values of every step, the final liquid's closure and
// the figures (Hoffman plot, liquid density, two-phase Z).
func checkReport(st *study.Study, sys units.System, lab cvd.LabReport, res *cvd.CheckResult) *Report {
	pU, dU := sys.Unit(units.Pressure), sys.Unit(units.Density)
	r := &Report{
		Name:    "check",
		Section: "Quality of the laboratory CVD",
		Title:   fmt.Sprintf("Quality check of the laboratory CVD of %s at %s", fluidName(st), temperatureText(sys, res.T)),
	}
	all := res.AllFindings()
	count := map[cvd.Verdict]int{}
	for _, s := range res.Steps {
		count[s.Verdict]++
	}
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "verdict", Label: "Verdict"}, Value: res.Verdict.String()},
		Field{Column: Column{Name: "saturation_pressure_lab", Label: "Saturation pressure, laboratory", Unit: pU}, Value: pU.FromSI(res.DewP)},
		Field{Column: Column{Name: "dew_z", Label: "Z at the saturation pressure", Format: report.ZFactor}, Value: res.DewZ},
		Field{Column: Column{Name: "dew_z_source", Label: "Z at the saturation pressure from"}, Value: dewZSourceText(res.DewZSource)},
		Field{Column: Column{Name: "step_count", Label: "Steps below the saturation pressure"}, Value: len(res.Steps)},
		Field{Column: Column{Name: "steps_ok", Label: "Steps ok"}, Value: count[cvd.VerdictOK]},
		Field{Column: Column{Name: "steps_not_checked", Label: "Steps not checked in full"}, Value: count[cvd.VerdictNotChecked]},
		Field{Column: Column{Name: "steps_suspect", Label: "Steps suspect"}, Value: count[cvd.VerdictSuspect]},
		Field{Column: Column{Name: "steps_inconsistent", Label: "Steps inconsistent"}, Value: count[cvd.VerdictInconsistent]},
		Field{Column: Column{Name: "finding_count", Label: "Findings"}, Value: len(all)})
	if cl := res.Closure; cl != nil {
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: "closure_aad", Label: "Final liquid: AAD of the balance from the measured", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent}, Value: 100 * cl.AAD},
			Field{Column: Column{Name: "closure_max", Label: "Final liquid: largest difference", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent}, Value: 100 * cl.MaxAbs})
	}
	switch res.Verdict {
	case cvd.VerdictInconsistent:
		r.Warn("the laboratory CVD is inconsistent at " + stepsWith(sys, res, cvd.VerdictInconsistent) +
			": its numbers cannot all be right; ask the laboratory, or leave those steps out of the tables before tuning to them")
	case cvd.VerdictSuspect:
		r.Warn("the laboratory CVD is suspect at " + stepsWith(sys, res, cvd.VerdictSuspect) +
			": look at the findings before tuning to those steps")
	case cvd.VerdictNotChecked:
		r.Note("part of the laboratory CVD could not be checked (see the findings): the material balance needs every step's dropout, produced moles, z_gas and gas composition")
	}
	if res.DewZSource == cvd.DewZFromTwoPhase {
		r.Note("the report gives no Z-factor at the saturation pressure: the cell volume comes from the steps' z_two_phase themselves, so the two-phase Z check tests the steps against each other only")
	}
	if res.DewZSource == cvd.DewZOptions {
		r.Note(fmt.Sprintf("the laboratory report gives no Z-factor at the saturation pressure: the cell volume of the balance takes the model's, %.4f", res.DewZ))
	}
	r.Note("the thresholds of suspect and inconsistent are rules of thumb, beyond the report's rounding (0.01 mol %, 0.01 % of the volume, Z to 0.0001)")

	// The steps.
	steps := Table{Name: "steps", Title: "verdict per step",
		Columns: []Column{
			{Name: "pressure", Unit: pU},
			{Name: "verdict"},
			{Name: "findings"},
			{Name: "liquid_moles", Label: "Liquid in the cell, per mole charged", Unit: units.Percent, Symbol: "mol %", Format: report.Fixed(2)},
			{Name: "liquid_sum_error", Label: "Liquid composition sum − 100", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent},
			{Name: "liquid_molar_mass", Label: "Liquid molar mass", Unit: units.GPerMol, Format: report.Fixed(1)},
			{Name: "liquid_density", Label: "Liquid density (balance)", Unit: dU},
			{Name: "density_deviation", Label: "Density off the trend", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "hoffman_r2", Label: "Hoffman R²", Format: report.Fixed(4)},
			{Name: "hoffman_slope", Label: "Hoffman slope", Format: report.Fixed(3)},
			{Name: "hoffman_outliers", Label: "Hoffman outliers"},
			{Name: "z_two_phase_lab", Label: "Z two-phase, laboratory", Format: report.ZFactor},
			{Name: "z_two_phase_implied", Label: "Z two-phase from the produced moles", Format: report.ZFactor},
			{Name: "z_two_phase_deviation", Label: "Z two-phase deviation", Unit: units.Percent, Format: report.Fixed(2)},
		}}
	for _, s := range res.Steps {
		row := []any{pU.FromSI(s.P), s.Verdict.String(), len(s.Findings), nil, nil, nil, nil, nil, nil, nil, nil, nil, nil, nil}
		if b := s.Balance; b != nil {
			row[3] = 100 * b.LiquidMoles
			if b.X != nil {
				row[4] = 100 * (b.SumX - 1)
			}
			if b.LiquidM > 0 {
				row[5] = units.GPerMol.FromSI(b.LiquidM)
			}
			if b.LiquidDensity > 0 {
				row[6] = dU.FromSI(b.LiquidDensity)
			}
		}
		if d := s.Density; d != nil {
			row[7] = 100 * math.Expm1(d.Deviation)
		}
		if h := s.Hoffman; h != nil && h.Fitted {
			row[8], row[9] = h.R2, h.Slope
			var out []string
			for _, p := range h.Points {
				if p.Outlier {
					out = append(out, res.Components[p.Component].Name)
				}
			}
			row[10] = strings.Join(out, ", ")
		}
		if z := s.TwoPhaseZ; z != nil {
			row[11], row[12], row[13] = z.Reported, z.Implied, 100*z.Deviation
		}
		steps.Rows = append(steps.Rows, row)
	}

	// The findings.
	finds := Table{Name: "findings", Title: "findings",
		Columns: []Column{{Name: "pressure", Unit: pU}, {Name: "verdict"}, {Name: "finding"}, {Name: "component"}, {Name: "message"}}}
	for _, f := range all {
		var p any
		if f.Step >= 0 {
			p = pU.FromSI(res.Steps[f.Step].P)
		} else if f.Point >= 0 && lab.CVD != nil && f.Point < len(lab.CVD.Points) {
			p = pU.FromSI(lab.CVD.Points[f.Point].P)
		}
		finds.Rows = append(finds.Rows, []any{p, f.Verdict.String(), f.Kind.String(), f.Component, f.Message})
	}

	// Liquid compositions and K-values.
	kv := Table{Name: "k_values", Title: "back-calculated liquid and K-values per step", Detail: true,
		Columns: []Column{
			{Name: "pressure", Unit: pU},
			{Name: "component"},
			{Name: "gas", Label: "Gas (laboratory)", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent},
			{Name: "liquid", Label: "Liquid (balance)", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent},
			{Name: "liquid_uncertainty", Label: "Liquid uncertainty from rounding", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent},
			{Name: "k", Label: "K = y/x", Format: report.Format{Decimals: 4, MinDigits: 4, MaxDecimals: 6}},
			{Name: "hoffman_factor", Label: "Hoffman factor F", Format: report.Fixed(3)},
			{Name: "log_kp", Label: "log10(K p/1 atm)", Format: report.Fixed(4)},
			{Name: "hoffman_residual", Label: "Residual from the Hoffman line", Format: report.Fixed(4)},
			{Name: "outlier"},
		}}
	for _, s := range res.Steps {
		b := s.Balance
		if b == nil || b.X == nil {
			continue
		}
		pts := map[int]cvd.HoffmanPoint{}
		if s.Hoffman != nil {
			for _, p := range s.Hoffman.Points {
				pts[p.Component] = p
			}
		}
		y := lab.CVD.Points[s.Point].Gas
		for i, c := range res.Components {
			row := []any{pU.FromSI(s.P), c.Name, nil, 100 * b.X[i], nil, nil, nil, nil, nil, nil}
			if i < len(y) && !cvd.IsMissing(y[i]) {
				row[2] = 100 * y[i]
			}
			if s.XBound != nil {
				row[4] = 100 * s.XBound[i]
			}
			if b.K[i] > 0 {
				row[5] = b.K[i]
			}
			if c.HasF {
				row[6] = c.F
			}
			if p, ok := pts[i]; ok {
				row[7], row[8], row[9] = p.LogKP, p.Residual, p.Outlier
			}
			kv.Rows = append(kv.Rows, row)
		}
	}
	r.Tables = append(r.Tables, steps, finds, kv)

	if cl := res.Closure; cl != nil {
		t := Table{Name: "closure", Title: "final liquid: the balance of the last step against the laboratory's measured liquid",
			Columns: []Column{{Name: "component"},
				{Name: "balance", Label: "Balance", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent},
				{Name: "measured", Label: "Measured", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent},
				{Name: "difference", Label: "Difference (balance − measured)", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent},
				{Name: "rounding_bound", Label: "Part the rounding explains", Unit: units.Percent, Symbol: "mol %", Format: report.MolePercent}}}
		for _, g := range cl.Groups {
			t.Rows = append(t.Rows, []any{g.Name, 100 * g.Balance, 100 * g.Measured, 100 * g.Difference, 100 * g.Bound})
		}
		r.Tables = append(r.Tables, t)
		if len(cl.NotReported) > 0 {
			r.Note("the measured final liquid leaves out " + strings.Join(cl.NotReported, ", ") + ": not compared")
		}
	}
	r.Figures = checkFigures(sys, res)
	return r
}

func dewZSourceText(s cvd.DewZSource) string {
	if s == cvd.DewZOptions {
		return "the model"
	}
	return s.String()
}

// stepsWith lists the pressures of the steps whose verdict is v, and
// "the report as a whole" for a whole-report finding of that verdict.
func stepsWith(sys units.System, res *cvd.CheckResult, v cvd.Verdict) string {
	var at []string
	for _, f := range res.Findings {
		if f.Verdict == v {
			at = append(at, "the report as a whole")
			break
		}
	}
	for _, s := range res.Steps {
		if s.Verdict == v {
			at = append(at, pressureNote(sys, s.P))
		}
	}
	return strings.Join(at, ", ")
}

// checkFigures draws the Hoffman plot of every step, the liquid density of
// the balance with its trend, and the two-phase Z reported against the Z
// the produced moles imply.
func checkFigures(sys units.System, res *cvd.CheckResult) []*report.Figure {
	pU, dU := sys.Unit(units.Pressure), sys.Unit(units.Density)
	hoff := &report.Figure{Name: "check-hoffman", Title: "Hoffman plot of the laboratory CVD",
		Caption: "log10(K p) against the Hoffman characterization factor of each component, one line per step; consistent data fall on straight lines.",
		X:       report.Axis{Label: "Hoffman characterization factor F"}, Y: report.Axis{Label: "log10(K p/1 atm)"}}
	for _, s := range res.Steps {
		if s.Hoffman == nil || len(s.Hoffman.Points) == 0 {
			continue
		}
		pts := append([]cvd.HoffmanPoint(nil), s.Hoffman.Points...)
		sort.Slice(pts, func(i, j int) bool { return pts[i].F < pts[j].F })
		sr := report.Series{Label: pressureNote(sys, s.P), Style: report.LinePoints}
		for _, p := range pts {
			sr.X, sr.Y = append(sr.X, p.F), append(sr.Y, p.LogKP)
			if p.Outlier {
				hoff.Marks = append(hoff.Marks, report.Mark{Label: res.Components[p.Component].Name + " at " + pressureNote(sys, s.P), X: p.F, Y: p.LogKP})
			}
		}
		hoff.Series = append(hoff.Series, sr)
	}
	dens := &report.Figure{Name: "check-liquid-density", Title: "Liquid density from the material balance",
		Caption: "Density of the retrograde liquid back-calculated at each step, and the trend of its neighbours it is judged against.",
		X:       report.Axis{Label: "Pressure", Unit: pU}, Y: report.Axis{Label: "Liquid density", Unit: dU}}
	bal := report.Series{Label: "Material balance", Style: report.Points}
	tr := report.Series{Label: "Trend of the other steps", Style: report.Dashed}
	z2 := &report.Figure{Name: "check-two-phase-z", Title: "Two-phase Z: laboratory and cell-volume identity",
		Caption: "Two-phase Z-factor the laboratory reports, and the one its produced moles imply for a cell of constant volume.",
		X:       report.Axis{Label: "Pressure", Unit: pU}, Y: report.Axis{Label: "Z two-phase"}}
	zl := report.Series{Label: "Laboratory", Style: report.Points}
	zi := report.Series{Label: "From the produced moles", Style: report.LinePoints}
	for _, s := range res.Steps {
		p := pU.FromSI(s.P)
		if d := s.Density; d != nil {
			bal.X, bal.Y = append(bal.X, p), append(bal.Y, dU.FromSI(d.Value))
			tr.X, tr.Y = append(tr.X, p), append(tr.Y, dU.FromSI(d.Predicted))
		}
		if z := s.TwoPhaseZ; z != nil {
			zl.X, zl.Y = append(zl.X, p), append(zl.Y, z.Reported)
			zi.X, zi.Y = append(zi.X, p), append(zi.Y, z.Implied)
		}
	}
	var out []*report.Figure
	if len(hoff.Series) > 0 {
		out = append(out, hoff)
	}
	if len(bal.X) > 0 {
		dens.Series = []report.Series{bal, tr}
		out = append(out, dens)
	}
	if len(zl.X) > 0 {
		z2.Series = []report.Series{zl, zi}
		out = append(out, z2)
	}
	return out
}
