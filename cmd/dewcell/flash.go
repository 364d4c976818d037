package main

import (
	"fmt"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
)

func flashCommand() *cli.Command {
	return studyCommand("flash",
		"one pressure–temperature flash: phase split, phase compositions, Z-factors, densities",
		[]cli.Flag{
			&cli.StringFlag{Name: flagPressure, Usage: "flash pressure `P` with its unit, e.g. \"3000 psia\" (required)"},
			&cli.StringFlag{Name: flagTemperature, Usage: "flash temperature `T` with its unit, e.g. \"220 degF\" (default: the reservoir temperature)"},
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			if !c.IsSet(flagPressure) {
				return cli.Exit(`flash needs --pressure, e.g. --pressure "3000 psia"`, exitUsage)
			}
			p, _, err := quantityFlag(c, flagPressure, units.Pressure, st.Atmospheric)
			if err != nil {
				return err
			}
			if p <= 0 {
				return cli.Exit("--pressure: must be above zero absolute pressure", exitUsage)
			}
			t, err := temperatureOrReservoir(c, st)
			if err != nil {
				return err
			}
			r, err := flashReport(st, o.sys, t, p)
			if err != nil {
				return err
			}
			return o.emit(r)
		})
}

// flashReport flashes the study's feed at t (K) and p (Pa). The warnings
// say when the split shown is not the equilibrium.
func flashReport(st *study.Study, sys units.System, t, p float64) (*Report, error) {
	var res eos.FlashResult
	if err := eos.NewFlasher(st.Fluid, nil).Flash(&res, t, p, st.Z); err != nil {
		return nil, fmt.Errorf("flash at %s: %w", stateText(sys, t, p), err)
	}
	var warnings []string
	tU, pU, dU := sys.Unit(units.Temperature), sys.Unit(units.Pressure), sys.Unit(units.Density)
	liquid, vapor := true, true
	phaseState := "two-phase"
	if res.ThreePhase {
		phaseState = "three-phase"
		warnings = append(warnings, fmt.Sprintf("flash at %s: the feed lies in a three-phase region: a third phase would lower the Gibbs energy of the two-phase split shown, which is the split of lowest Gibbs energy found, not the equilibrium; this tool computes two phases at most",
			stateText(sys, t, p)))
	}
	if res.Phases == 1 { // only the one phase's properties exist
		liquid, vapor = res.Single == eos.Liquid, res.Single != eos.Liquid
		phaseState = "vapor"
		if liquid {
			phaseState = "liquid"
		}
	}
	only := func(ok bool, v float64) any {
		if !ok {
			return nil
		}
		return v
	}
	r := &Report{
		Name:    "flash",
		Section: "Flash",
		Title:   fmt.Sprintf("flash of %s at %s", fluidName(st), stateText(sys, t, p)),
		Fields: []Field{
			{Column: Column{Name: "pressure", Unit: pU}, Value: pU.FromSI(p)},
			{Column: Column{Name: "temperature", Unit: tU}, Value: tU.FromSI(t)},
			{Column: Column{Name: "phases"}, Value: res.Phases},
			{Column: Column{Name: "state"}, Value: phaseState},
			{Column: Column{Name: "three_phase"}, Value: res.ThreePhase},
			{Column: Column{Name: "vapor_fraction", Label: "Vapour mole fraction", Format: report.MoleFraction}, Value: res.Beta},
			{Column: Column{Name: "z_liquid", Format: report.ZFactor}, Value: only(liquid, res.L.Z)},
			{Column: Column{Name: "z_vapor", Label: "Z vapour", Format: report.ZFactor}, Value: only(vapor, res.V.Z)},
			{Column: Column{Name: "density_liquid", Unit: dU}, Value: only(liquid, dU.FromSI(res.L.Rho))},
			{Column: Column{Name: "density_vapor", Label: "Density vapour", Unit: dU}, Value: only(vapor, dU.FromSI(res.V.Rho))},
			{Column: Column{Name: "molar_mass_liquid", Unit: units.GPerMol}, Value: only(liquid, units.GPerMol.FromSI(res.L.M))},
			{Column: Column{Name: "molar_mass_vapor", Label: "Molar mass vapour", Unit: units.GPerMol}, Value: only(vapor, units.GPerMol.FromSI(res.V.M))},
			{Column: Column{Name: "iterations", Verbose: true}, Value: res.Iter},
			{Column: Column{Name: "residual", Verbose: true, Format: report.Diagnostic}, Value: res.Resid},
		},
	}
	names := componentNames(st.Fluid)
	r.Vectors = append(r.Vectors, Vector{Name: "feed_composition", Label: "component", Labels: names, Values: st.Z})
	if liquid {
		r.Vectors = append(r.Vectors, Vector{Name: "liquid_composition", Label: "component", Labels: names, Values: res.X})
	}
	if vapor {
		r.Vectors = append(r.Vectors, Vector{Name: "vapor_composition", Title: "Vapour composition", Label: "component", Labels: names, Values: res.Y})
	}
	r.Warn(warnings...)
	return r, nil
}

func componentNames(fl *eos.Fluid) []string {
	names := make([]string, fl.N())
	for i := range names {
		names[i] = fl.Component(i).Name
	}
	return names
}

func fluidName(st *study.Study) string {
	if st.Title != "" {
		return st.Title
	}
	return st.File
}

// stateText writes a temperature and a pressure for people.
func stateText(sys units.System, t, p float64) string {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	return fmt.Sprintf("%.6g %s and %.6g %s", tU.FromSI(t), tU.Symbol, pU.FromSI(p), pU.Symbol)
}
