package main

import (
	"fmt"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
)

func compareCommand() *cli.Command {
	return studyCommand("compare",
		"the fluid model against the study's laboratory report ([lab]): saturation pressure, CCE and CVD point by point, with the deviations' statistics per quantity",
		[]cli.Flag{plotFlag()},
		func(c *cli.Context, o *options, st *study.Study) error {
			lab, err := labOf(st)
			if err != nil {
				return err
			}
			cmp, err := compareModel(st, o.sys, lab)
			if err != nil {
				return err
			}
			return o.emitPlots(c, comparisonReport(st, o.sys, cmp, nil))
		})
}

// labOf is the study's laboratory report, or a usage error saying how to
// give one.
func labOf(st *study.Study) (cvd.LabReport, error) {
	if st.Lab.Report == nil {
		return cvd.LabReport{}, cli.Exit(fmt.Sprintf("%s has no [lab] section: give the measured saturation_pressure and the laboratory tables, "+
			`such as [lab] saturation_pressure = "4141 psia", cvd = "lab/cvd.csv", cce = "lab/cce.csv"`, st.File), exitUsage)
	}
	return *st.Lab.Report, nil
}

// compareModel compares the study's fluid with the laboratory report lab,
// the CGR through the study's separator train.
func compareModel(st *study.Study, sys units.System, lab cvd.LabReport) (*cvd.Comparison, error) {
	tr := trainOf(st, sys)
	c, err := cvd.Compare(st.Fluid, st.Z, lab, cvd.CompareOptions{Train: &tr})
	if err != nil {
		return nil, fmt.Errorf("the model at the laboratory's conditions (%s): %w", temperatureText(sys, lab.T), err)
	}
	return c, nil
}

// labQuantity is how one laboratory quantity is shown.
type labQuantity struct {
	label  string
	unit   units.Unit // the unit its values are shown in
	perSI  float64    // shown value per SI value (the factor of unit, or of a yield unit)
	format report.Format
	// diff is the symbol of a difference of two values ("% points" for
	// quantities held in %).
	diff string
}

func (q labQuantity) of(si float64) float64 { return si * q.perSI }

// quantityOf is how the quantity name of a comparison is shown in sys.
func quantityOf(name string, sys units.System) labQuantity {
	pct := func(label string, f report.Format) labQuantity {
		return labQuantity{label: label, unit: units.Percent, perSI: 100, format: f, diff: "% points"}
	}
	plain := func(label string, f report.Format) labQuantity {
		return labQuantity{label: label, perSI: 1, format: f}
	}
	of := func(label string, u units.Unit) labQuantity {
		return labQuantity{label: label, unit: u, perSI: u.FromSI(1) - u.FromSI(0), format: report.FormatOf(u), diff: u.Symbol}
	}
	switch name {
	case cvd.QSaturationPressure:
		return of("Saturation pressure", sys.Unit(units.Pressure))
	case cvd.QLiquidDropout:
		return pct("Liquid dropout", report.Format{Decimals: 2})
	case cvd.QProduced:
		return pct("Produced, cumulative", report.Format{Decimals: 2})
	case cvd.QZGas:
		return plain("Z gas", report.ZFactor)
	case cvd.QZTwoPhase:
		return plain("Z two-phase", report.ZFactor)
	case cvd.QZ:
		return plain("Z single phase", report.ZFactor)
	case cvd.QRelativeVolume:
		return plain("Relative volume V/Vsat", report.Fixed(4))
	case cvd.QLiquidVolume:
		return pct("Liquid volume", report.Format{Decimals: 2})
	case cvd.QDensity:
		return of("Density", sys.Unit(units.Density))
	case cvd.QGasViscosity:
		return labQuantity{label: "Gas viscosity", unit: centipoise.Unit, perSI: centipoise.perSI, format: report.FormatOf(centipoise.Unit), diff: "cP"}
	case cvd.QCGR:
		cgr := surfaceUnitsOf(sys).cgr
		return labQuantity{label: "CGR", unit: cgr.Unit, perSI: cgr.perSI, format: report.FormatOf(cgr.Unit), diff: cgr.Unit.Symbol}
	}
	if c, ok := strings.CutPrefix(name, "gas_"); ok {
		return pct(c+" in the produced gas", report.MolePercent)
	}
	return plain(name, report.Fixed(4))
}

// comparisonReport shows the comparison c in sys: the saturation pressures,
// each quantity's average absolute deviation in its own unit, the
// statistics of every quantity (in the deviations tuning minimises), a
// table per quantity point by point, the produced gas's methane and plus
// fraction per step, and the figures of laboratory points over the
// model's. w are the weights of the tuning, nil outside it.
func comparisonReport(st *study.Study, sys units.System, c *cvd.Comparison, w map[string]float64) *Report {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	r := &Report{
		Name:    "comparison",
		Section: "Model against the laboratory",
		Title:   fmt.Sprintf("%s against the laboratory report at %s", fluidName(st), temperatureText(sys, c.T)),
	}
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "temperature", Label: "Laboratory temperature", Unit: tU}, Value: tU.FromSI(c.T)},
		Field{Column: Column{Name: "saturation_type", Label: "Saturation point (model)"}, Value: c.Saturation.Type.String()},
		Field{Column: Column{Name: "saturation_pressure_model", Label: "Saturation pressure, model", Unit: pU}, Value: pU.FromSI(c.Saturation.P)})
	if c.LabSaturationP > 0 {
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: "saturation_pressure_lab", Label: "Saturation pressure, laboratory", Unit: pU}, Value: pU.FromSI(c.LabSaturationP)},
			Field{Column: Column{Name: "saturation_pressure_deviation", Label: "Saturation pressure deviation (model − laboratory)", Unit: units.Percent, Format: report.Fixed(2)},
				Value: units.Percent.FromSI(c.SaturationDeviation)})
	}
	if c.Depletion != nil && c.Start > c.Saturation.P {
		r.Note(fmt.Sprintf("the model's dew point lies below the laboratory's: its CVD cell is charged at the laboratory's %s, single phase, as the laboratory's was",
			pressureNote(sys, c.Start)))
	}
	for _, q := range c.Quantities {
		if q.Experiment == cvd.Saturation {
			continue
		}
		lq := quantityOf(q.Name, sys)
		// The components of the gas, one by one, are for programs: people
		// read them in the statistics table.
		col := Column{Name: q.Name + "_aad", Label: "AAD " + lowerFirst(lq.label) + " (" + q.Experiment.String() + ")", Symbol: lq.diff, Format: lq.format,
			Verbose: isGasComponent(q.Name)}
		r.Fields = append(r.Fields, Field{Column: col, Value: lq.of(q.Stats.AAD)})
	}
	r.Tables = append(r.Tables, statisticsTable("statistics", "deviations per quantity (relative ones in %, absolute ones in % points)", sys, c, w))
	for _, q := range c.Quantities {
		if q.Experiment == cvd.Saturation || isGasComponent(q.Name) {
			continue
		}
		r.Tables = append(r.Tables, pointsTable(q, sys))
	}
	if t := gasCompositionTable(st, sys, c); t != nil {
		r.Tables = append(r.Tables, *t)
	}
	r.Figures = comparisonFigures(sys, []*cvd.Comparison{c}, nil)
	return r
}

// lowerFirst writes a label inside a sentence: its first word in lower
// case, unless it is a name or a symbol (CGR, Z, N2, CO2, C1, C7+), whose
// second character is not a lower-case letter.
func lowerFirst(s string) string {
	if len(s) < 2 || s[1] < 'a' || s[1] > 'z' {
		return s
	}
	return strings.ToLower(s[:1]) + s[1:]
}

// statisticsTable lists the statistics of every quantity of c in the
// deviations tuning measures: relative ones in percent, absolute ones in
// percentage points (cvd.Deviation).
func statisticsTable(name, title string, sys units.System, c *cvd.Comparison, w map[string]float64) Table {
	pU := sys.Unit(units.Pressure)
	cols := []Column{
		{Name: "quantity"},
		{Name: "experiment"},
		{Name: "points"},
		{Name: "deviation", Label: "Deviation measured"},
		{Name: "aad", Label: "AAD", Unit: units.Percent, Format: report.Fixed(2)},
		{Name: "bias", Unit: units.Percent, Format: report.Fixed(2)},
		{Name: "max_deviation", Unit: units.Percent, Format: report.Fixed(2)},
		{Name: "max_at_pressure", Label: "Pressure of the maximum", Unit: pU},
	}
	if w != nil {
		cols = append(cols, Column{Name: "weight", Format: report.Format{Decimals: 1, MinDigits: 1, MaxDecimals: 3}})
	}
	t := Table{Name: name, Title: title, Columns: cols}
	for _, q := range c.Quantities {
		s := deviationStats(q)
		kind := "relative"
		if q.Kind == cvd.Absolute {
			kind = "absolute"
		}
		row := []any{quantityOf(q.Name, sys).label, q.Experiment.String(), s.Count, kind,
			units.Percent.FromSI(s.AAD), units.Percent.FromSI(s.Bias), units.Percent.FromSI(s.MaxDeviation), pU.FromSI(s.MaxAt)}
		if w != nil {
			row = append(row, cvd.Weight(w, q.Name))
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// pointsTable is one quantity point by point.
func pointsTable(q cvd.QuantityComparison, sys units.System) Table {
	pU := sys.Unit(units.Pressure)
	lq := quantityOf(q.Name, sys)
	cols := []Column{
		{Name: "pressure", Unit: pU},
		{Name: "lab", Label: "Laboratory", Unit: lq.unit, Format: lq.format},
		{Name: "model", Label: "Model", Unit: lq.unit, Format: lq.format},
		{Name: "difference", Label: "Difference (model − laboratory)", Unit: lq.unit, Format: lq.format, Symbol: lq.diff},
		{Name: "relative_difference", Unit: units.Percent, Format: report.Fixed(2)},
	}
	t := Table{Name: q.Name, Title: fmt.Sprintf("%s, %s", lowerFirst(lq.label), q.Experiment), Columns: cols}
	for _, p := range q.Points {
		var rel any
		if rd, ok := p.RelativeDifference(); ok {
			rel = units.Percent.FromSI(rd)
		}
		t.Rows = append(t.Rows, []any{pU.FromSI(p.P), lq.of(p.Lab), lq.of(p.Model), lq.of(p.Difference()), rel})
	}
	return t
}

// gasCompositionTable gives the produced gas's methane and plus fraction
// (the components that move most as the liquid drops out) per step, and
// the deviations of its whole composition as one statistic; nil without
// compositions.
func gasCompositionTable(st *study.Study, sys units.System, c *cvd.Comparison) *Table {
	var qs []cvd.QuantityComparison
	for _, q := range c.Quantities {
		if isGasComponent(q.Name) {
			qs = append(qs, q)
		}
	}
	if len(qs) == 0 {
		return nil
	}
	var pick []cvd.QuantityComparison
	for _, q := range qs {
		n := strings.TrimPrefix(q.Name, "gas_")
		if n == "C1" || strings.HasSuffix(n, "+") || n == plusNameOf(st) {
			pick = append(pick, q)
		}
	}
	if len(pick) == 0 {
		pick = qs
	}
	pU := sys.Unit(units.Pressure)
	cols := []Column{{Name: "pressure", Unit: pU}}
	for _, q := range pick {
		n := strings.TrimPrefix(q.Name, "gas_")
		cols = append(cols,
			Column{Name: q.Name + "_lab", Label: n + " laboratory", Unit: units.Percent, Format: report.MolePercent},
			Column{Name: q.Name + "_model", Label: n + " model", Unit: units.Percent, Format: report.MolePercent},
			Column{Name: q.Name + "_difference", Label: n + " difference", Unit: units.Percent, Format: report.MolePercent, Symbol: "% points"})
	}
	t := &Table{Name: "gas_composition", Title: "produced gas: methane and the plus fraction, mol %", Columns: cols}
	for k, p := range pick[0].Points {
		row := []any{pU.FromSI(p.P)}
		for _, q := range pick {
			if k < len(q.Points) && q.Points[k].P == p.P {
				pt := q.Points[k]
				row = append(row, units.Percent.FromSI(pt.Lab), units.Percent.FromSI(pt.Model), units.Percent.FromSI(pt.Difference()))
			} else {
				row = append(row, nil, nil, nil)
			}
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// isGasComponent reports whether the quantity name is that of a component
// of the produced gas.
func isGasComponent(name string) bool {
	return strings.HasPrefix(name, "gas_") && name != cvd.QGasViscosity
}

// plusNameOf is the name of the study's plus fraction as the laboratory
// tables name it, or "".
func plusNameOf(st *study.Study) string {
	if st.Lab.Report == nil || st.Lab.Report.CVD == nil {
		return ""
	}
	for _, lc := range st.Lab.Report.CVD.Gas {
		if len(lc.Index) > 1 {
			return lc.Name
		}
	}
	return ""
}

// comparisonFigures draws the laboratory's points over the model's for the
// liquid dropout, the produced moles, the Z-factors of the CVD and the
// relative volume of the CCE: one model series per comparison in cs,
// labelled by labels (the comparison's own when nil).
func comparisonFigures(sys units.System, cs []*cvd.Comparison, labels []string) []*report.Figure {
	pU := sys.Unit(units.Pressure)
	type fig struct {
		name, title, caption, yLabel string
		yUnit                        units.Unit
		quantities                   []string
	}
	figs := []fig{
		{"lab-liquid-dropout", "Liquid dropout: laboratory and model", "Retrograde liquid of the constant-volume depletion, as a share of the cell volume at the saturation pressure.", "Liquid dropout", units.Percent, []string{cvd.QLiquidDropout}},
		{"lab-produced", "Produced moles: laboratory and model", "Cumulative moles produced from the CVD cell, as a share of the moles charged.", "Produced, cumulative", units.Percent, []string{cvd.QProduced}},
		{"lab-z-factors", "Z-factors of the depletion: laboratory and model", "Z-factor of the equilibrium gas and two-phase Z-factor of the cell contents.", "Z-factor", units.Unit{}, []string{cvd.QZGas, cvd.QZTwoPhase}},
		{"lab-relative-volume", "Relative volume of the expansion: laboratory and model", "Volume of the constant-composition expansion over the volume at the saturation pressure.", "Relative volume V/Vsat", units.Unit{}, []string{cvd.QRelativeVolume}},
	}
	var out []*report.Figure
	for _, f := range figs {
		fg := &report.Figure{Name: f.name, Title: f.title, Caption: f.caption,
			X: report.Axis{Label: "Pressure", Unit: pU}, Y: report.Axis{Label: f.yLabel, Unit: f.yUnit}}
		for _, name := range f.quantities {
			lq := quantityOf(name, sys)
			q := cs[0].Quantity(name)
			if q == nil {
				continue
			}
			suffix := ""
			if len(f.quantities) > 1 {
				suffix = ", " + lq.label
			}
			lab := report.Series{Label: "Laboratory" + suffix, Style: report.Points}
			for _, p := range q.Points {
				lab.X, lab.Y = append(lab.X, pU.FromSI(p.P)), append(lab.Y, lq.of(p.Lab))
			}
			fg.Series = append(fg.Series, lab)
			for k, c := range cs {
				q := c.Quantity(name)
				if q == nil {
					continue
				}
				label := "Model"
				if labels != nil {
					label = labels[k]
				}
				m := report.Series{Label: label + suffix, Style: report.LinePoints}
				for _, p := range q.Points {
					m.X, m.Y = append(m.X, pU.FromSI(p.P)), append(m.Y, lq.of(p.Model))
				}
				fg.Series = append(fg.Series, m)
			}
		}
		if len(fg.Series) > 0 {
			out = append(out, fg)
		}
	}
	return out
}
