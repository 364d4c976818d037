package main

import (
	"errors"
	"fmt"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/eos"
)

// Flags of the simulated experiments.
const (
	flagPressures   = "pressures"
	flagSteps       = "steps"
	flagFromInitial = "from-initial"
)

// Limits of --steps.
const (
	defaultDepletionSteps = 8
	maxSteps              = 1000
)

// atDewTolerance is how far, relative, an initial pressure may lie from the
// computed dew point and still count as the dew point itself: a study that
// copies a dew point to its printed digits starts at that dew point.
const atDewTolerance = 1e-6

// atDewToleranceText is atDewTolerance for people.
const atDewToleranceText = "one part in a million"

func depleteCommand() *cli.Command {
	return studyCommand("deplete",
		"simulated constant-volume depletion at the reservoir temperature, in the laboratory's steps: liquid dropout, produced moles, Z-factors, phase properties and surface yields per step, and the maximum dropout of the continuous depletion. The cumulative yields are the laboratory's, whose finite steps produce leaner gas than a reservoir does: for the reservoir's recovery use recover",
		[]cli.Flag{
			&cli.StringFlag{Name: flagPressures, Usage: "the depletion steps, falling, comma-separated, each with its unit: `LIST` such as \"3500 psia, 3000 psia, 2500 psia\" (default: the study's [depletion] pressures)"},
			&cli.IntFlag{Name: flagSteps, Usage: fmt.Sprintf("`N` even steps, 1 to %d, from the dew point down to reservoir.abandonment_pressure, instead of the study's [depletion] pressures", maxSteps),
				DefaultText: fmt.Sprintf("the study's [depletion] pressures, or %d steps without them", defaultDepletionSteps)},
			&cli.BoolFlag{Name: flagFromInitial, Usage: "start at reservoir.initial_pressure above the dew point; the steps may then lie above the dew point"},
			plotFlag(),
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			r, err := depleteReport(c, o, st)
			if err != nil {
				return err
			}
			return o.emitPlots(c, r)
		})
}

// parsePressures reads a comma-separated list of pressures with their units
// from flag name. Every pressure must be above zero.
func parsePressures(c *cli.Context, name string, atm float64) ([]float64, error) {
	s := c.String(name)
	if strings.TrimSpace(s) == "" {
		return nil, cli.Exit(fmt.Sprintf(`--%s: empty list; want pressures with their units separated by commas, such as "3500 psia, 3000 psia"`, name), exitUsage)
	}
	var ps []float64
	for i, item := range strings.Split(s, ",") {
		if strings.TrimSpace(item) == "" {
			return nil, cli.Exit(fmt.Sprintf(`--%s: item %d is empty; want pressures with their units separated by commas, such as "3500 psia, 3000 psia"`, name, i+1), exitUsage)
		}
		p, err := units.ParseState(item, units.Pressure, atm)
		if err != nil {
			return nil, cli.Exit(fmt.Sprintf("--%s: item %d: %v", name, i+1, err), exitUsage)
		}
		if p <= 0 {
			return nil, cli.Exit(fmt.Sprintf("--%s: item %d (%s): must be above zero absolute pressure", name, i+1, strings.TrimSpace(item)), exitUsage)
		}
		ps = append(ps, p)
	}
	return ps, nil
}

// upperSaturation finds the saturation point of the study's feed at t, with
// the wording of satpoint when there is none.
func upperSaturation(st *study.Study, sys units.System, t float64) (eos.Saturation, error) {
	tU := sys.Unit(units.Temperature)
	at := fmt.Sprintf("%.6g %s", tU.FromSI(t), tU.Symbol)
	sat, err := eos.UpperSaturation(st.Fluid, t, st.Z, nil)
	if errors.Is(err, eos.ErrNoSaturation) {
		return sat, fmt.Errorf("no saturation point at %s: the fluid is one phase at every pressure there (is the temperature above the cricondentherm?): %w", at, err)
	}
	if err != nil {
		return sat, fmt.Errorf("saturation pressure at %s: %w", at, err)
	}
	return sat, nil
}

// pressureNote writes a pressure for the notes and warnings of a result,
// as the tables write it; pressureText, with six significant digits, is
// for the messages that compare a given pressure with a computed one.
func pressureNote(sys units.System, p float64) string {
	return report.Quantity(sys.Unit(units.Pressure).FromSI(p), sys.Unit(units.Pressure))
}

// temperatureNote writes a temperature as pressureNote writes a pressure.
func temperatureNote(sys units.System, t float64) string {
	return report.Quantity(sys.Unit(units.Temperature).FromSI(t), sys.Unit(units.Temperature))
}

// pressureText writes a pressure for people in the output system.
func pressureText(sys units.System, p float64) string {
	pU := sys.Unit(units.Pressure)
	return fmt.Sprintf("%.6g %s", pU.FromSI(p), pU.Symbol)
}

// depletionOptions turns the flags and the study into the options of
// cvd.Deplete, checking the pressure steps against the saturation point sat
// so that a bad step is reported with the flag or key that gave it.
//
// The steps are, first found: --pressures; --steps N even steps from the
// dew point to the abandonment pressure; the study's [depletion] pressures;
// the default even steps. --from-initial starts at the initial pressure.
func depletionOptions(c *cli.Context, o *options, st *study.Study, sat eos.Saturation) (cvd.DepletionOptions, error) {
	var opt cvd.DepletionOptions
	pd, point := sat.P, sat.Type.String()+" point"
	bad := func(format string, args ...any) error {
		return cli.Exit(fmt.Sprintf(format, args...), exitUsage)
	}

	if c.Bool(flagFromInitial) {
		pi := st.Reservoir.InitialPressure
		switch {
		case pi == 0:
			return opt, bad("--%s: %s gives no reservoir.initial_pressure to start from", flagFromInitial, st.File)
		case pi < pd*(1-atDewTolerance):
			return opt, bad("--%s: reservoir.initial_pressure of %s (%s) is below the computed %s (%s): the cell would start two-phase; leave out --%s to start at the %s",
				flagFromInitial, st.File, pressureText(o.sys, pi), point, pressureText(o.sys, pd), flagFromInitial, point)
		case pi <= pd*(1+atDewTolerance):
			o.note(fmt.Sprintf("reservoir.initial_pressure of %s is the computed %s (%s) within %s: the depletion starts at the %s",
				st.File, point, pressureNote(o.sys, pd), atDewToleranceText, point))
		default:
			opt.Start = pi
		}
	}
	start, startName := pd, "the "+point
	if opt.Start > 0 {
		start, startName = opt.Start, "reservoir.initial_pressure"
	}

	// check reports the first of ps that is not below the one before or
	// not below the start; name(i) names item i in messages.
	check := func(ps []float64, name func(i int) string) error {
		for i, p := range ps {
			switch {
			case i > 0 && p >= ps[i-1]:
				return bad("%s (%s) is not below the pressure before it (%s): depletion pressures fall", name(i), pressureText(o.sys, p), pressureText(o.sys, ps[i-1]))
			case p >= start && !c.Bool(flagFromInitial):
				return bad("%s (%s) is not below the %s (%s) at %s, where the depletion starts; remove it, or add --%s to start at reservoir.initial_pressure",
					name(i), pressureText(o.sys, p), point, pressureText(o.sys, pd), temperatureText(o.sys, sat.T), flagFromInitial)
			case p >= start:
				return bad("%s (%s) is not below %s (%s), where the depletion starts", name(i), pressureText(o.sys, p), startName, pressureText(o.sys, start))
			}
		}
		return nil
	}

	switch {
	case c.IsSet(flagPressures) && c.IsSet(flagSteps):
		return opt, bad("--%s and --%s exclude each other: give the steps, or their number", flagPressures, flagSteps)
	case c.IsSet(flagPressures):
		ps, err := parsePressures(c, flagPressures, st.Atmospheric)
		if err != nil {
			return opt, err
		}
		if err := check(ps, func(i int) string { return fmt.Sprintf("--%s: item %d", flagPressures, i+1) }); err != nil {
			return opt, err
		}
		opt.Pressures = ps
		return opt, nil
	case !c.IsSet(flagSteps) && st.Depletion != nil:
		if err := check(st.Depletion, func(i int) string { return fmt.Sprintf("%s: depletion.pressures[%d]", st.File, i+1) }); err != nil {
			return opt, err
		}
		opt.Pressures = st.Depletion
		return opt, nil
	}

	opt.Steps = defaultDepletionSteps
	if c.IsSet(flagSteps) {
		opt.Steps = c.Int(flagSteps)
		if opt.Steps < 1 || opt.Steps > maxSteps {
			return opt, bad("--%s: %d, want a number of steps from 1 to %d", flagSteps, opt.Steps, maxSteps)
		}
		if st.Depletion != nil {
			o.note(fmt.Sprintf("--%s given: the [depletion] pressures of %s are not used", flagSteps, st.File))
		}
	}
	pa := st.Reservoir.AbandonmentPressure
	switch {
	case pa == 0:
		return opt, bad("deplete needs its pressure steps: give --%s, a [depletion] section, or reservoir.abandonment_pressure in %s for %d even steps down to it",
			flagPressures, st.File, opt.Steps)
	case pa >= pd:
		return opt, bad("%s: reservoir.abandonment_pressure (%s) is not below the %s (%s) at %s; the even steps run from the %s down to it; give --%s instead",
			st.File, pressureText(o.sys, pa), point, pressureText(o.sys, pd), temperatureText(o.sys, sat.T), point, flagPressures)
	}
	opt.Abandonment = pa
	return opt, nil
}

func temperatureText(sys units.System, t float64) string {
	tU := sys.Unit(units.Temperature)
	return fmt.Sprintf("%.6g %s", tU.FromSI(t), tU.Symbol)
}

// depleteReport runs the constant-volume depletion of the study's feed at
// the reservoir temperature, the produced gas of every step going through
// the study's separator train.
func depleteReport(c *cli.Context, o *options, st *study.Study) (*Report, error) {
	t := st.Reservoir.Temperature
	sat, err := upperSaturation(st, o.sys, t)
	if err != nil {
		return nil, err
	}
	opt, err := depletionOptions(c, o, st, sat)
	if err != nil {
		return nil, err
	}
	if len(st.Separator) == 0 {
		o.warnOnce(noSeparator, fmt.Sprintf("%s gives no [[separator.stage]]: the produced gas goes straight to the stock tank", st.File))
	}
	tr := trainOf(st, o.sys)
	opt.Train = &tr
	d, err := cvd.Deplete(st.Fluid, st.Z, t, opt)
	if err == nil && len(d.Steps) == 0 {
		err = errors.New("no steps were computed")
	}
	if err != nil {
		return nil, fmt.Errorf("constant-volume depletion at %s: %w", temperatureText(o.sys, t), err)
	}
	return depletionReport(st, o.sys, tr, d), nil
}

// depletionReport shows d in sys: the steps, the compositions of the
// produced gas and of the retrograde liquid (detail tables), and the
// figures of liquid dropout and produced-gas composition against pressure.
func depletionReport(st *study.Study, sys units.System, tr cvd.Train, d *cvd.Depletion) *Report {
	tU, pU, dU, vU := sys.Unit(units.Temperature), sys.Unit(units.Pressure), sys.Unit(units.Density), sys.Unit(units.MolarVolume)
	su := surfaceUnitsOf(sys)
	satName := "dew_pressure"
	if d.Dew.Type == eos.Bubble {
		satName = "bubble_pressure"
	}
	r := &Report{
		Name:    "depletion",
		Section: "Constant-volume depletion",
		Title:   fmt.Sprintf("constant-volume depletion of %s at %s", fluidName(st), temperatureText(sys, d.T)),
		Fields: append([]Field{
			{Column: Column{Name: "temperature", Unit: tU}, Value: tU.FromSI(d.T)},
			{Column: Column{Name: satName, Unit: pU}, Value: pU.FromSI(d.Dew.P)},
			{Column: Column{Name: "start_pressure", Unit: pU}, Value: pU.FromSI(d.Steps[0].P)},
			{Column: Column{Name: "cell_volume", Unit: vU}, Value: vU.FromSI(d.CellVolume)},
			{Column: Column{Name: "max_liquid_dropout", Label: "Maximum liquid dropout (continuous depletion)", Unit: units.Percent}, Value: units.Percent.FromSI(d.MaxDropout)},
			{Column: Column{Name: "max_dropout_pressure", Label: "Pressure of the maximum dropout", Unit: pU}, Value: pU.FromSI(d.MaxDropoutP)},
		}, standardFields(tr, sys)...),
	}
	names := componentNames(st.Fluid)
	cols := []Column{
		{Name: "pressure", Unit: pU},
		{Name: "liquid_dropout", Unit: units.Percent},
		{Name: "produced", Label: "Produced, cumulative", Unit: units.Percent},
		{Name: "z_gas", Format: report.ZFactor},
		{Name: "z_two_phase", Format: report.ZFactor},
		{Name: "gas_density", Unit: dU},
		{Name: "liquid_density", Unit: dU},
		{Name: "gas_molar_mass", Unit: units.GPerMol},
		{Name: "liquid_molar_mass", Unit: units.GPerMol},
		{Name: "gas_viscosity", Unit: centipoise.Unit},
		{Name: "cgr", Label: "CGR of the step", Unit: su.cgr.Unit},
		{Name: "surface_gas_gravity", Format: report.Gravity},
		{Name: "cum_sales_gas", Unit: su.gasPerMol.Unit},
		{Name: "cum_condensate", Unit: su.oilPerMol.Unit},
	}
	steps := Table{Name: "steps", Title: "depletion steps (per mole of fluid initially in the cell)", Columns: cols}
	compCols := append([]Column{{Name: "pressure", Unit: pU}}, make([]Column, len(names))...)
	for i, n := range names {
		compCols[i+1] = Column{Name: n, Label: n, Format: report.MoleFraction}
	}
	gas := Table{Name: "gas_composition", Title: "produced gas composition, mole fraction", Columns: compCols, Detail: true}
	liquid := Table{Name: "liquid_composition", Title: "retrograde liquid composition, mole fraction", Columns: compCols, Detail: true}

	dropout := report.Series{Label: "Liquid dropout, laboratory steps", Style: report.LinePoints}
	for _, s := range d.Steps {
		var liqRho, liqM, cgr, gravity, cumGas, cumOil any
		if s.TwoPhase {
			liqRho, liqM = dU.FromSI(s.Liquid.Rho), units.GPerMol.FromSI(s.Liquid.M)
		}
		if sf := s.Surface; sf != nil {
			cumGas, cumOil = su.gasPerMol.of(sf.CumGas), su.oilPerMol.of(sf.CumOil)
			if s.StepProduced > 0 { // the start produces nothing: no yield
				cgr, gravity = su.cgr.of(sf.CGR), finite(sf.GasGravity)
			}
		}
		p := pU.FromSI(s.P)
		steps.Rows = append(steps.Rows, []any{
			p,
			units.Percent.FromSI(s.LiquidDropout),
			units.Percent.FromSI(s.Produced),
			s.ZGas,
			s.ZTwoPhase,
			dU.FromSI(s.Gas.Rho),
			liqRho,
			units.GPerMol.FromSI(s.Gas.M),
			liqM,
			centipoise.of(s.GasViscosity),
			cgr, gravity, cumGas, cumOil,
		})
		gas.Rows = append(gas.Rows, append([]any{p}, floats(s.Y, len(names))...))
		if s.TwoPhase {
			liquid.Rows = append(liquid.Rows, append([]any{p}, floats(s.X, len(names))...))
		}
		dropout.X = append(dropout.X, p)
		dropout.Y = append(dropout.Y, units.Percent.FromSI(s.LiquidDropout))
	}
	r.Tables = []Table{steps, gas}
	if len(liquid.Rows) > 0 {
		r.Tables = append(r.Tables, liquid)
	}
	drop := &report.Figure{
		Name:    "cvd-liquid-dropout",
		Title:   "Constant-volume depletion: liquid dropout",
		Caption: "Retrograde liquid as a share of the cell volume at each step, and the maximum of the continuous depletion.",
		X:       report.Axis{Label: "Pressure", Unit: pU},
		Y:       report.Axis{Label: "Liquid dropout", Unit: units.Percent},
		Series:  []report.Series{dropout},
	}
	if d.MaxDropout > 0 {
		drop.Marks = []report.Mark{{Label: "Maximum of the continuous depletion", X: pU.FromSI(d.MaxDropoutP), Y: units.Percent.FromSI(d.MaxDropout)}}
	}
	r.Figures = []*report.Figure{drop, compositionFigure(st, pU, gas)}
	return r
}

// heavyMolarMass (kg/mol) divides the components a composition figure
// draws one by one from those it lumps: heavier than hexane (86.18 g/mol,
// Poling, Prausnitz and O'Connell, 5th ed., Appendix A) is the C7+ that
// makes the condensate.
const heavyMolarMass = 0.090

// compositionFigure draws the produced-gas composition of the table gas
// (pressure, then a mole fraction per component) against pressure: each
// component up to hexane on its own, the heavier ones lumped.
func compositionFigure(st *study.Study, pU units.Unit, gas Table) *report.Figure {
	f := &report.Figure{
		Name:    "cvd-gas-composition",
		Title:   "Constant-volume depletion: produced gas composition",
		Caption: "Mole fraction of each component in the gas removed at each step; the components heavier than hexane are lumped.",
		X:       report.Axis{Label: "Pressure", Unit: pU},
		Y:       report.Axis{Label: "Mole fraction", Log: true},
	}
	names, comps := componentNames(st.Fluid), st.Fluid.Components()
	heavy := report.Series{Label: "Heavier than C6 (C7+)", Style: report.LinePoints}
	var light []report.Series
	for j, n := range names {
		if comps[j].M > heavyMolarMass {
			continue
		}
		light = append(light, report.Series{Label: n, Style: report.LinePoints})
	}
	for _, row := range gas.Rows {
		p := row[0].(float64)
		k, sum, some := 0, 0.0, false
		for j := range names {
			y, ok := row[j+1].(float64)
			if comps[j].M > heavyMolarMass {
				if ok {
					sum, some = sum+y, true
				}
				continue
			}
			if ok {
				light[k].X, light[k].Y = append(light[k].X, p), append(light[k].Y, y)
			}
			k++
		}
		if some {
			heavy.X, heavy.Y = append(heavy.X, p), append(heavy.Y, sum)
		}
	}
	f.Series = light
	if len(heavy.X) > 0 {
		f.Series = append(f.Series, heavy)
	}
	return f
}

// floats gives x as n cells, each missing when x is nil.
func floats(x []float64, n int) []any {
	cells := make([]any, n)
	for i := range cells {
		if x != nil {
			cells[i] = x[i]
		}
	}
	return cells
}
