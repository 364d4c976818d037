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
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	var warnings []string
	if msg := envelopeEndText(env, tU, pU); msg != "" {
		warnings = append(warnings, "phase envelope: "+msg)
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
	r := &Report{Name: "envelope", Title: "phase envelope of " + fluidName(st),
		Fields: []Field{{Column{Name: "trace_end"}, env.End.String()}}}
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

// envelopeEndText says in one line where the trace of env stopped and what
// the points are, in the output units; "" for a whole envelope.
func envelopeEndText(env *eos.Envelope, tU, pU units.Unit) string {
	if len(env.Points) == 0 {
		return ""
	}
	last := env.Points[len(env.Points)-1]
	at := fmt.Sprintf("%.6g %s and %.6g %s", tU.FromSI(last.T), tU.Symbol, pU.FromSI(last.P), pU.Symbol)
	branch := "the dew branch"
	if env.HasCritical {
		branch = "the bubble branch"
	}
	switch env.End {
	case eos.EndClosed:
		return ""
	case eos.EndNearCritical:
		return fmt.Sprintf("the dew branch stops at %s, within a few per cent of a critical point it could not cross; no critical point and no bubble branch are given, and the cricondenbar and cricondentherm are the extremes of the dew branch traced (the true cricondenbar can lie a little higher)", at)
	case eos.EndSecondCritical:
		return fmt.Sprintf("the bubble branch ends at %s, where it meets a second critical point; at lower temperatures the model predicts two dense phases, which are not shown", at)
	case eos.EndDensePhases:
		if !env.HasCritical {
			return fmt.Sprintf("the saturation curve reaches no vapour-liquid critical point; the dew branch is shown up to %s, where it turns into the boundary of two dense phases (a liquid-liquid region at low temperature), which is not shown", at)
		}
		return fmt.Sprintf("the bubble branch is shown down to %s, where it turns into the boundary of two dense phases (a liquid-liquid region at low temperature), which is not shown", at)
	case eos.EndNoContinuation:
		return fmt.Sprintf("%s ends at %s, where no saturation point continues it (typically where two dense phases take over at low temperature); the points given are converged saturation points", branch, at)
	case eos.EndPressureLimit:
		return fmt.Sprintf("%s reached %s, the highest pressure searched; the points given are converged saturation points", branch, at)
	case eos.EndLowTemperature:
		return fmt.Sprintf("%s reached %s, the lowest temperature traced", branch, at)
	}
	return fmt.Sprintf("the trace stopped after %d points, at %s", len(env.Points), at)
}
