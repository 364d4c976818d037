package main

import (
	"fmt"
	"math"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/mbal"
)

// Flags of recover.
const flagMobileLiquid = "mobile-liquid"

// defaultRecoverySteps is the number of even steps from the dew point to the
// abandonment pressure when recover is given no pressures.
const defaultRecoverySteps = 10

func recoverCommand() *cli.Command {
	return studyCommand("recover",
		"depletion recovery from the initial to the abandonment pressure: cumulative wet gas, sales gas and condensate, recovery factors, producing CGR, two-phase Z and p/z, condensate saturation",
		[]cli.Flag{
			&cli.StringFlag{Name: flagPressures, Usage: "the reservoir pressures, falling, below reservoir.initial_pressure and not below reservoir.abandonment_pressure, comma-separated, each with its unit: `LIST` such as \"4000 psia, 3000 psia, 2000 psia\"; the abandonment pressure is added when the list stops above it"},
			&cli.IntFlag{Name: flagSteps, Value: defaultRecoverySteps, Usage: fmt.Sprintf("`N` even steps, 1 to %d, from the dew point down to reservoir.abandonment_pressure", maxSteps)},
			&cli.BoolFlag{Name: flagMobileLiquid, Usage: "produce the condensate above the critical condensate saturation with the gas (the modified depletion): the upper bound of condensate recovery; by default the condensate stays in the rock (the lower bound)"},
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			ro, err := recoverOptions(c, o, st)
			if err != nil {
				return err
			}
			rep, err := recoverReport(o, st, ro)
			if err != nil {
				return err
			}
			return o.emit(rep)
		})
}

// recoverOptions reads --pressures, --steps and --mobile-liquid.
func recoverOptions(c *cli.Context, o *options, st *study.Study) (mbal.RecoverOptions, error) {
	ro := mbal.RecoverOptions{MobileLiquid: c.Bool(flagMobileLiquid), Steps: defaultRecoverySteps}
	bad := func(format string, args ...any) error { return cli.Exit(fmt.Sprintf(format, args...), exitUsage) }
	if c.IsSet(flagPressures) && c.IsSet(flagSteps) {
		return ro, bad("--%s and --%s exclude each other: give the pressures, or their number", flagPressures, flagSteps)
	}
	if c.IsSet(flagSteps) {
		ro.Steps = c.Int(flagSteps)
		if ro.Steps < 1 || ro.Steps > maxSteps {
			return ro, bad("--%s: %d, want a number of steps from 1 to %d", flagSteps, ro.Steps, maxSteps)
		}
	}
	if !c.IsSet(flagPressures) {
		return ro, nil
	}
	ps, err := parsePressures(c, flagPressures, st.Atmospheric)
	if err != nil {
		return ro, err
	}
	pi, pa := st.Reservoir.InitialPressure, st.Reservoir.AbandonmentPressure
	for i, p := range ps {
		item := fmt.Sprintf("--%s: item %d (%s)", flagPressures, i+1, pressureText(o.sys, p))
		switch {
		case i > 0 && p >= ps[i-1]:
			return ro, bad("%s is not below the pressure before it: the reservoir pressure falls", item)
		case pi > 0 && p >= pi:
			return ro, bad("%s is not below reservoir.initial_pressure of %s (%s)", item, st.File, pressureText(o.sys, pi))
		case pa > 0 && p < pa:
			return ro, bad("%s is below reservoir.abandonment_pressure of %s (%s), where the depletion ends", item, st.File, pressureText(o.sys, pa))
		}
	}
	if pa > 0 && ps[len(ps)-1] > pa {
		fmt.Fprintf(o.stderr, "recover: the --%s list stops above reservoir.abandonment_pressure; %s is added as the last step\n", flagPressures, pressureText(o.sys, pa))
		ps = append(ps, pa)
	}
	ro.Pressures = ps
	ro.Steps = 0
	return ro, nil
}

// recoverReport runs the depletion of the study's reservoir with ro, and the
// other bound of condensate recovery (mobile or immobile condensate) for the
// summary, and warns when the condensate saturation passes the critical
// saturation.
func recoverReport(o *options, st *study.Study, ro mbal.RecoverOptions) (*Report, error) {
	res, err := reservoirOf(o, st, "recover", true)
	if err != nil {
		return nil, err
	}
	if len(st.Separator) == 0 {
		o.warn(fmt.Sprintf("%s gives no [[separator.stage]]: the produced stream goes straight to the stock tank", st.File))
	}
	tr := trainOf(st, o.sys)
	rec, err := mbal.Recover(st.Fluid, st.Z, res, tr, ro)
	if err != nil {
		return nil, reservoirError(st, o.sys, "depletion recovery", err)
	}
	other := ro
	other.MobileLiquid = !ro.MobileLiquid
	alt, err := mbal.Recover(st.Fluid, st.Z, res, tr, other)
	if err != nil {
		return nil, reservoirError(st, o.sys, "depletion recovery with the other condensate bound", err)
	}
	mobile, immobile := rec, alt
	if !ro.MobileLiquid {
		mobile, immobile = alt, rec
	}
	sc := res.Sc
	if sc == 0 {
		sc = mbal.DefaultSc
	}
	if rec.CriticalP > 0 {
		msg := fmt.Sprintf("the condensate saturation passes the critical condensate saturation (%.3g, reservoir.critical_condensate_saturation) at %s",
			sc, pressureText(o.sys, rec.CriticalP))
		if ro.MobileLiquid {
			fmt.Fprintf(o.stderr, "recover: %s: below it the condensate above %.3g flows with the gas (--%s)\n", msg, sc, flagMobileLiquid)
		} else {
			o.warn(msg + fmt.Sprintf(": the condensate could flow below it, which this run leaves in the rock; --%s gives that upper bound", flagMobileLiquid))
		}
	}
	return recoveryReportOf(st, o.sys, res, rec, mobile, immobile, ro.MobileLiquid, sc), nil
}

// recoveryReportOf shows rec in sys. mobile and immobile are the two bounds
// of condensate recovery (one of them rec).
func recoveryReportOf(st *study.Study, sys units.System, res mbal.Reservoir, rec, mobile, immobile *mbal.Recovery, mobileRun bool, sc float64) *Report {
	u := inPlaceUnitsOf(sys)
	su := surfaceUnitsOf(sys)
	pU, cU := u.press, sys.Unit(units.Compressibility)
	ip := rec.InPlace
	last := rec.Steps[len(rec.Steps)-1]
	// The maximum and the highest pressure where it is reached: with mobile
	// liquid the saturation stays on the critical one for many steps, equal
	// to the last bits, and the plateau is reported where it begins.
	maxSo, maxSoP := 0.0, 0.0
	for _, s := range rec.Steps {
		maxSo = math.Max(maxSo, s.So)
	}
	for _, s := range rec.Steps {
		if maxSo > 0 && s.So >= maxSo*(1-1e-9) {
			maxSoP = s.P
			break
		}
	}
	model := "immobile condensate: the retrograde liquid stays in the rock (lower bound of condensate recovery)"
	if mobileRun {
		model = "mobile condensate: the liquid above the critical saturation flows with the gas (modified depletion, upper bound of condensate recovery)"
	}
	var critP, maxP any
	if rec.CriticalP > 0 {
		critP = pU.FromSI(rec.CriticalP)
	}
	if maxSo > 0 {
		maxP = pU.FromSI(maxSoP)
	}
	lastM, lastI := mobile.Steps[len(mobile.Steps)-1], immobile.Steps[len(immobile.Steps)-1]
	r := &Report{
		Name:  "recovery",
		Title: "depletion recovery of " + fluidName(st),
		Fields: []Field{
			{Column{Name: "condensate_model"}, model},
			{Column{Name: "mobile_liquid"}, mobileRun},
			{Column{Name: "initial_pressure", Unit: pU}, pU.FromSI(res.Pi)},
			{Column{Name: "dew_pressure", Unit: pU}, pU.FromSI(rec.Depletion.Dew.P)},
			{Column{Name: "abandonment_pressure", Unit: pU}, pU.FromSI(last.P)},
			{Column{Name: "wet_gas_in_place", Unit: u.gas}, u.gas.FromSI(ip.WetGas)},
			{Column{Name: "sales_gas_in_place", Unit: u.gas}, u.gas.FromSI(ip.SalesGas)},
			{Column{Name: "condensate_in_place", Unit: u.liquid}, u.liquid.FromSI(ip.Condensate)},
			{Column{Name: "water_saturation"}, res.Sw},
			{Column{Name: "critical_condensate_saturation"}, sc},
			{Column{Name: "rock_compressibility", Unit: cU}, cU.FromSI(res.Cf)},
			{Column{Name: "water_compressibility", Unit: cU}, cU.FromSI(res.Cw)},
			{Column{Name: "effective_compressibility", Unit: cU}, cU.FromSI(res.EffectiveCompressibility())},
			{Column{Name: "max_condensate_saturation"}, maxSo},
			{Column{Name: "max_condensate_saturation_pressure", Unit: pU}, maxP},
			{Column{Name: "critical_saturation_pressure", Unit: pU}, critP},
			{Column{Name: "cum_wet_gas_at_abandonment", Unit: u.gas}, u.gas.FromSI(last.WetGas)},
			{Column{Name: "cum_sales_gas_at_abandonment", Unit: u.gas}, u.gas.FromSI(last.SalesGas)},
			{Column{Name: "cum_condensate_at_abandonment", Unit: u.liquid}, u.liquid.FromSI(last.Condensate)},
			{Column{Name: "wet_gas_recovery_at_abandonment", Unit: units.Percent}, units.Percent.FromSI(last.WetGasRF)},
			{Column{Name: "sales_gas_recovery_at_abandonment", Unit: units.Percent}, units.Percent.FromSI(last.SalesGasRF)},
			{Column{Name: "condensate_recovery_at_abandonment", Unit: units.Percent}, units.Percent.FromSI(last.CondensateRF)},
			{Column{Name: "condensate_recovery_at_abandonment_immobile_liquid", Unit: units.Percent}, units.Percent.FromSI(lastI.CondensateRF)},
			{Column{Name: "condensate_recovery_at_abandonment_mobile_liquid", Unit: units.Percent}, units.Percent.FromSI(lastM.CondensateRF)},
			{Column{Name: "condensate_left_in_reservoir", Unit: u.liquid}, u.liquid.FromSI(rec.CondensateLeft)},
			{Column{Name: "condensate_left_in_reservoir", Unit: units.Percent}, relShare(rec.CondensateLeft, ip.Condensate)},
			{Column{Name: "retrograde_liquid_in_rock", Unit: u.pore}, u.pore.FromSI(last.So * res.PV())},
		},
	}
	steps := Table{
		Name:  "steps",
		Title: "recovery versus reservoir pressure (cumulative produced, % of the initial in place)",
		Columns: []Column{
			{Name: "pressure", Unit: pU},
			{Name: "cum_wet_gas", Unit: u.gas},
			{Name: "cum_sales_gas", Unit: u.gas},
			{Name: "cum_condensate", Unit: u.liquid},
			{Name: "wet_gas_recovery", Unit: units.Percent},
			{Name: "sales_gas_recovery", Unit: units.Percent},
			{Name: "condensate_recovery", Unit: units.Percent},
			{Name: "cgr", Unit: su.cgr.Unit},
			{Name: "z_two_phase"},
			{Name: "p_over_z", Unit: pU},
			{Name: "condensate_saturation"},
			{Name: "condensate_mobile"},
		},
	}
	for _, s := range rec.Steps {
		steps.Rows = append(steps.Rows, []any{
			pU.FromSI(s.P),
			u.gas.FromSI(s.WetGas), u.gas.FromSI(s.SalesGas), u.liquid.FromSI(s.Condensate),
			units.Percent.FromSI(s.WetGasRF), units.Percent.FromSI(s.SalesGasRF), units.Percent.FromSI(s.CondensateRF),
			su.cgr.of(s.CGR), s.Z2, pU.FromSI(s.PZ), s.So, s.Mobile,
		})
	}
	r.Tables = []Table{steps}
	return r
}

// relShare is 100 a/b in percent, or missing when b is not positive.
func relShare(a, b float64) any {
	if !(b > 0) || math.IsInf(a, 0) || math.IsNaN(a) {
		return nil
	}
	return 100 * a / b
}
