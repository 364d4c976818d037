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
	"dewcell/mbal"
)

func inplaceCommand() *cli.Command {
	return studyCommand("inplace",
		"initial wet gas, sales gas and condensate in place: by the equation of state and, with a [surface] section, by the quick look from separator data, side by side",
		[]cli.Flag{startAtDewPointFlag()},
		func(c *cli.Context, o *options, st *study.Study) error {
			r, err := inplaceReportAt(o, st, c.Bool(flagStartAtDew))
			if err != nil {
				return err
			}
			return o.emit(r)
		})
}

// flagStartAtDew starts the reservoir at the fluid model's dew point when
// that lies above the initial pressure.
const flagStartAtDew = "start-at-dew-point"

func startAtDewPointFlag() cli.Flag {
	return &cli.BoolFlag{Name: flagStartAtDew, Usage: "when the fluid model's dew point lies above reservoir.initial_pressure (a model not yet tuned to a sample that was single-phase there), start the reservoir at the model's dew point instead of refusing, with a warning"}
}

// startAtDewPoint replaces the initial pressure of res by the fluid model's
// dew point when atDew is set and that dew point lies above it, and warns
// that the model disagrees with the sample; it says whether it did. The
// reservoir then starts one phase, a billionth above the dew point.
func startAtDewPoint(o *options, st *study.Study, res *mbal.Reservoir, what string, atDew bool) (bool, error) {
	if !atDew {
		return false, nil
	}
	sat, err := upperSaturation(st, o.sys, res.T)
	if err != nil {
		return false, fmt.Errorf("--%s: %w", flagStartAtDew, err)
	}
	at := temperatureNote(o.sys, res.T)
	if sat.Type == eos.Bubble {
		return false, cli.Exit(fmt.Sprintf("--%s: the fluid of %s has a bubble point at %s (%s), not a dew point: it is an oil, for which %s does not apply",
			flagStartAtDew, st.File, at, pressureText(o.sys, sat.P), what), exitUsage)
	}
	if sat.P <= res.Pi {
		o.note(fmt.Sprintf("%s: --%s: the model's dew point at %s (%s) lies below reservoir.initial_pressure (%s); the reservoir starts at the initial pressure",
			what, flagStartAtDew, at, pressureNote(o.sys, sat.P), pressureNote(o.sys, res.Pi)))
		return false, nil
	}
	pi := sat.P * (1 + 1e-9)
	o.warn(fmt.Sprintf("the fluid model's dew point at %s (%s) lies above reservoir.initial_pressure of %s (%s): the model disagrees with the sample, which was one phase at the initial pressure, and needs tuning; %s starts the reservoir at the model's dew point instead (--%s)",
		at, pressureNote(o.sys, sat.P), st.File, pressureNote(o.sys, res.Pi), what, flagStartAtDew))
	res.Pi = pi
	return true, nil
}

// reservoirOf is the study's reservoir for package mbal, or a usage error
// naming the key that is missing. what says what the reservoir is needed
// for; needAbandonment asks for reservoir.abandonment_pressure too.
func reservoirOf(o *options, st *study.Study, what string, needAbandonment bool) (mbal.Reservoir, error) {
	rs := st.Reservoir
	bad := func(format string, args ...any) (mbal.Reservoir, error) {
		return mbal.Reservoir{}, cli.Exit(fmt.Sprintf("%s: ", st.File)+fmt.Sprintf(format, args...), exitUsage)
	}
	switch {
	case rs.InitialPressure == 0:
		return bad("reservoir.initial_pressure: missing; %s needs the initial pressure", what)
	case rs.PoreVolume == 0 && rs.Area == 0:
		return bad(`reservoir.area: missing; %s needs the rock: area with net_thickness (such as "3150 acre" and "62 ft") or pore_volume`, what)
	case rs.PoreVolume == 0 && rs.Porosity == 0:
		return bad("reservoir.porosity: missing; %s needs the porosity to go with the area and net thickness", what)
	case needAbandonment && rs.AbandonmentPressure == 0:
		return bad("reservoir.abandonment_pressure: missing; %s runs down to the abandonment pressure", what)
	}
	if rs.WaterSaturation == 0 {
		o.warn(fmt.Sprintf("%s: reservoir.water_saturation is 0 or not given: the whole pore volume is taken to hold hydrocarbons", st.File))
	}
	r := mbal.Reservoir{
		T:          rs.Temperature,
		Pi:         rs.InitialPressure,
		PoreVolume: rs.PoreVolume,
		BulkVolume: rs.Area * rs.NetThickness,
		Porosity:   rs.Porosity,
		Sw:         rs.WaterSaturation,
		Sc:         rs.CriticalCondensateSaturation,
		Cf:         rs.RockCompressibility,
		Cw:         rs.WaterCompressibility,
		RelPerm: mbal.RelativePermeability{
			GasExponent: st.RelPerm.GasExponent, CondensateExponent: st.RelPerm.CondensateExponent,
			GasEndpoint: st.RelPerm.GasEndpoint, CondensateEndpoint: st.RelPerm.CondensateEndpoint,
		},
	}
	if needAbandonment {
		r.Abandonment = rs.AbandonmentPressure
	}
	if err := r.Check(); err != nil {
		return r, cli.Exit(fmt.Sprintf("%s: [reservoir]: %v", st.File, err), exitUsage)
	}
	return r, nil
}

// reservoirError gives a failure of package mbal the exit code it deserves:
// a reservoir that is two-phase at the initial pressure or an invalid
// description is the study's fault (exit 2), anything else a computation
// that failed (exit 1).
func reservoirError(st *study.Study, sys units.System, what string, err error) error {
	switch {
	case errors.Is(err, mbal.ErrInitiallyTwoPhase):
		return cli.Exit(fmt.Sprintf("%s: reservoir.initial_pressure (%s): %s: %s; the reservoir must be one phase at discovery (compare dewcell satpoint): tune the fluid description to the sample, or meanwhile give --%s to start the reservoir at the model's dew point",
			st.File, pressureText(sys, st.Reservoir.InitialPressure), what, explain(err, sys), flagStartAtDew), exitUsage)
	case errors.Is(err, mbal.ErrBadReservoir), errors.Is(err, cvd.ErrBadTrain), errors.Is(err, cvd.ErrBadOptions):
		return cli.Exit(fmt.Sprintf("%s: %s: %s", st.File, what, explain(err, sys)), exitUsage)
	}
	return fmt.Errorf("%s: %w", what, err)
}

// surfaceData is the study's [surface] section for mbal.Recombine, its
// standard conditions those of the output system.
func surfaceData(st *study.Study, sys units.System) mbal.SurfaceData {
	sf := st.Surface
	std := st.StandardConditions(sys)
	d := mbal.SurfaceData{
		OilSG: sf.OilSG, OilAPI: sf.OilAPI, OilM: sf.OilM,
		Impurities: mbal.Impurities{N2: sf.N2, CO2: sf.CO2, H2S: sf.H2S},
		Standard:   cvd.Conditions{T: std.T, P: std.P},
	}
	switch sf.Correlation {
	case "standing-natural-gas":
		d.Correlation = mbal.StandingNaturalGas
	case "standing-condensate":
		d.Correlation = mbal.StandingCondensate
	default:
		d.Correlation = mbal.Sutton
	}
	for _, s := range sf.Stages {
		d.Gas = append(d.Gas, mbal.SurfaceGas{GOR: s.GOR, Gravity: s.Gravity})
	}
	return d
}

// quickLook runs the quick-look route on the study's [surface] data at the
// initial state. Data outside a correlation's range, or inconsistent, are
// the study's fault (exit 2).
func quickLook(st *study.Study, sys units.System, r mbal.Reservoir) (*mbal.WellStream, *mbal.QuickLook, error) {
	inputErr := func(err error) error {
		if errors.Is(err, mbal.ErrBadSurfaceData) || errors.Is(err, mbal.ErrCorrelationRange) {
			return cli.Exit(fmt.Sprintf("%s: [surface]: quick look: %v", st.File, err), exitUsage)
		}
		return fmt.Errorf("quick look from the [surface] data: %w", err)
	}
	w, err := mbal.Recombine(surfaceData(st, sys))
	if err != nil {
		return nil, nil, inputErr(err)
	}
	q, err := mbal.InPlaceQuickLook(w, r.HCPV(), r.T, r.Pi)
	if err != nil {
		return nil, nil, inputErr(err)
	}
	return w, q, nil
}

// inPlaceUnits are the output units of volumes in place.
type inPlaceUnits struct {
	gas, liquid       units.Unit // standard volumes
	gasBulk, liqBulk  units.Unit // per bulk rock volume
	bulk, pore, press units.Unit
}

func inPlaceUnitsOf(sys units.System) inPlaceUnits {
	return inPlaceUnits{
		gas: sys.Unit(units.GasVolume), liquid: sys.Unit(units.LiquidVolume),
		gasBulk: sys.Unit(units.GasPerBulk), liqBulk: sys.Unit(units.LiquidPerBulk),
		bulk: sys.Bulk(), pore: sys.Unit(units.Volume), press: sys.Unit(units.Pressure),
	}
}

// perBulk is v per m³ of bulk rock in u, or missing without a bulk volume.
func perBulk(u units.Unit, v, bulk float64) any {
	if !(bulk > 0) {
		return nil
	}
	return u.FromSI(v / bulk)
}

// inplaceReport computes the initial gas and condensate in place by the
// equation of state (the fluid's moles filling the hydrocarbon pore volume
// at the initial state, through the separator train) and, when the study
// has a [surface] section, by the quick look from separator data.
func inplaceReport(o *options, st *study.Study) (*Report, error) {
	return inplaceReportAt(o, st, false)
}

// inplaceReportAt is inplaceReport, starting the reservoir at the model's
// dew point when atDew is set and that lies above the initial pressure.
func inplaceReportAt(o *options, st *study.Study, atDew bool) (*Report, error) {
	sys := o.sys
	res, err := reservoirOf(o, st, "inplace", false)
	if err != nil {
		return nil, err
	}
	started, err := startAtDewPoint(o, st, &res, "inplace", atDew)
	if err != nil {
		return nil, err
	}
	if len(st.Separator) == 0 {
		o.warnOnce(noSeparator, fmt.Sprintf("%s gives no [[separator.stage]]: the reservoir fluid goes straight to the stock tank", st.File))
	}
	tr := trainOf(st, sys)
	ip, err := mbal.InPlaceEOS(st.Fluid, st.Z, res, tr, nil)
	if err != nil {
		return nil, reservoirError(st, sys, "fluid in place", err)
	}
	var w *mbal.WellStream
	var q *mbal.QuickLook
	if st.Surface != nil {
		if w, q, err = quickLook(st, sys, res); err != nil {
			return nil, err
		}
	} else {
		o.note(fmt.Sprintf("%s has no [surface] section: the quick look from separator data is left out", st.File))
	}
	r := inPlaceReportOf(st, sys, tr, res, ip, w, q)
	r.Fields = append(r.Fields[:2:2], append([]Field{{Column: Column{Name: "started_at_model_dew_point"}, Value: started}}, r.Fields[2:]...)...)
	return r, nil
}

// inPlaceReportOf shows the in-place results in sys: the equation-of-state
// figures as the headline, the quick look beside them when there is one.
func inPlaceReportOf(st *study.Study, sys units.System, tr cvd.Train, res mbal.Reservoir, ip *mbal.InPlace, w *mbal.WellStream, q *mbal.QuickLook) *Report {
	u := inPlaceUnitsOf(sys)
	su := surfaceUnitsOf(sys)
	tU, dU := sys.Unit(units.Temperature), sys.Unit(units.Density)
	bulk := ip.Bulk
	var bulkV any
	if bulk > 0 {
		bulkV = u.bulk.FromSI(bulk)
	}
	r := &Report{
		Name:    "in_place",
		Section: "Volumes in place",
		Title:   "initial gas and condensate in place: " + fluidName(st),
		Fields: []Field{
			{Column: Column{Name: "temperature", Unit: tU}, Value: tU.FromSI(res.T)},
			{Column: Column{Name: "initial_pressure", Unit: u.press}, Value: u.press.FromSI(res.Pi)},
			{Column: Column{Name: "bulk_volume", Unit: u.bulk}, Value: bulkV},
			{Column: Column{Name: "pore_volume", Unit: u.pore}, Value: u.pore.FromSI(res.PV())},
			{Column: Column{Name: "hydrocarbon_pore_volume", Unit: u.pore}, Value: u.pore.FromSI(ip.HCPV)},
			{Column: Column{Name: "water_saturation", Format: report.Saturation}, Value: res.Sw},
		},
	}
	r.Fields = append(r.Fields, standardFields(tr, sys)...)
	// inPlace gives the three volumes in place, in total and per bulk volume,
	// under keys that start with prefix.
	inPlace := func(prefix string, wet, sales, cond float64) []Field {
		perBulkLabel := func(name string) string { return report.LabelOf(prefix+name) + " per bulk volume" }
		return []Field{
			{Column: Column{Name: prefix + "wet_gas_in_place", Unit: u.gas}, Value: u.gas.FromSI(wet)},
			{Column: Column{Name: prefix + "sales_gas_in_place", Unit: u.gas}, Value: u.gas.FromSI(sales)},
			{Column: Column{Name: prefix + "condensate_in_place", Unit: u.liquid}, Value: u.liquid.FromSI(cond)},
			{Column: Column{Name: prefix + "wet_gas_in_place", Label: perBulkLabel("wet_gas_in_place"), Unit: u.gasBulk}, Value: perBulk(u.gasBulk, wet, bulk)},
			{Column: Column{Name: prefix + "sales_gas_in_place", Label: perBulkLabel("sales_gas_in_place"), Unit: u.gasBulk}, Value: perBulk(u.gasBulk, sales, bulk)},
			{Column: Column{Name: prefix + "condensate_in_place", Label: perBulkLabel("condensate_in_place"), Unit: u.liqBulk}, Value: perBulk(u.liqBulk, cond, bulk)},
		}
	}
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "z_initial", Format: report.ZFactor}, Value: ip.Z},
	)
	r.Fields = append(r.Fields, inPlace("", ip.WetGas, ip.SalesGas, ip.Condensate)...)
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "gor", Unit: su.gor.Unit}, Value: su.gor.of(ip.Surface.GOR)},
		Field{Column: Column{Name: "cgr", Unit: su.cgr.Unit}, Value: su.cgr.of(ip.Surface.CGR)},
		Field{Column: Column{Name: "stock_tank_oil_density", Unit: dU}, Value: finite(dU.FromSI(ip.Surface.OilDensity))},
		Field{Column: Column{Name: "api_gravity", Label: "Stock tank oil API gravity", Format: report.Fixed(1)}, Value: finite(ip.Surface.API)},
	)
	routes := Table{
		Name:  "routes",
		Title: "the two routes side by side (difference: quick look minus equation of state)",
		Columns: []Column{
			{Name: "route"},
			{Name: "z", Label: "Z initial", Format: report.ZFactor},
			{Name: "wet_gas", Label: "Wet gas in place", Unit: u.gas},
			{Name: "sales_gas", Label: "Sales gas in place", Unit: u.gas},
			{Name: "condensate", Label: "Condensate in place", Unit: u.liquid},
			{Name: "wet_gas", Label: "Wet gas per bulk volume", Unit: u.gasBulk},
			{Name: "sales_gas", Label: "Sales gas per bulk volume", Unit: u.gasBulk},
			{Name: "condensate", Label: "Condensate per bulk volume", Unit: u.liqBulk},
			{Name: "dry_gas_fraction", Label: "Surface gas mole fraction", Format: report.MoleFraction},
		},
		Transpose: true,
	}
	row := func(name string, z, wet, sales, cond, frac float64) []any {
		return []any{name, z, u.gas.FromSI(wet), u.gas.FromSI(sales), u.liquid.FromSI(cond),
			perBulk(u.gasBulk, wet, bulk), perBulk(u.gasBulk, sales, bulk), perBulk(u.liqBulk, cond, bulk), frac}
	}
	routes.Rows = append(routes.Rows, row("equation of state", ip.Z, ip.WetGas, ip.SalesGas, ip.Condensate, ip.Surface.GasMoles))
	if q == nil {
		r.Tables = []Table{routes}
		return r
	}
	d := mbal.CompareRoutes(ip, w, q)
	routes.Rows = append(routes.Rows,
		row("quick look", q.Z, q.WetGas, q.SalesGas, q.Condensate, w.GasFraction),
		row("difference", d.Z, d.WetGas, d.SalesGas, d.Condensate, d.DryGasFraction))
	r.Tables = []Table{routes}

	pU, pcTU := u.press, units.DegR // pseudo-critical temperatures are quoted absolute
	if sys == units.Metric {
		pcTU = units.Kelvin
	}
	oilM := "measured"
	if w.Cragoe {
		oilM = "Cragoe (1929) from the API gravity"
	}
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "quick_look_z", Format: report.ZFactor}, Value: q.Z},
	)
	r.Fields = append(r.Fields, inPlace("quick_look_", q.WetGas, q.SalesGas, q.Condensate)...)
	r.Fields = append(r.Fields,
		Field{Column: Column{Name: "quick_look_dry_gas_fraction", Label: "Quick-look surface gas mole fraction", Format: report.MoleFraction}, Value: w.GasFraction},
		Field{Column: Column{Name: "quick_look_gor", Unit: su.gor.Unit}, Value: su.gor.of(w.GOR)},
		Field{Column: Column{Name: "quick_look_surface_gas_gravity", Format: report.Gravity}, Value: w.GasGravity},
		Field{Column: Column{Name: "quick_look_oil_api_gravity", Format: report.Fixed(1)}, Value: w.OilAPI},
		Field{Column: Column{Name: "quick_look_oil_molar_mass", Unit: units.GPerMol}, Value: units.GPerMol.FromSI(w.OilM)},
		Field{Column: Column{Name: "quick_look_oil_molar_mass_source"}, Value: oilM},
		Field{Column: Column{Name: "well_stream_gravity", Format: report.Gravity}, Value: w.Gravity},
		Field{Column: Column{Name: "pseudo_critical_correlation"}, Value: w.Correlation.String()},
		Field{Column: Column{Name: "pseudo_critical_temperature", Unit: pcTU}, Value: pcTU.FromSI(w.Critical.Tpc)},
		Field{Column: Column{Name: "pseudo_critical_pressure", Unit: pU}, Value: pU.FromSI(w.Critical.Ppc)},
		Field{Column: Column{Name: "pseudo_reduced_temperature", Format: report.Fixed(3)}, Value: q.Tpr},
		Field{Column: Column{Name: "pseudo_reduced_pressure", Format: report.Fixed(3)}, Value: q.Ppr},
		Field{Column: Column{Name: "quick_look_difference_z", Unit: units.Percent}, Value: finite(100 * d.RelZ)},
		Field{Column: Column{Name: "quick_look_difference_wet_gas", Unit: units.Percent}, Value: finite(100 * d.RelWetGas)},
		Field{Column: Column{Name: "quick_look_difference_sales_gas", Unit: units.Percent}, Value: finite(100 * d.RelSalesGas)},
		Field{Column: Column{Name: "quick_look_difference_condensate", Unit: units.Percent}, Value: finite(100 * d.RelCondensate)},
	)
	return r
}
