package main

import (
	"errors"
	"fmt"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/eos"
)

// The default pressures of expand: these multiples of the saturation
// pressure, the saturation pressure itself, then expandStepsBelow even steps
// down to the abandonment pressure.
var expandAbove = []float64{1.3, 1.2, 1.1, 1.05}

const expandStepsBelow = 10

func expandCommand() *cli.Command {
	return studyCommand("expand",
		"simulated constant-composition expansion: relative volume, liquid volume, Z-factor and compressibility versus pressure",
		[]cli.Flag{
			&cli.StringFlag{Name: flagPressures, Usage: "the pressures, in any order, comma-separated, each with its unit: `LIST` such as \"5000 psia, 4000 psia, 3000 psia\" (default: 1.3, 1.2, 1.1 and 1.05 times the saturation pressure, the saturation pressure, then 10 even steps down to reservoir.abandonment_pressure)"},
			&cli.StringFlag{Name: flagTemperature, Usage: "temperature `T` with its unit, e.g. \"220 degF\" (default: the reservoir temperature)"},
			plotFlag(),
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			t, err := temperatureOrReservoir(c, st)
			if err != nil {
				return err
			}
			var ps []float64
			if c.IsSet(flagPressures) {
				if ps, err = parsePressures(c, flagPressures, st.Atmospheric); err != nil {
					return err
				}
			} else {
				sat, err := upperSaturation(st, o.sys, t)
				if err != nil {
					return err
				}
				if ps, err = expandPressures(st, o.sys, sat); err != nil {
					return err
				}
			}
			e, err := cvd.Expand(st.Fluid, st.Z, t, ps, nil)
			if err == nil && len(e.Steps) != len(ps) {
				err = fmt.Errorf("%d pressures computed of %d", len(e.Steps), len(ps))
			}
			if errors.Is(err, eos.ErrNoSaturation) {
				return fmt.Errorf("no saturation point at %s: the fluid is one phase at every pressure there (is the temperature above the cricondentherm?): %w", temperatureText(o.sys, t), err)
			}
			if err != nil {
				return fmt.Errorf("constant-composition expansion at %s: %w", temperatureText(o.sys, t), err)
			}
			return o.emitPlots(c, expansionReport(st, o.sys, e))
		})
}

// expandPressures are the default pressures of expand: expandAbove times the
// saturation pressure, the saturation pressure, then expandStepsBelow even
// steps down to the study's abandonment pressure.
func expandPressures(st *study.Study, sys units.System, sat eos.Saturation) ([]float64, error) {
	ps, pa := sat.P, st.Reservoir.AbandonmentPressure
	point := sat.Type.String() + " point"
	switch {
	case pa == 0:
		return nil, cli.Exit(fmt.Sprintf("expand needs its pressures: give --%s, or reservoir.abandonment_pressure in %s for the default steps down to it",
			flagPressures, st.File), exitUsage)
	case pa >= ps:
		return nil, cli.Exit(fmt.Sprintf("%s: reservoir.abandonment_pressure (%s) is not below the %s (%s) at %s; the default steps run from the %s down to it; give --%s instead",
			st.File, pressureText(sys, pa), point, pressureText(sys, ps), temperatureText(sys, sat.T), point, flagPressures), exitUsage)
	}
	var list []float64
	for _, f := range expandAbove {
		list = append(list, f*ps)
	}
	list = append(list, ps)
	for k := 1; k <= expandStepsBelow; k++ {
		list = append(list, ps-(ps-pa)*float64(k)/expandStepsBelow)
	}
	return list, nil
}

// expansionReport shows e in sys. Above the saturation point a row has the
// single-phase Z and compressibility, below it the two-phase Z; the liquid
// volume is 0 above a dew point and missing above a bubble point, where the
// whole volume is liquid.
func expansionReport(st *study.Study, sys units.System, e *cvd.Expansion) *Report {
	tU, pU, vU, cU := sys.Unit(units.Temperature), sys.Unit(units.Pressure), sys.Unit(units.MolarVolume), sys.Unit(units.Compressibility)
	satName := "dew_pressure"
	if e.Saturation.Type == eos.Bubble {
		satName = "bubble_pressure"
	}
	r := &Report{
		Name:    "expansion",
		Section: "Constant-composition expansion",
		Title:   fmt.Sprintf("constant-composition expansion of %s at %s", fluidName(st), temperatureText(sys, e.T)),
		Fields: []Field{
			{Column: Column{Name: "temperature", Unit: tU}, Value: tU.FromSI(e.T)},
			{Column: Column{Name: "type"}, Value: e.Saturation.Type.String()},
			{Column: Column{Name: satName, Unit: pU}, Value: pU.FromSI(e.Saturation.P)},
			{Column: Column{Name: "z_saturation", Label: "Z at saturation", Format: report.ZFactor}, Value: e.Saturation.Feed.Z},
			{Column: Column{Name: "saturation_volume", Unit: vU}, Value: vU.FromSI(e.VSat)},
		},
	}
	steps := Table{
		Name:  "steps",
		Title: "expansion steps (volumes relative to the volume at the saturation point)",
		Columns: []Column{
			{Name: "pressure", Unit: pU},
			{Name: "relative_volume", Format: report.Fixed(4)},
			{Name: "liquid_volume", Unit: units.Percent},
			{Name: "z", Format: report.ZFactor},
			{Name: "z_two_phase", Format: report.ZFactor},
			{Name: "vapor_fraction", Label: "Vapour mole fraction", Format: report.MoleFraction},
			{Name: "compressibility", Unit: cU},
		},
	}
	relVol := report.Series{Label: "Relative volume", Style: report.LinePoints}
	liqVol := report.Series{Label: "Liquid volume", Style: report.LinePoints}
	for _, s := range e.Steps {
		relVol.X, relVol.Y = append(relVol.X, pU.FromSI(s.P)), append(relVol.Y, s.RelativeVolume)
		switch {
		case s.TwoPhase:
			liqVol.X, liqVol.Y = append(liqVol.X, pU.FromSI(s.P)), append(liqVol.Y, units.Percent.FromSI(s.LiquidVolume))
		case e.Saturation.Type == eos.Dew: // no liquid at and above the dew point
			liqVol.X, liqVol.Y = append(liqVol.X, pU.FromSI(s.P)), append(liqVol.Y, 0)
		}
		var liq, z, z2, comp any
		if s.TwoPhase {
			liq, z2 = units.Percent.FromSI(s.LiquidVolume), s.Z
		} else {
			z, comp = s.Z, cU.FromSI(s.Compressibility)
			if e.Saturation.Type == eos.Dew {
				liq = 0.0
			}
		}
		steps.Rows = append(steps.Rows, []any{pU.FromSI(s.P), s.RelativeVolume, liq, z, z2, s.VaporFraction, comp})
	}
	r.Tables = []Table{steps}
	sat := report.Capitalize(e.Saturation.Type.String()) + " point"
	r.Figures = []*report.Figure{{
		Name:    "cce-relative-volume",
		Title:   "Constant-composition expansion: relative volume",
		Caption: "Volume of the fluid relative to its volume at the saturation point, at constant composition and temperature.",
		X:       report.Axis{Label: "Pressure", Unit: pU},
		Y:       report.Axis{Label: "Relative volume V/Vsat"},
		Series:  []report.Series{relVol},
		Marks:   []report.Mark{{Label: sat, X: pU.FromSI(e.Saturation.P), Y: 1}},
	}}
	if len(liqVol.X) > 1 {
		r.Figures = append(r.Figures, &report.Figure{
			Name:    "cce-liquid-volume",
			Title:   "Constant-composition expansion: liquid volume",
			Caption: "Liquid as a share of the total volume below the saturation point, at constant composition.",
			X:       report.Axis{Label: "Pressure", Unit: pU},
			Y:       report.Axis{Label: "Liquid volume", Unit: units.Percent},
			Series:  []report.Series{liqVol},
		})
	}
	return r
}
