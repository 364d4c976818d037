package main

import (
	"fmt"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
)

func envelopeCommand() *cli.Command {
	return studyCommand("envelope",
		"the phase envelope: dew and bubble branches, critical point, cricondenbar, cricondentherm",
		[]cli.Flag{plotFlag()}, func(c *cli.Context, o *options, st *study.Study) error {
			r, err := envelopeReport(st, o.sys)
			if err != nil {
				return err
			}
			return o.emitPlots(c, r)
		})
}

// envelopeReport traces the phase envelope of the study's feed: the
// critical point (when found), the cricondenbar and the cricondentherm,
// every traced point (a detail table), the figure with the reservoir's
// temperature and its initial and saturation points, and a warning where
// the trace stopped short.
func envelopeReport(st *study.Study, sys units.System) (*Report, error) {
	env, err := eos.TraceEnvelope(st.Fluid, st.Z, nil)
	if err != nil {
		return nil, fmt.Errorf("phase envelope: %w", err)
	}
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	r := &Report{Name: "envelope", Section: "Phase envelope", Title: "phase envelope of " + fluidName(st),
		Fields: []Field{{Column: Column{Name: "trace_end", Label: "End of the trace"}, Value: env.End.String()}}}
	if msg := envelopeEndText(env, tU, pU); msg != "" {
		r.Warn(msg)
	}
	cols := []Column{{Name: "type", Label: "Point"}, {Name: "temperature", Unit: tU}, {Name: "pressure", Unit: pU}}
	row := func(kind string, t, p float64) []any { return []any{kind, tU.FromSI(t), pU.FromSI(p)} }
	summary := Table{Name: "summary", Part: "extremes", Title: "critical point and extremes", Columns: cols}
	if env.HasCritical {
		summary.Rows = append(summary.Rows, row("critical", env.Critical[0], env.Critical[1]))
	}
	summary.Rows = append(summary.Rows,
		row("cricondenbar", env.Cricondenbar[0], env.Cricondenbar[1]),
		row("cricondentherm", env.Cricondentherm[0], env.Cricondentherm[1]))
	points := Table{Name: "points", Title: "envelope points", Columns: cols, Detail: true}
	for _, pt := range env.Points {
		points.Rows = append(points.Rows, row(pt.Type.String(), pt.T, pt.P))
	}
	r.Tables = []Table{points, summary}
	r.Figures = []*report.Figure{envelopeFigure(st, sys, env)}
	return r, nil
}

// envelopeFigure draws the dew and bubble branches of env with its
// critical point and extremes, the reservoir temperature, and the
// reservoir's initial state and saturation point on it.
func envelopeFigure(st *study.Study, sys units.System, env *eos.Envelope) *report.Figure {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	f := &report.Figure{
		Name:  "phase-envelope",
		Title: "Phase envelope",
		Caption: "Saturation pressure against temperature from the equation of state: the dew branch, and the bubble branch beyond the critical point; " +
			"the reservoir depletes along its temperature line.",
		X: report.Axis{Label: "Temperature", Unit: tU},
		Y: report.Axis{Label: "Pressure", Unit: pU},
	}
	var dew, bubble report.Series
	dew = report.Series{Label: "Dew points", Style: report.Line}
	bubble = report.Series{Label: "Bubble points", Style: report.Dashed}
	for _, pt := range env.Points {
		s := &dew
		if pt.Type == eos.Bubble {
			s = &bubble
		}
		s.X = append(s.X, tU.FromSI(pt.T))
		s.Y = append(s.Y, pU.FromSI(pt.P))
	}
	// The branches meet at the critical point.
	if env.HasCritical && len(dew.X) > 0 && len(bubble.X) > 0 {
		tc, pc := tU.FromSI(env.Critical[0]), pU.FromSI(env.Critical[1])
		dew.X, dew.Y = append(dew.X, tc), append(dew.Y, pc)
		bubble.X, bubble.Y = append([]float64{tc}, bubble.X...), append([]float64{pc}, bubble.Y...)
	}
	for _, s := range []report.Series{dew, bubble} {
		if len(s.X) > 0 {
			f.Series = append(f.Series, s)
		}
	}
	if env.HasCritical {
		f.Marks = append(f.Marks, report.Mark{Label: "Critical point", X: tU.FromSI(env.Critical[0]), Y: pU.FromSI(env.Critical[1])})
	}
	f.Marks = append(f.Marks,
		report.Mark{Label: "Cricondenbar", X: tU.FromSI(env.Cricondenbar[0]), Y: pU.FromSI(env.Cricondenbar[1])},
		report.Mark{Label: "Cricondentherm", X: tU.FromSI(env.Cricondentherm[0]), Y: pU.FromSI(env.Cricondentherm[1])})
	if t := st.Reservoir.Temperature; t > 0 {
		f.Lines = append(f.Lines, report.RefLine{Label: "Reservoir temperature", Value: tU.FromSI(t), Vertical: true})
		if pi := st.Reservoir.InitialPressure; pi > 0 {
			f.Marks = append(f.Marks, report.Mark{Label: "Initial state", X: tU.FromSI(t), Y: pU.FromSI(pi)})
		}
		if sat, err := eos.UpperSaturation(st.Fluid, t, st.Z, nil); err == nil {
			f.Marks = append(f.Marks, report.Mark{Label: report.Capitalize(sat.Type.String()) + " point at reservoir temperature", X: tU.FromSI(t), Y: pU.FromSI(sat.P)})
		}
	}
	return f
}

// envelopeEndText says in one line where the trace of env stopped and what
// the points are, in the output units; "" for a whole envelope.
func envelopeEndText(env *eos.Envelope, tU, pU units.Unit) string {
	if len(env.Points) == 0 {
		return ""
	}
	last := env.Points[len(env.Points)-1]
	at := report.Quantity(tU.FromSI(last.T), tU) + " and " + report.Quantity(pU.FromSI(last.P), pU)
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
