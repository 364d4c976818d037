package main

import (
	"errors"
	"fmt"
	"math"
	"os"
	"strings"
	"time"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
)

const (
	flagSave  = "save"
	flagForce = "force"
)

// correlationLimit is the correlation of two tuned parameters beyond which
// the data cannot tell them apart: the fit trades one for the other.
// Common practice, no published source.
const correlationLimit = 0.95

func tuneCommand() *cli.Command {
	return studyCommand("tune",
		"regression of the fluid's parameters ([[tune.parameter]]) to the laboratory report ([lab]): the statistics before and after, "+
			"the parameters with their standard errors and correlations; --save writes the tuned study",
		[]cli.Flag{
			&cli.StringFlag{Name: flagSave, Usage: "write the tuned study to `TUNED.toml`: the study file with the tuned values set, its [lab] paths still naming the same tables (never replaces a file without --force)"},
			&cli.BoolFlag{Name: flagForce, Usage: "let --save replace a file that exists (never the study file or a laboratory table)"},
			plotFlag(),
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			save := c.String(flagSave)
			var src []byte
			if save != "" {
				var err error
				if src, err = checkSave(st, save); err != nil {
					return err
				}
			}
			res, err := tuneStudy(o, st)
			if err != nil {
				return err
			}
			r := tuneReport(st, o.sys, res)
			if save != "" {
				header := tunedHeader(st, o.sys, res)
				text, err := tunedStudyText(st, src, save, res.X, res.Fluid, res.Z, header)
				if err != nil {
					return fmt.Errorf("--%s %s: %w", flagSave, save, err)
				}
				if err := saveFile(save, text, c.Bool(flagForce)); err != nil {
					return cli.Exit(fmt.Sprintf("--%s: %v", flagSave, err), exitUsage)
				}
				r.Note(fmt.Sprintf("the tuned study is saved as %s; every command runs on it, and compare on it gives the statistics after tuning", save))
			}
			return o.emitPlots(c, r)
		})
}

// checkSave refuses, before anything is computed, a --save file that is
// the study or a laboratory table, and reads the study's text.
func checkSave(st *study.Study, save string) ([]byte, error) {
	for _, in := range []string{st.File, st.Lab.CCE, st.Lab.CVD} {
		if in == "" {
			continue
		}
		a, errA := os.Stat(save)
		b, errB := os.Stat(in)
		if errA == nil && errB == nil && os.SameFile(a, b) {
			return nil, cli.Exit(fmt.Sprintf("--%s %s is an input of the study; refusing to overwrite it", flagSave, save), exitUsage)
		}
	}
	src, err := os.ReadFile(st.File)
	if err != nil {
		return nil, cli.Exit(fmt.Sprintf("--%s: cannot read the study file %s again (%v)", flagSave, st.File, cause(err)), exitUsage)
	}
	return src, nil
}

// tuneStudy runs the study's regression, reporting each iteration on
// standard error.
func tuneStudy(o *options, st *study.Study) (*cvd.TuneResult, error) {
	lab, err := labOf(st)
	if err != nil {
		return nil, err
	}
	if st.Tune == nil {
		return nil, cli.Exit(fmt.Sprintf("%s has no [[tune.parameter]]: name the properties to tune, such as "+
			`[[tune.parameter]] property = "critical_temperature", component = "C7+", min = 0.9, max = 1.1`, st.File), exitUsage)
	}
	ps := st.Tune.Parameters
	p := cvd.TuneProblem{
		Build:   st.Tuned,
		Lab:     lab,
		Weights: st.Tune.Weights,
	}
	for _, q := range ps {
		p.X0, p.Lo, p.Hi = append(p.X0, q.Start), append(p.Lo, q.Min), append(p.Hi, q.Max)
	}
	tr := trainOf(st, o.sys)
	p.Compare.Train = &tr
	start := time.Now()
	p.Regress = &cvd.RegressSettings{Progress: func(it int, obj float64, x []float64) {
		fmt.Fprintf(o.stderr, "tune: iteration %d, objective %s (%s)\n", it, report.Sig(obj, 4), time.Since(start).Round(time.Millisecond))
	}}
	res, err := cvd.Tune(p)
	switch {
	case errors.Is(err, cvd.ErrNoWeight):
		return nil, cli.Exit(fmt.Sprintf("%s: [tune.weights] gives every quantity the laboratory measured a weight of 0: there is nothing to fit; give the quantities to fit a weight above 0", st.File), exitUsage)
	case err != nil:
		return nil, fmt.Errorf("tuning to the laboratory report: %w", err)
	}
	// "Before" is the study's own model, the one compare runs. The
	// regression may start elsewhere: an interaction pair of unequal
	// coefficients starts from their mean.
	if own, err := cvd.Compare(st.Fluid, st.Z, lab, p.Compare); err == nil && own.Saturation.P != res.Before.Saturation.P {
		o.note(fmt.Sprintf("the regression starts from a model other than the study's (an interaction pair whose coefficients differ starts from their mean): its first objective is %s, the study's %s",
			report.Sig(res.ObjectiveBefore, 4), report.Sig(own.Objective(p.Weights), 4)))
		res.Before, res.ObjectiveBefore = own, own.Objective(p.Weights)
	}
	return res, nil
}

// tuneReport shows the regression res of the study's parameters in sys.
func tuneReport(st *study.Study, sys units.System, res *cvd.TuneResult) *Report {
	pU := sys.Unit(units.Pressure)
	fit := res.Fit
	ps := st.Tune.Parameters
	r := &Report{
		Name:    "tuning",
		Section: "Tuning to the laboratory",
		Title:   fmt.Sprintf("%s tuned to the laboratory report", fluidName(st)),
		Fields: []Field{
			{Column: Column{Name: "parameter_count", Label: "Parameters"}, Value: len(ps)},
			{Column: Column{Name: "measurements", Label: "Measurements fitted"}, Value: len(fit.Residuals)},
			{Column: Column{Name: "objective_before", Label: "Objective before tuning", Format: report.Format{Decimals: 2, MinDigits: 3, MaxDecimals: 6}}, Value: res.ObjectiveBefore},
			{Column: Column{Name: "objective_after", Label: "Objective after tuning", Format: report.Format{Decimals: 2, MinDigits: 3, MaxDecimals: 6}}, Value: res.ObjectiveAfter},
			{Column: Column{Name: "saturation_pressure_model_before", Label: "Saturation pressure, model before", Unit: pU}, Value: pU.FromSI(res.Before.Saturation.P)},
			{Column: Column{Name: "saturation_pressure_model_after", Label: "Saturation pressure, model after", Unit: pU}, Value: pU.FromSI(res.After.Saturation.P)},
		},
	}
	if res.Before.LabSaturationP > 0 {
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: "saturation_pressure_lab", Label: "Saturation pressure, laboratory", Unit: pU}, Value: pU.FromSI(res.Before.LabSaturationP)},
			Field{Column: Column{Name: "saturation_pressure_deviation_before", Label: "Saturation pressure deviation before", Unit: units.Percent, Format: report.Fixed(2)}, Value: units.Percent.FromSI(res.Before.SaturationDeviation)},
			Field{Column: Column{Name: "saturation_pressure_deviation_after", Label: "Saturation pressure deviation after", Unit: units.Percent, Format: report.Fixed(2)}, Value: units.Percent.FromSI(res.After.SaturationDeviation)})
	}
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "iterations"}, Value: fit.Iterations},
		Field{Column: Column{Name: "evaluations", Label: "Model evaluations"}, Value: fit.Evaluations},
		Field{Column: Column{Name: "failed_evaluations", Label: "Evaluations that failed"}, Value: fit.FailedEvaluations},
		Field{Column: Column{Name: "method"}, Value: methodText(fit)},
		Field{Column: Column{Name: "stop", Label: "Stopped because"}, Value: fit.Stop.String()})
	for _, q := range res.After.Quantities {
		if q.Experiment == cvd.Saturation {
			continue
		}
		lq := quantityOf(q.Name, sys)
		before := res.Before.Quantity(q.Name)
		r.Fields = append(r.Fields,
			Field{Column: Column{Name: q.Name + "_aad_before", Label: "AAD " + lowerFirst(lq.label) + " before", Symbol: lq.diff, Format: lq.format, Verbose: isGasComponent(q.Name)}, Value: lq.of(before.Stats.AAD)},
			Field{Column: Column{Name: q.Name + "_aad_after", Label: "AAD " + lowerFirst(lq.label) + " after", Symbol: lq.diff, Format: lq.format, Verbose: isGasComponent(q.Name)}, Value: lq.of(q.Stats.AAD)})
	}
	if fit.Fallback != "" {
		r.Note("the regression turned from Levenberg-Marquardt to Nelder-Mead: " + fit.Fallback)
	}
	if !fit.Stop.Converged() {
		r.Warn(fmt.Sprintf("the regression did not converge: %s after %d iterations; the parameters are the best found, not a minimum", fit.Stop, fit.Iterations))
	}

	// The statistics before and after, in the deviations minimised.
	stats := Table{Name: "statistics", Title: "deviations per quantity before and after tuning (relative ones in %, absolute ones in % points)",
		Columns: []Column{
			{Name: "quantity"}, {Name: "experiment"}, {Name: "points"}, {Name: "weight", Format: report.Format{Decimals: 1, MinDigits: 1, MaxDecimals: 3}},
			{Name: "aad_before", Label: "AAD before", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "aad_after", Label: "AAD after", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "bias_before", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "bias_after", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "max_deviation_before", Unit: units.Percent, Format: report.Fixed(2)},
			{Name: "max_deviation_after", Unit: units.Percent, Format: report.Fixed(2)},
		}}
	for i, q := range res.After.Quantities {
		b, a := deviationStats(res.Before.Quantities[i]), deviationStats(q)
		stats.Rows = append(stats.Rows, []any{quantityOf(q.Name, sys).label, q.Experiment.String(), a.Count, cvd.Weight(st.Tune.Weights, q.Name),
			100 * b.AAD, 100 * a.AAD, 100 * b.Bias, 100 * a.Bias, 100 * b.MaxDeviation, 100 * a.MaxDeviation})
	}

	// The parameters.
	params := Table{Name: "parameters", Title: "tuned parameters (properties as multipliers of the study's value; interaction coefficients as themselves)",
		Columns: []Column{
			{Name: "parameter"}, {Name: "kind"},
			{Name: "start", Format: report.Fixed(4)}, {Name: "tuned", Format: report.Fixed(4)},
			{Name: "min", Format: report.Fixed(4)}, {Name: "max", Format: report.Fixed(4)},
			{Name: "standard_error", Format: report.Format{Decimals: 4, MinDigits: 2, MaxDecimals: 6}},
			{Name: "at_bound", Label: "At a bound"},
		}}
	for i, q := range ps {
		kind := "multiplier"
		if !q.Multiplier() {
			kind = "coefficient"
		}
		var se any
		if fit.StdErrKnown {
			se = fit.StdErr[i]
		}
		bound := ""
		switch {
		case fit.AtBound[i] == cvd.AtLowerBound:
			bound = "lower"
		case fit.AtBound[i] == cvd.AtUpperBound:
			bound = "upper"
		}
		params.Rows = append(params.Rows, []any{q.Name(), kind, q.Start, res.X[i], q.Min, q.Max, se, bound})
		if bound != "" {
			r.Warn(fmt.Sprintf("%s ends at its %s bound (%s): the data would move it further; widen the bound in %s if the value stays physical, or tune another property",
				q.Name(), bound, report.Sig(res.X[i], 4), q.Key))
		}
	}
	if !fit.StdErrKnown {
		atBound := false
		for _, b := range fit.AtBound {
			atBound = atBound || b != cvd.InsideBounds
		}
		if atBound {
			r.Note("the standard errors of the parameters are unknown: a parameter at its bound is not free, and the others' are not computed")
		} else {
			r.Note("the standard errors of the parameters are unknown: the data do not determine every free parameter (fewer measurements than parameters, or parameters the fit cannot tell apart)")
		}
	}

	// The tuned values of the components.
	r.Tables = append(r.Tables, stats, params, tunedComponentsTable(st, sys, res))
	if fit.StdErrKnown && len(ps) > 1 {
		labels := make([]string, len(ps))
		for i, q := range ps {
			labels[i] = q.Name()
		}
		r.Matrix = &report.Matrix{Name: "correlation", Title: "correlation of the tuned parameters", Labels: labels, Values: fit.Correlation, Format: report.Fixed(3)}
		for i := range ps {
			for j := range i {
				if math.Abs(fit.Correlation[i][j]) > correlationLimit {
					r.Warn(fmt.Sprintf("%s and %s correlate at %.3f: the laboratory data cannot tell them apart, and the fit trades one for the other; tune one of them, or add data that separates them",
						ps[j].Name(), ps[i].Name(), fit.Correlation[i][j]))
				}
			}
		}
	}
	hist := Table{Name: "objective_history", Title: "objective at each iteration", Detail: true,
		Columns: []Column{{Name: "iteration"}, {Name: "objective", Format: report.Format{Decimals: 2, MinDigits: 3, MaxDecimals: 6}}}}
	fig := &report.Figure{Name: "tune-objective", Title: "Tuning: objective by iteration", Caption: "Weighted sum of squared deviations from the laboratory report at each iteration of the regression.",
		X: report.Axis{Label: "Iteration"}, Y: report.Axis{Label: "Objective", Log: true}}
	obj := report.Series{Label: "Objective", Style: report.LinePoints}
	for i, v := range fit.History {
		hist.Rows = append(hist.Rows, []any{i, v})
		if v > 0 {
			obj.X, obj.Y = append(obj.X, float64(i)), append(obj.Y, v)
		}
	}
	fig.Series = []report.Series{obj}
	r.Tables = append(r.Tables, hist)
	for _, q := range res.After.Quantities {
		if q.Experiment == cvd.Saturation || isGasComponent(q.Name) {
			continue
		}
		t := pointsTable(q, sys)
		t.Name, t.Title, t.Detail = q.Name+"_after", t.Title+", after tuning", true
		r.Tables = append(r.Tables, t)
	}
	r.Figures = append(comparisonFigures(sys, []*cvd.Comparison{res.Before, res.After}, []string{"Model before tuning", "Model after tuning"}), fig)
	for _, f := range r.Figures[:len(r.Figures)-1] {
		f.Name = strings.Replace(f.Name, "lab-", "tune-", 1)
	}
	return r
}

// deviationStats are the statistics of q's deviations as tuning measures
// them, as fractions (cvd.Deviation over 100).
func deviationStats(q cvd.QuantityComparison) cvd.Stats {
	devs := make([]cvd.PointComparison, len(q.Points))
	for i, p := range q.Points {
		devs[i] = cvd.PointComparison{P: p.P, Model: cvd.Deviation(q.Kind, p) / 100}
	}
	return cvd.StatsOf(devs)
}

// tunedComponentsTable lists the tuned properties of every component they
// change, before and after, in sys.
func tunedComponentsTable(st *study.Study, sys units.System, res *cvd.TuneResult) Table {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	t := Table{Name: "tuned_components", Title: "tuned properties of the components",
		Columns: []Column{{Name: "component"}, {Name: "property"}, {Name: "unit"},
			{Name: "study", Label: "Study's value", Format: report.Format{Decimals: 4, MinDigits: 4, MaxDecimals: 6}},
			{Name: "tuned", Label: "Tuned value", Format: report.Format{Decimals: 4, MinDigits: 4, MaxDecimals: 6}}}}
	before, after := st.Fluid, res.Fluid
	for _, q := range st.Tune.Parameters {
		switch q.Property {
		case study.TuneInteraction:
			continue
		case study.TuneMolarMass:
			t.Rows = append(t.Rows, []any{q.Component, "molar mass", "g/mol", 1000 * st.PlusMolarMass(), 1000 * st.PlusMolarMass() * res.X[indexOf(st, q)]})
			continue
		}
		for _, i := range st.Components(q.Component) {
			b, a := before.Component(i), after.Component(i)
			var name, unit string
			var vb, va float64
			switch q.Property {
			case study.TuneTc:
				name, unit, vb, va = "critical temperature", tU.Symbol, tU.FromSI(b.Tc), tU.FromSI(a.Tc)
			case study.TunePc:
				name, unit, vb, va = "critical pressure", pU.Symbol, pU.FromSI(b.Pc), pU.FromSI(a.Pc)
			case study.TuneOmega:
				name, vb, va = "acentric factor", b.Omega, a.Omega
			case study.TuneShift:
				name, vb, va = "volume shift", b.Shift, a.Shift
			}
			t.Rows = append(t.Rows, []any{a.Name, name, unit, vb, va})
		}
	}
	return t
}

func indexOf(st *study.Study, q study.TuneParameter) int {
	for i, p := range st.Tune.Parameters {
		if p.Key == q.Key {
			return i
		}
	}
	return 0
}

// tunedHeader is the comment that heads a tuned study: when, from what,
// and how well.
func tunedHeader(st *study.Study, sys units.System, res *cvd.TuneResult) []string {
	h := []string{
		fmt.Sprintf("# Tuned by dewcell tune on %s from %s, to the laboratory report of its [lab] section.", time.Now().Format("2006-01-02"), st.File),
		fmt.Sprintf("# Objective (weighted sum of squared deviations) %s before, %s after; %d iterations, stopped because: %s.",
			report.Sig(res.ObjectiveBefore, 4), report.Sig(res.ObjectiveAfter, 4), res.Fit.Iterations, res.Fit.Stop),
	}
	if res.Before.LabSaturationP > 0 {
		h = append(h, fmt.Sprintf("# Saturation pressure: laboratory %s, model %s before (%+.2f %%), %s after (%+.2f %%).",
			pressureNote(sys, res.Before.LabSaturationP), pressureNote(sys, res.Before.Saturation.P), 100*res.Before.SaturationDeviation,
			pressureNote(sys, res.After.Saturation.P), 100*res.After.SaturationDeviation))
	}
	for i, q := range st.Tune.Parameters {
		h = append(h, fmt.Sprintf("# %s: %s (start %s, bounds %s to %s)", q.Name(), report.Sig(res.X[i], 6), report.Sig(q.Start, 4), report.Sig(q.Min, 4), report.Sig(q.Max, 4)))
	}
	h = append(h, "# "+cautionText+".", "")
	return h
}

// methodText names the methods the regression used, in order.
func methodText(fit *cvd.RegressResult) string {
	var names []string
	for _, m := range fit.Methods {
		names = append(names, m.String())
	}
	if len(names) == 0 {
		return "none"
	}
	return strings.Join(names, ", then ")
}
