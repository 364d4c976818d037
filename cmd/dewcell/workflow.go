package main

import (
	"bytes"
	"fmt"
	"os"
	"runtime"
	"strings"
	"time"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/report/html"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/mbal"
)

// cautions are the paragraphs every report and workbook carries.
var cautions = []string{
	"The results are screening estimates from an equation-of-state fluid model and a material balance of the reservoir; " +
		"their accuracy is that of the inputs and of the model's match to the laboratory's measurements.",
	"Reserves, development decisions and filings need review by qualified, licensed professionals under the regulations where the field lies.",
	"Injecting gas at high pressure, or cycling it, follows the local codes for pressure equipment and operations.",
}

// workflow runs the study's whole workflow, as demo and report do: the
// fluid, its saturation pressures and phase envelope, the constant-volume
// depletion and constant-composition expansion at the reservoir
// temperature, the separator, the volumes in place, the depletion recovery,
// the forecast and the scenarios, and, when the study has them, the
// probabilistic run of its [uncertainty] and the material balance on its
// production history. A step whose inputs the study does not give is left
// out, with a note saying which key it needs. Each result takes the
// warnings and notes of its step. atDew is --start-at-dew-point.
func workflow(o *options, st *study.Study, atDew bool) (out []*Report, err error) {
	sys := o.sys
	add := func(r *Report) {
		o.attach(r)
		out = append(out, r)
	}
	skipped := func(step, why string) {
		o.note(fmt.Sprintf("%s left out: %s", step, why))
	}

	add(fluidReport(st, sys))
	t := st.Reservoir.Temperature
	sat, up, err := satpointReport(st, sys, t)
	if err != nil {
		return nil, err
	}
	noteMargin(o, st, up)
	add(sat)
	env, err := envelopeReport(st, sys)
	if err != nil {
		return nil, err
	}
	add(env)
	if err := labSteps(o, st, add); err != nil {
		return nil, err
	}

	rs := st.Reservoir
	tr := trainOf(st, sys)
	if len(st.Separator) == 0 {
		o.warnOnce(noSeparator, fmt.Sprintf("%s gives no [[separator.stage]]: the fluid goes straight to the stock tank", st.File))
	}
	switch {
	case up.Type == eos.Bubble:
		skipped("constant-volume depletion", fmt.Sprintf("the fluid has a bubble point at %s, it is an oil", temperatureText(sys, t)))
	case st.Depletion == nil && (rs.AbandonmentPressure == 0 || rs.AbandonmentPressure >= up.P):
		skipped("constant-volume depletion", fmt.Sprintf("%s gives neither [depletion] pressures nor a reservoir.abandonment_pressure below the dew point", st.File))
	default:
		opt := cvd.DepletionOptions{Pressures: st.Depletion, Train: &tr}
		if st.Depletion == nil {
			opt.Steps, opt.Abandonment = defaultDepletionSteps, rs.AbandonmentPressure
		}
		d, err := cvd.Deplete(st.Fluid, st.Z, t, opt)
		if err != nil {
			return nil, fmt.Errorf("constant-volume depletion at %s: %w", temperatureText(sys, t), err)
		}
		add(depletionReport(st, sys, tr, d))
	}
	if rs.AbandonmentPressure > 0 && rs.AbandonmentPressure < up.P {
		ps, err := expandPressures(st, sys, up)
		if err != nil {
			return nil, err
		}
		e, err := cvd.Expand(st.Fluid, st.Z, t, ps, nil)
		if err != nil {
			return nil, fmt.Errorf("constant-composition expansion at %s: %w", temperatureText(sys, t), err)
		}
		add(expansionReport(st, sys, e))
	} else {
		skipped("constant-composition expansion", fmt.Sprintf("%s gives no reservoir.abandonment_pressure below the saturation pressure for its steps", st.File))
	}
	sep, err := separateReport(st, sys)
	if err != nil {
		return nil, err
	}
	add(sep)

	// What is queued when the workflow ends (the steps it left out) joins
	// the last result.
	defer func() {
		if n := len(out); n > 0 && err == nil {
			r := out[n-1]
			r.Warnings, r.Notes = append(r.Warnings, o.warnings...), append(r.Notes, o.notes...)
			o.warnings, o.notes = nil, nil
		}
	}()
	if why := missingRock(st); why != "" {
		skipped("volumes in place, recovery and history", why)
		return out, nil
	}
	ip, err := inplaceReportAt(o, st, atDew)
	if err != nil {
		return nil, err
	}
	add(ip)
	if rs.AbandonmentPressure == 0 {
		skipped("depletion recovery", fmt.Sprintf("%s gives no reservoir.abandonment_pressure", st.File))
	} else {
		rec, err := recoverReportAt(o, st, mbal.RecoverOptions{Steps: defaultRecoverySteps}, atDew)
		if err != nil {
			return nil, err
		}
		add(rec)
	}
	switch {
	case rs.AbandonmentPressure == 0:
		skipped("production forecast", fmt.Sprintf("%s gives no reservoir.abandonment_pressure", st.File))
	case st.Wells == nil || st.Production == nil:
		skipped("production forecast", fmt.Sprintf("%s gives no [wells] and [production]", st.File))
	default:
		fr, err := forecastRun(o, st, atDew)
		if err != nil {
			return nil, err
		}
		add(forecastReport(st, sys, fr))
		if len(st.Scenarios) == 0 {
			skipped("pressure maintenance", fmt.Sprintf("%s has no [[scenario]]", st.File))
		} else {
			mr, err := maintainRun(o, st, atDew, 0.2)
			if err != nil {
				return nil, err
			}
			add(maintainReport(st, sys, mr))
		}
	}
	if st.Uncertainty != nil {
		ur, err := uncertaintyRun(o, st, atDew, runtime.NumCPU(), 0)
		if err != nil {
			return nil, err
		}
		add(uncertaintyReport(st, sys, ur))
	}
	if len(st.History) == 0 {
		skipped("material balance on production history", fmt.Sprintf("%s has no [[history]]", st.File))
		return out, nil
	}
	h, err := historyRunAt(o, st, mbal.DefaultConfidence, atDew)
	if err != nil {
		return nil, err
	}
	add(historyReportOf(st, sys, h))
	return out, nil
}

// labSteps adds the workflow's laboratory steps when the study has a
// [lab]: the quality check of its CVD (when the report gives what the
// check needs), the comparison of the model with it, and, when the study
// has [[tune.parameter]], the tuning and the comparison after it. The
// later steps keep the study's fluid.
func labSteps(o *options, st *study.Study, add func(*Report)) error {
	if st.Lab.Report == nil {
		o.note(fmt.Sprintf("laboratory comparison, check and tuning left out: %s has no [lab]", st.File))
		return nil
	}
	lab := *st.Lab.Report
	sys := o.sys
	if lab.CVD != nil && len(lab.CVD.Gas) > 0 {
		res, err := checkLab(st, lab)
		if err != nil {
			o.note(fmt.Sprintf("quality check of the laboratory CVD left out: %v", err))
		} else {
			add(checkReport(st, sys, lab, res))
		}
	} else {
		o.note("quality check of the laboratory CVD left out: the report has no CVD with produced-gas compositions")
	}
	if st.Tune == nil {
		cmp, err := compareModel(st, sys, lab)
		if err != nil {
			return err
		}
		add(comparisonReport(st, sys, cmp, nil))
		o.note(fmt.Sprintf("tuning left out: %s has no [[tune.parameter]]", st.File))
		return nil
	}
	res, err := tuneStudy(o, st)
	if err != nil {
		return err
	}
	add(comparisonReport(st, sys, res.Before, nil))
	tr := tuneReport(st, sys, res)
	kept := tr.Tables[:0]
	for _, t := range tr.Tables {
		if !strings.HasSuffix(t.Name, "_after") { // comparison_after gives them
			kept = append(kept, t)
		}
	}
	tr.Tables = kept
	add(tr)
	after := comparisonReport(st, sys, res.After, nil)
	after.Name, after.Section = "comparison_after", "Tuned model against the laboratory"
	after.Title = strings.Replace(after.Title, fluidName(st), fluidName(st)+", tuned,", 1)
	after.Figures = nil // the tuning's figures draw the model before and after
	after.Note("the steps after this one run on the study's fluid, not the tuned one: dewcell tune --save writes the tuned study to run them on")
	add(after)
	return nil
}

// missingRock says which reservoir key the volumes in place need and the
// study does not give, or "".
func missingRock(st *study.Study) string {
	rs := st.Reservoir
	switch {
	case rs.InitialPressure == 0:
		return fmt.Sprintf("%s gives no reservoir.initial_pressure", st.File)
	case rs.PoreVolume == 0 && (rs.Area == 0 || rs.NetThickness == 0 || rs.Porosity == 0):
		return fmt.Sprintf("%s gives neither reservoir.pore_volume nor reservoir.area, net_thickness and porosity", st.File)
	}
	return ""
}

// inputsReport echoes the study's inputs beyond the fluid: the reservoir,
// the standard conditions, the separator stages, the depletion pressures
// and the production history.
func inputsReport(st *study.Study, sys units.System) *Report {
	tU, pU, lU, aU, vU, cU := sys.Unit(units.Temperature), sys.Unit(units.Pressure), sys.Unit(units.Length),
		sys.Unit(units.Area), sys.Unit(units.Volume), sys.Unit(units.Compressibility)
	rs := st.Reservoir
	opt := func(u units.Unit, v float64) any {
		if v == 0 {
			return nil
		}
		return u.FromSI(v)
	}
	bare := func(v float64) any {
		if v == 0 {
			return nil
		}
		return v
	}
	std, tank := st.StandardConditions(sys), st.StockTank()
	r := &Report{
		Name:    "inputs",
		Section: "Inputs",
		Title:   "inputs of " + fluidName(st),
		Fields: []Field{
			{Column: Column{Name: "study_file"}, Value: st.File},
			{Column: Column{Name: "reservoir_temperature", Unit: tU}, Value: tU.FromSI(rs.Temperature)},
			{Column: Column{Name: "initial_pressure", Unit: pU}, Value: opt(pU, rs.InitialPressure)},
			{Column: Column{Name: "abandonment_pressure", Unit: pU}, Value: opt(pU, rs.AbandonmentPressure)},
			{Column: Column{Name: "area", Unit: aU}, Value: opt(aU, rs.Area)},
			{Column: Column{Name: "net_thickness", Unit: lU}, Value: opt(lU, rs.NetThickness)},
			{Column: Column{Name: "pore_volume", Unit: vU}, Value: opt(vU, rs.PoreVolume)},
			{Column: Column{Name: "porosity", Format: report.Saturation}, Value: bare(rs.Porosity)},
			{Column: Column{Name: "water_saturation", Format: report.Saturation}, Value: bare(rs.WaterSaturation)},
			{Column: Column{Name: "critical_condensate_saturation", Format: report.Saturation}, Value: bare(rs.CriticalCondensateSaturation)},
			{Column: Column{Name: "rock_compressibility", Unit: cU}, Value: opt(cU, rs.RockCompressibility)},
			{Column: Column{Name: "water_compressibility", Unit: cU}, Value: opt(cU, rs.WaterCompressibility)},
			{Column: Column{Name: "water_formation_volume_factor", Format: report.Fixed(4)}, Value: bare(rs.WaterFVF)},
			{Column: Column{Name: "standard_temperature", Unit: tU}, Value: tU.FromSI(std.T)},
			{Column: Column{Name: "standard_pressure", Unit: pU}, Value: pU.FromSI(std.P)},
			{Column: Column{Name: "stock_tank_temperature", Unit: tU}, Value: tU.FromSI(tank.T)},
			{Column: Column{Name: "stock_tank_pressure", Unit: pU}, Value: pU.FromSI(tank.P)},
		},
	}
	if len(st.Separator) > 0 {
		stages := Table{Name: "separator_stages", Title: "separator stages, in order (the stock tank follows the last)",
			Columns: []Column{{Name: "stage"}, {Name: "pressure", Unit: pU}, {Name: "temperature", Unit: tU}}}
		for i, s := range st.Separator {
			stages.Rows = append(stages.Rows, []any{i + 1, pU.FromSI(s.Pressure), tU.FromSI(s.Temperature)})
		}
		r.Tables = append(r.Tables, stages)
	}
	if len(st.Depletion) > 0 {
		dep := Table{Name: "depletion_pressures", Title: "constant-volume depletion steps ([depletion])",
			Columns: []Column{{Name: "step"}, {Name: "pressure", Unit: pU}}}
		for i, p := range st.Depletion {
			dep.Rows = append(dep.Rows, []any{i + 1, pU.FromSI(p)})
		}
		r.Tables = append(r.Tables, dep)
	}
	if len(st.History) > 0 {
		gU, lqU := sys.Unit(units.GasVolume), sys.Unit(units.LiquidVolume)
		asGiven := report.Format{Scaled: true, Digits: 6} // the digits a production report gives
		h := Table{Name: "history", Title: "production history ([[history]])",
			Columns: []Column{{Name: "row"}, {Name: "pressure", Unit: pU}, {Name: "cum_sales_gas", Unit: gU, Format: asGiven},
				{Name: "cum_condensate", Unit: lqU, Format: asGiven}, {Name: "cum_water", Unit: lqU, Format: asGiven}}}
		for _, row := range st.History {
			h.Rows = append(h.Rows, []any{row.Label, pU.FromSI(row.Pressure), gU.FromSI(row.SalesGas), lqU.FromSI(row.Condensate), lqU.FromSI(row.Water)})
		}
		r.Tables = append(r.Tables, h)
	}
	return r
}

// studyReport writes the reports of the workflow as the HTML study report.
// source is the study file's text; cmd the command line that made it.
func studyReport(o *options, st *study.Study, source []byte, cmd string, reports []*Report) ([]byte, error) {
	title := st.Title
	if title == "" {
		title = st.File
	}
	opt := html.Options{
		Title:     title,
		File:      st.File,
		Source:    string(source),
		Command:   cmd,
		Units:     o.sys.String(),
		Generated: time.Now().UTC().Format("2006-01-02 15:04 UTC"),
		Cautions:  cautions,
		Inputs:    inputsReport(st, o.sys),
	}
	var b bytes.Buffer
	if err := html.Write(&b, opt, reports...); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

func reportCommand() *cli.Command {
	return &cli.Command{
		Name: "report",
		Usage: "the study report: runs the whole workflow on the study (fluid, saturation point and envelope, CVD and CCE, separator, " +
			"in place by both routes, depletion recovery, history when given) and writes one self-contained HTML file with every table, figure, warning and caution, ready to print",
		ArgsUsage: "STUDY.toml",
		Flags: []cli.Flag{
			&cli.StringFlag{Name: flagUnits, Value: units.Field.String(), Usage: "unit system of the report: `SYSTEM` is field or metric"},
			&cli.StringFlag{Name: flagOutput, Usage: "write the report to `FILE` (such as report.html), in full or not at all; \"-\" or none: standard output"},
			startAtDewPointFlag(),
		},
		Action: func(c *cli.Context) error {
			o, err := commonOptions(c, true)
			if err != nil {
				return err
			}
			o.format = formatHTML
			st, err := o.loadStudy()
			if err != nil {
				return err
			}
			source, err := os.ReadFile(o.study)
			if err != nil {
				return cli.Exit(fmt.Sprintf("cannot read %s (%v)", o.study, cause(err)), exitUsage)
			}
			reports, err := workflow(o, st, c.Bool(flagStartAtDew))
			if err != nil {
				o.flush()
				return userError(err, o.sys)
			}
			data, err := studyReport(o, st, source, o.command, reports)
			if err != nil {
				return err
			}
			o.tell(reports...)
			if err := o.write(data); err != nil {
				return err
			}
			if o.output != "" {
				fmt.Fprintf(o.stderr, "report: %d parts written to %s\n", len(reports)+1, o.output)
			}
			fmt.Fprintln(o.stderr, caution)
			return nil
		},
	}
}

// commandLine is the command as the user could type it again.
func commandLine(c *cli.Context) string {
	parts := []string{"dewcell", c.Command.Name}
	for _, name := range c.FlagNames() {
		if name == flagOutput {
			continue
		}
		v := c.Value(name)
		switch x := v.(type) {
		case bool:
			if x {
				parts = append(parts, "--"+name)
			}
		default:
			parts = append(parts, fmt.Sprintf("--%s %v", name, quoteArg(fmt.Sprint(x))))
		}
	}
	for _, a := range c.Args().Slice() {
		parts = append(parts, quoteArg(a))
	}
	return strings.Join(parts, " ")
}

func quoteArg(s string) string {
	if s == "" || strings.ContainsAny(s, " \t\"'\\$") {
		return fmt.Sprintf("%q", s)
	}
	return s
}
