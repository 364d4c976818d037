package main

import (
	"fmt"
	"math"
	"strconv"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
)

func separateCommand() *cli.Command {
	return studyCommand("separate",
		"surface yields of the study's fluid through its separator train and the stock tank: gas per stage, GOR, CGR, stock-tank oil density and API gravity",
		nil,
		func(_ *cli.Context, o *options, st *study.Study) error {
			if len(st.Separator) == 0 {
				o.warnOnce(noSeparator, fmt.Sprintf("%s gives no [[separator.stage]]: the fluid goes straight to the stock tank", st.File))
			}
			r, err := separateReport(st, o.sys)
			if err != nil {
				return err
			}
			return o.emit(r)
		})
}

// A yieldUnit is an output unit of a surface yield (standard volumes per
// mole, GOR, CGR, viscosity), which the units package does not list. Its
// Unit names the column; perSI converts the SI value of the library.
type yieldUnit struct {
	units.Unit
	perSI float64 // output units per SI unit
}

// of converts an SI value; a value that is not finite (a GOR without oil)
// is missing.
func (u yieldUnit) of(si float64) any {
	v := si * u.perSI
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return v
}

// Surface units, converted from the exact definitions of package units
// (NIST SP 811): 1 ft³ = 0.028316846592 m³, 1 bbl = 0.158987294928 m³,
// 1 lbmol = 453.59237 mol. "scf", "STB" and "sm3" are volumes at the
// standard conditions of the study.
var (
	scfPerLbmol  = yieldUnit{units.Unit{Symbol: "scf/lbmol", Key: "scf_lbmol"}, units.MolPerLbmol / units.M3PerFt3}
	stbPerLbmol  = yieldUnit{units.Unit{Symbol: "STB/lbmol", Key: "stb_lbmol"}, units.MolPerLbmol / units.M3PerBbl}
	scfPerSTB    = yieldUnit{units.Unit{Symbol: "scf/STB", Key: "scf_stb"}, units.M3PerBbl / units.M3PerFt3}
	stbPerMMscf  = yieldUnit{units.Unit{Symbol: "STB/MMscf", Key: "stb_mmscf"}, 1e6 * units.M3PerFt3 / units.M3PerBbl}
	sm3PerKmol   = yieldUnit{units.Unit{Symbol: "sm3/kmol", Key: "sm3_kmol"}, 1e3}
	sm3PerSm3    = yieldUnit{units.Unit{Symbol: "sm3/sm3", Key: "sm3_sm3"}, 1}
	sm3Per1e6Sm3 = yieldUnit{units.Unit{Symbol: "sm3/1e6 sm3", Key: "sm3_1e6sm3"}, 1e6}
	// centipoise in both systems, as the trade quotes viscosity: 1 cP = 1 mPa·s
	centipoise = yieldUnit{units.Unit{Symbol: "cP", Key: "cP"}, 1e3}
)

// surfaceUnits are the units of surface yields in one output system.
type surfaceUnits struct {
	gasPerMol yieldUnit // standard gas volume per mole of feed
	oilPerMol yieldUnit // stock-tank oil volume per mole of feed
	gor       yieldUnit // gas over oil
	cgr       yieldUnit // oil over gas
}

func surfaceUnitsOf(sys units.System) surfaceUnits {
	if sys == units.Metric {
		return surfaceUnits{gasPerMol: sm3PerKmol, oilPerMol: sm3PerKmol, gor: sm3PerSm3, cgr: sm3Per1e6Sm3}
	}
	return surfaceUnits{gasPerMol: scfPerLbmol, oilPerMol: stbPerLbmol, gor: scfPerSTB, cgr: stbPerMMscf}
}

// trainOf is the study's separator train, the stock tank (Study.StockTank)
// following the last stage, with standard volumes at the study's standard
// conditions in the output system.
func trainOf(st *study.Study, sys units.System) cvd.Train {
	std, tank := st.StandardConditions(sys), st.StockTank()
	tr := cvd.Train{Standard: cvd.Conditions{T: std.T, P: std.P}, Tank: cvd.Conditions{T: tank.T, P: tank.P}}
	for _, s := range st.Separator {
		tr.Stages = append(tr.Stages, cvd.Conditions{T: s.Temperature, P: s.Pressure})
	}
	return tr
}

// standardFields report the standard conditions of a train.
func standardFields(tr cvd.Train, sys units.System) []Field {
	tU, pU := sys.Unit(units.Temperature), sys.Unit(units.Pressure)
	return []Field{
		{Column: Column{Name: "standard_temperature", Unit: tU}, Value: tU.FromSI(tr.Standard.T)},
		{Column: Column{Name: "standard_pressure", Unit: pU}, Value: pU.FromSI(tr.Standard.P)},
		{Column: Column{Name: "stock_tank_temperature", Unit: tU}, Value: tU.FromSI(tr.Tank.T)},
		{Column: Column{Name: "stock_tank_pressure", Unit: pU}, Value: pU.FromSI(tr.Tank.P)},
		{Column: Column{Name: "separator_stages"}, Value: len(tr.Stages)},
	}
}

// finite is v, or missing when v is not a finite number.
func finite(v float64) any {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return v
}

// separateReport flashes one mole of the study's feed through its train:
// the totals, the stages and the compositions of the feed, the surface gas
// and the stock-tank oil.
func separateReport(st *study.Study, sys units.System) (*Report, error) {
	tr := trainOf(st, sys)
	sep, err := cvd.NewSeparator(st.Fluid, tr, nil)
	if err != nil {
		return nil, cli.Exit(fmt.Sprintf("%s: separator: %v", st.File, err), exitUsage)
	}
	res, err := sep.Separate(st.Z)
	if err != nil {
		return nil, fmt.Errorf("separator train: %w", err)
	}
	su := surfaceUnitsOf(sys)
	tU, pU, dU := sys.Unit(units.Temperature), sys.Unit(units.Pressure), sys.Unit(units.Density)
	hasOil := res.OilMoles > 0
	oil := func(v float64) any {
		if !hasOil {
			return nil
		}
		return finite(v)
	}
	var gasM, gasG any // none without surface gas
	if res.GasMoles > 0 {
		gasM, gasG = units.GPerMol.FromSI(res.GasM), res.GasGravity
	}
	r := &Report{
		Name:    "separator",
		Section: "Separator and stock tank",
		Title:   "surface yields of " + fluidName(st) + " through the separator train",
		Fields: append(standardFields(tr, sys),
			Field{Column: Column{Name: "surface_gas_mole_fraction", Format: report.MoleFraction}, Value: res.GasMoles},
			Field{Column: Column{Name: "surface_gas", Unit: su.gasPerMol.Unit}, Value: su.gasPerMol.of(res.GasVolume)},
			Field{Column: Column{Name: "stock_tank_oil", Unit: su.oilPerMol.Unit}, Value: su.oilPerMol.of(res.OilVolume)},
			Field{Column: Column{Name: "gor", Unit: su.gor.Unit}, Value: su.gor.of(res.GOR)},
			Field{Column: Column{Name: "cgr", Unit: su.cgr.Unit}, Value: su.cgr.of(res.CGR)},
			Field{Column: Column{Name: "surface_gas_gravity", Format: report.Gravity}, Value: gasG},
			Field{Column: Column{Name: "surface_gas_molar_mass", Unit: units.GPerMol}, Value: gasM},
			Field{Column: Column{Name: "stock_tank_oil_density", Unit: dU}, Value: oil(dU.FromSI(res.OilDensity))},
			Field{Column: Column{Name: "stock_tank_oil_specific_gravity", Format: report.Gravity}, Value: oil(res.OilSG)},
			Field{Column: Column{Name: "api_gravity", Format: report.Fixed(1)}, Value: oil(res.API)},
			Field{Column: Column{Name: "stock_tank_oil_molar_mass", Unit: units.GPerMol}, Value: oil(units.GPerMol.FromSI(res.OilM))},
		),
	}
	stages := Table{
		Name:  "stages",
		Title: "stages (amounts per mole of feed; stage GOR over the stock-tank oil)",
		Columns: []Column{
			{Name: "stage"},
			{Name: "pressure", Unit: pU},
			{Name: "temperature", Unit: tU},
			{Name: "feed_mole_fraction", Label: "Feed", Format: report.MoleFraction},
			{Name: "gas_mole_fraction", Label: "Gas", Format: report.MoleFraction},
			{Name: "gas_volume", Unit: su.gasPerMol.Unit},
			{Name: "stage_gor", Label: "Stage GOR", Unit: su.gor.Unit},
			{Name: "gas_gravity", Format: report.Gravity},
			{Name: "liquid_mole_fraction", Label: "Liquid", Format: report.MoleFraction},
		},
	}
	for i, s := range res.Stages {
		name := strconv.Itoa(i + 1)
		if i == len(res.Stages)-1 {
			name = "stock tank"
		}
		var gor, gravity any
		if s.GasMoles > 0 {
			gravity = s.GasGravity
			if hasOil {
				gor = su.gor.of(s.GOR)
			}
		}
		stages.Rows = append(stages.Rows, []any{
			name, pU.FromSI(s.P), tU.FromSI(s.T), s.Feed, s.GasMoles,
			su.gasPerMol.of(s.GasVolume), gor, gravity, s.LiqMoles,
		})
	}
	r.Tables = []Table{stages}
	comps := Table{
		Name:   "compositions",
		Title:  "compositions, mole fraction",
		Detail: true,
		Columns: []Column{{Name: "component"}, {Name: "feed", Format: report.MoleFraction}, {Name: "surface_gas", Format: report.MoleFraction},
			{Name: "stock_tank_oil", Format: report.MoleFraction}},
	}
	at := func(x []float64, i int) any {
		if x == nil {
			return nil
		}
		return x[i]
	}
	for i, name := range componentNames(st.Fluid) {
		comps.Rows = append(comps.Rows, []any{name, st.Z[i], at(res.Gas, i), at(res.Oil, i)})
	}
	r.Tables = append(r.Tables, comps)
	return r, nil
}
