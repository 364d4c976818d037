package main

import (
	"errors"
	"fmt"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
)

func satpointCommand() *cli.Command {
	return studyCommand("satpoint",
		"saturation pressures at a temperature: dew or bubble point, and the lower dew point where one exists",
		[]cli.Flag{
			&cli.StringFlag{Name: flagTemperature, Usage: "temperature `T` with its unit, e.g. \"220 degF\" (default: the reservoir temperature)"},
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			t, err := temperatureOrReservoir(c, st)
			if err != nil {
				return err
			}
			r, _, err := satpointReport(st, o.sys, t)
			if err != nil {
				return err
			}
			return o.emit(r)
		})
}

// satpointReport finds the saturation pressures of the study's feed at t (K):
// the upper one (dew point of a gas condensate, bubble point of an oil) and
// the lower dew point when there is one. It also returns the upper point.
func satpointReport(st *study.Study, sys units.System, t float64) (*Report, eos.Saturation, error) {
	tU, pU, dU := sys.Unit(units.Temperature), sys.Unit(units.Pressure), sys.Unit(units.Density)
	at := fmt.Sprintf("%.6g %s", tU.FromSI(t), tU.Symbol)
	up, err := upperSaturation(st, sys, t)
	if err != nil {
		return nil, up, err
	}
	low, err := eos.LowerDewPoint(st.Fluid, t, st.Z, up.P, nil)
	hasLow := err == nil
	if err != nil && !errors.Is(err, eos.ErrNoSaturation) {
		return nil, up, fmt.Errorf("lower dew point at %s: %w", at, err)
	}
	upperName := "upper_dew_pressure"
	if up.Type == eos.Bubble {
		upperName = "bubble_pressure"
	}
	lowP := any(nil)
	if hasLow {
		lowP = pU.FromSI(low.P)
	}
	r := &Report{
		Name:    "saturation",
		Section: "Saturation pressures",
		Title:   fmt.Sprintf("saturation pressures of %s at %s", fluidName(st), at),
		Fields: []Field{
			{Column: Column{Name: "type"}, Value: up.Type.String()},
			{Column: Column{Name: "temperature", Unit: tU}, Value: tU.FromSI(t)},
			{Column: Column{Name: upperName, Unit: pU}, Value: pU.FromSI(up.P)},
			{Column: Column{Name: "lower_dew_pressure", Unit: pU}, Value: lowP},
			{Column: Column{Name: "z_feed", Format: report.ZFactor}, Value: up.Feed.Z},
			{Column: Column{Name: "z_incipient", Label: "Z incipient phase", Format: report.ZFactor}, Value: up.Inc.Z},
			{Column: Column{Name: "density_feed", Unit: dU}, Value: dU.FromSI(up.Feed.Rho)},
			{Column: Column{Name: "density_incipient", Label: "Density incipient phase", Unit: dU}, Value: dU.FromSI(up.Inc.Rho)},
			{Column: Column{Name: "iterations", Verbose: true}, Value: up.Iter},
			{Column: Column{Name: "residual", Verbose: true, Format: report.Diagnostic}, Value: up.Resid},
		},
	}
	names := componentNames(st.Fluid)
	r.Vectors = []Vector{
		{Name: "feed_composition", Title: "Feed", Label: "component", Labels: names, Values: st.Z},
		{Name: "incipient_composition", Title: "Incipient phase", Label: "component", Labels: names, Values: up.Incipient},
	}
	if hasLow {
		r.Vectors = append(r.Vectors, Vector{Name: "lower_incipient_composition", Title: "Incipient phase, lower dew point", Label: "component", Labels: names, Values: low.Incipient})
	}
	return r, up, nil
}
