package main

import (
	"fmt"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
)

func envelopeCommand() *cli.Command {
	return studyCommand("envelope",
		"the phase envelope: dew and bubble branches, critical point, cricondenbar, cricondentherm",
		nil, func(_ *cli.Context, o *options, st *study.Study) error {
			r, warnings, err := envelopeReport(st, o.sys, true)
			if err != nil {
				return err
			}
			o.warn(warnings...)
			return o.emit(r)
		})
}

// envelopeReport traces the phase envelope of the study's feed. The summary
// table holds the critical point (when found), the cricondenbar and the
// cricondentherm; the points table, when withPoints, every traced point.
// The warnings say where the trace stopped short.
func envelopeReport(st *study.Study, sys units.System, withPoints bool) (*Report, []string, error) {
	env, err := eos.TraceEnvelope(st.Fluid, st.Z, nil)
	if err != nil {
		return nil, nil, fmt.Errorf("phase envelope: %w", err)
	}
	var warnings []string
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	switch {
	case env.NearCritical:
		last := env.Points[len(env.Points)-1]
		warnings = append(warnings, fmt.Sprintf("phase envelope: the trace stopped at %.6g %s and %.6g %s, within a few per cent of a critical point it could not cross; no critical point and no bubble branch are given, and the cricondenbar and cricondentherm are the extremes of the dew branch traced (the true cricondenbar can lie a little higher)",
			tU.FromSI(last.T), tU.Symbol, pU.FromSI(last.P), pU.Symbol))
	case !env.HasCritical:
		warnings = append(warnings, "phase envelope: the trace reached no critical point; with a heavy tail the equation of state can turn the saturation curve up to high pressure at low temperature (a liquid-liquid region) instead")
	}
	if env.Truncated && !env.NearCritical {
		last := env.Points[len(env.Points)-1]
		warnings = append(warnings, fmt.Sprintf("phase envelope: the trace ended at %.6g %s and %.6g %s before returning to low pressure; the points given are converged saturation points",
			tU.FromSI(last.T), tU.Symbol, pU.FromSI(last.P), pU.Symbol))
	}
	cols := []Column{{Name: "type"}, {Name: "temperature", Unit: tU}, {Name: "pressure", Unit: pU}}
	row := func(kind string, t, p float64) []any { return []any{kind, tU.FromSI(t), pU.FromSI(p)} }
	summary := Table{Name: "summary", Title: "critical point and extremes", Columns: cols}
	if env.HasCritical {
		summary.Rows = append(summary.Rows, row("critical", env.Critical[0], env.Critical[1]))
	}
	summary.Rows = append(summary.Rows,
		row("cricondenbar", env.Cricondenbar[0], env.Cricondenbar[1]),
		row("cricondentherm", env.Cricondentherm[0], env.Cricondentherm[1]))
	r := &Report{Name: "envelope", Title: "phase envelope of " + fluidName(st)}
	if withPoints {
		points := Table{Name: "points", Title: "envelope points", Columns: cols}
		for _, pt := range env.Points {
			points.Rows = append(points.Rows, row(pt.Type.String(), pt.T, pt.P))
		}
		r.Tables = append(r.Tables, points)
	}
	r.Tables = append(r.Tables, summary)
	return r, warnings, nil
}
