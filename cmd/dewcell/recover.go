package main

import (
	"fmt"
	"math"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/mbal"
)

// Flags of recover.
const (
	flagMobileLiquid = "mobile-liquid"
	flagFixedSteps   = "fixed-steps"
)

// defaultRecoverySteps is the number of even steps from the dew point to the
// abandonment pressure that recover reports when given no pressures.
const defaultRecoverySteps = 10

func recoverCommand() *cli.Command {
	return studyCommand("recover",
		"depletion recovery from the initial to the abandonment pressure: cumulative wet gas, sales gas and condensate, recovery factors, producing CGR, two-phase Z and p/z, condensate saturation; the depletion is integrated to convergence, with its estimated error",
		[]cli.Flag{
			&cli.StringFlag{Name: flagPressures, Usage: "the reservoir pressures to report, falling, below reservoir.initial_pressure and not below reservoir.abandonment_pressure, comma-separated, each with its unit: `LIST` such as \"4000 psia, 3000 psia, 2000 psia\"; the abandonment pressure is added when the list stops above it. The integration steps onto them; they do not set its accuracy"},
			&cli.IntFlag{Name: flagSteps, Value: defaultRecoverySteps, Usage: fmt.Sprintf("report `N` even steps, 1 to %d, from the dew point down to reservoir.abandonment_pressure; they do not set the integration's accuracy", maxSteps)},
			&cli.IntFlag{Name: flagFixedSteps, Usage: fmt.Sprintf("integrate instead with `N` even first-order steps, 1 to %d, from the dew point (the laboratory's constant-volume depletion), and report each: for checking; the recovery falls short of the converged one by about in proportion to the step", mbal.MaxFixedSteps)},
			&cli.BoolFlag{Name: flagMobileLiquid, Usage: "let the condensate above the critical condensate saturation flow with the gas in proportion to its mobility (fractional flow with the [relative_permeability] curves and the phases' viscosities): the upper bound of condensate recovery; by default the condensate stays in the rock (the lower bound)"},
			startAtDewPointFlag(),
			plotFlag(),
		},
		func(c *cli.Context, o *options, st *study.Study) error {
			ro, err := recoverOptions(c, o, st)
			if err != nil {
				return err
			}
			rep, err := recoverReportAt(o, st, ro, c.Bool(flagStartAtDew))
			if err != nil {
				return err
			}
			return o.emitPlots(c, rep)
		})
}

// recoverOptions reads --pressures, --steps, --fixed-steps and
// --mobile-liquid.
func recoverOptions(c *cli.Context, o *options, st *study.Study) (mbal.RecoverOptions, error) {
	ro := mbal.RecoverOptions{MobileLiquid: c.Bool(flagMobileLiquid), Steps: defaultRecoverySteps}
	bad := func(format string, args ...any) error { return cli.Exit(fmt.Sprintf(format, args...), exitUsage) }
	if c.IsSet(flagPressures) && c.IsSet(flagSteps) {
		return ro, bad("--%s and --%s exclude each other: give the pressures, or their number", flagPressures, flagSteps)
	}
	if c.IsSet(flagFixedSteps) {
		for _, f := range []string{flagPressures, flagSteps} {
			if c.IsSet(f) {
				return ro, bad("--%s and --%s exclude each other: the fixed steps are the pressures reported", flagFixedSteps, f)
			}
		}
		ro.FixedSteps, ro.Steps = c.Int(flagFixedSteps), 0
		if ro.FixedSteps < 1 || ro.FixedSteps > mbal.MaxFixedSteps {
			return ro, bad("--%s: %d, want a number of steps from 1 to %d", flagFixedSteps, ro.FixedSteps, mbal.MaxFixedSteps)
		}
		return ro, nil
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
		o.note(fmt.Sprintf("the --%s list stops above reservoir.abandonment_pressure; %s is added as the last step", flagPressures, pressureNote(o.sys, pa)))
		ps = append(ps, pa)
	}
	ro.Pressures = ps
	ro.Steps = 0
	return ro, nil
}

// recoverReport runs the depletion of the study's reservoir with ro from
// its initial pressure; see recoverReportAt.
func recoverReport(o *options, st *study.Study, ro mbal.RecoverOptions) (*Report, error) {
	return recoverReportAt(o, st, ro, false)
}

// recoverReportAt runs the depletion of the study's reservoir with ro, and
// the other bound of condensate recovery (mobile or immobile condensate) for
// the summary, and warns when the condensate saturation passes the critical
// saturation. atDew starts the reservoir at the model's dew point when that
// lies above the initial pressure (--start-at-dew-point).
func recoverReportAt(o *options, st *study.Study, ro mbal.RecoverOptions, atDew bool) (*Report, error) {
	res, err := reservoirOf(o, st, "recover", true)
	if err != nil {
		return nil, err
	}
	started, err := startAtDewPoint(o, st, &res, "recover", atDew)
	if err != nil {
		return nil, err
	}
	if len(st.Separator) == 0 {
		o.warnOnce(noSeparator, fmt.Sprintf("%s gives no [[separator.stage]]: the produced stream goes straight to the stock tank", st.File))
	}
	if ro.Pressures != nil && ro.Pressures[0] >= res.Pi {
		return nil, cli.Exit(fmt.Sprintf("--%s: item 1 (%s) is not below the model's dew point (%s), where the reservoir starts with --%s",
			flagPressures, pressureText(o.sys, ro.Pressures[0]), pressureText(o.sys, res.Pi), flagStartAtDew), exitUsage)
	}
	tr := trainOf(st, o.sys)
	rec, err := mbal.Recover(st.Fluid, st.Z, res, tr, ro)
	if err != nil {
		return nil, reservoirError(st, o.sys, "depletion recovery", err)
	}
	sc := res.Sc
	if sc == 0 {
		sc = mbal.DefaultSc
	}
	// The two bounds are the same depletion when the condensate never
	// reaches its critical saturation: no liquid flows in either.
	alt := rec
	if rec.MaxSo > sc*(1-1e-6) || rec.CriticalP > 0 {
		other := ro
		other.MobileLiquid = !ro.MobileLiquid
		other.SkipMaxSaturation = true
		if alt, err = mbal.Recover(st.Fluid, st.Z, res, tr, other); err != nil {
			return nil, reservoirError(st, o.sys, "depletion recovery with the other condensate bound", err)
		}
	}
	mobile, immobile := rec, alt
	if !ro.MobileLiquid {
		mobile, immobile = alt, rec
	}
	if rec.CriticalP > 0 {
		msg := fmt.Sprintf("the condensate saturation passes the critical condensate saturation (%s, reservoir.critical_condensate_saturation) at %s",
			report.Sig(sc, 3), pressureNote(o.sys, rec.CriticalP))
		if ro.MobileLiquid {
			o.note(fmt.Sprintf("%s: below it the condensate flows with the gas in proportion to its mobility (--%s)", msg, flagMobileLiquid))
		} else {
			o.warn(msg + fmt.Sprintf(": the condensate could flow below it, which this run leaves in the rock; recover --%s gives that upper bound", flagMobileLiquid))
		}
	}
	return recoveryReportOf(st, o.sys, res, rec, mobile, immobile, ro, sc, started), nil
}

// recoveryReportOf shows rec in sys. mobile and immobile are the two bounds
// of condensate recovery (one of them rec); started says the reservoir was
// started at the model's dew point.
func recoveryReportOf(st *study.Study, sys units.System, res mbal.Reservoir, rec, mobile, immobile *mbal.Recovery, ro mbal.RecoverOptions, sc float64, started bool) *Report {
	u := inPlaceUnitsOf(sys)
	su := surfaceUnitsOf(sys)
	pU, cU := u.press, sys.Unit(units.Compressibility)
	ip := rec.InPlace
	last := rec.Steps[len(rec.Steps)-1]
	model := "immobile condensate: the retrograde liquid stays in the rock (lower bound of condensate recovery)"
	if ro.MobileLiquid {
		model = "mobile condensate: above the critical saturation the condensate flows in proportion to its mobility, from Corey relative permeabilities and Lohrenz-Bray-Clark viscosities (upper bound of condensate recovery)"
	}
	d := rec.Depletion
	integration := fmt.Sprintf("adaptive, third order, tolerance %g of the condensate and the gas: %d steps below the dew point (%d taken again, shorter)",
		d.Tolerance, d.IntegrationSteps, d.RejectedSteps)
	var condErr, gasErr any
	if d.Adaptive {
		condErr, gasErr = units.Percent.FromSI(last.CondensateRFError), units.Percent.FromSI(last.SalesGasRFError)
	} else {
		integration = fmt.Sprintf("fixed: %d even first-order steps from the dew point (the laboratory's procedure; no error estimate)", ro.FixedSteps)
	}
	var critP, maxP any
	if rec.CriticalP > 0 {
		critP = pU.FromSI(rec.CriticalP)
	}
	if rec.MaxSo > 0 {
		maxP = pU.FromSI(rec.MaxSoP)
	}
	kr := res.RelPerm
	or := func(v, def float64) float64 {
		if v == 0 {
			return def
		}
		return v
	}
	lastM, lastI := mobile.Steps[len(mobile.Steps)-1], immobile.Steps[len(immobile.Steps)-1]
	r := &Report{
		Name:    "recovery",
		Section: "Depletion recovery",
		Title:   "depletion recovery of " + fluidName(st),
		Fields: []Field{
			{Column: Column{Name: "condensate_model"}, Value: model},
			{Column: Column{Name: "mobile_liquid"}, Value: ro.MobileLiquid},
			{Column: Column{Name: "integration", Verbose: true}, Value: integration},
			{Column: Column{Name: "started_at_model_dew_point"}, Value: started},
			{Column: Column{Name: "initial_pressure", Unit: pU}, Value: pU.FromSI(res.Pi)},
			{Column: Column{Name: "dew_pressure", Unit: pU}, Value: pU.FromSI(d.Dew.P)},
			{Column: Column{Name: "abandonment_pressure", Unit: pU}, Value: pU.FromSI(last.P)},
			{Column: Column{Name: "wet_gas_in_place", Unit: u.gas}, Value: u.gas.FromSI(ip.WetGas)},
			{Column: Column{Name: "sales_gas_in_place", Unit: u.gas}, Value: u.gas.FromSI(ip.SalesGas)},
			{Column: Column{Name: "condensate_in_place", Unit: u.liquid}, Value: u.liquid.FromSI(ip.Condensate)},
			{Column: Column{Name: "water_saturation", Format: report.Saturation}, Value: res.Sw},
			{Column: Column{Name: "critical_condensate_saturation", Format: report.Saturation}, Value: sc},
			{Column: Column{Name: "gas_relative_permeability_exponent", Format: report.Fixed(2)}, Value: or(kr.GasExponent, mbal.DefaultGasExponent)},
			{Column: Column{Name: "condensate_relative_permeability_exponent", Format: report.Fixed(2)}, Value: or(kr.CondensateExponent, mbal.DefaultCondensateExponent)},
			{Column: Column{Name: "gas_end_point_relative_permeability", Format: report.Fixed(3)}, Value: or(kr.GasEndpoint, mbal.DefaultGasEndpoint)},
			{Column: Column{Name: "condensate_end_point_relative_permeability", Format: report.Fixed(3)}, Value: or(kr.CondensateEndpoint, mbal.DefaultCondensateEndpoint)},
			{Column: Column{Name: "rock_compressibility", Unit: cU}, Value: cU.FromSI(res.Cf)},
			{Column: Column{Name: "water_compressibility", Unit: cU}, Value: cU.FromSI(res.Cw)},
			{Column: Column{Name: "effective_compressibility", Unit: cU}, Value: cU.FromSI(res.EffectiveCompressibility())},
			{Column: Column{Name: "max_condensate_saturation", Label: "Maximum condensate saturation", Format: report.Saturation}, Value: rec.MaxSo},
			{Column: Column{Name: "max_condensate_saturation_pressure", Label: "Pressure of the maximum condensate saturation", Unit: pU}, Value: maxP},
			{Column: Column{Name: "critical_saturation_pressure", Label: "Pressure where the critical saturation is passed", Unit: pU}, Value: critP},
			{Column: Column{Name: "cum_wet_gas_at_abandonment", Unit: u.gas}, Value: u.gas.FromSI(last.WetGas)},
			{Column: Column{Name: "cum_sales_gas_at_abandonment", Unit: u.gas}, Value: u.gas.FromSI(last.SalesGas)},
			{Column: Column{Name: "cum_condensate_at_abandonment", Unit: u.liquid}, Value: u.liquid.FromSI(last.Condensate)},
			{Column: Column{Name: "wet_gas_recovery_at_abandonment", Unit: units.Percent}, Value: units.Percent.FromSI(last.WetGasRF)},
			{Column: Column{Name: "sales_gas_recovery_at_abandonment", Unit: units.Percent}, Value: units.Percent.FromSI(last.SalesGasRF)},
			{Column: Column{Name: "condensate_recovery_at_abandonment", Unit: units.Percent}, Value: units.Percent.FromSI(last.CondensateRF)},
			{Column: Column{Name: "condensate_recovery_error", Label: "Condensate recovery, estimated integration error", Unit: units.Percent, Symbol: "% points", Format: report.Fixed(4)}, Value: condErr},
			{Column: Column{Name: "sales_gas_recovery_error", Label: "Sales gas recovery, estimated integration error", Unit: units.Percent, Symbol: "% points", Format: report.Fixed(4)}, Value: gasErr},
			{Column: Column{Name: "condensate_recovery_at_abandonment_immobile_liquid", Label: "Condensate recovery at abandonment, condensate immobile", Unit: units.Percent}, Value: units.Percent.FromSI(lastI.CondensateRF)},
			{Column: Column{Name: "condensate_recovery_at_abandonment_mobile_liquid", Label: "Condensate recovery at abandonment, condensate mobile", Unit: units.Percent}, Value: units.Percent.FromSI(lastM.CondensateRF)},
			{Column: Column{Name: "condensate_left_in_reservoir", Unit: u.liquid}, Value: u.liquid.FromSI(rec.CondensateLeft)},
			{Column: Column{Name: "condensate_left_in_reservoir", Label: "Condensate left in reservoir, share of in place", Unit: units.Percent}, Value: relShare(rec.CondensateLeft, ip.Condensate)},
			{Column: Column{Name: "stock_tank_liquid_of_remaining_fluid_if_processed", Unit: u.liquid}, Value: u.liquid.FromSI(rec.RemainingFluidCondensate)},
			{Column: Column{Name: "retrograde_liquid_in_rock", Unit: u.pore}, Value: u.pore.FromSI(last.So * res.PV())},
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
			{Name: "z_two_phase", Format: report.ZFactor},
			{Name: "p_over_z", Unit: pU},
			{Name: "condensate_saturation", Format: report.Saturation},
			{Name: "condensate_mobile", Label: "Above the critical saturation"},
			{Name: "condensate_flow_share", Label: "Condensate share of the flow", Format: report.Fixed(4)},
		},
	}
	for _, s := range rec.Steps {
		steps.Rows = append(steps.Rows, []any{
			pU.FromSI(s.P),
			u.gas.FromSI(s.WetGas), u.gas.FromSI(s.SalesGas), u.liquid.FromSI(s.Condensate),
			units.Percent.FromSI(s.WetGasRF), units.Percent.FromSI(s.SalesGasRF), units.Percent.FromSI(s.CondensateRF),
			su.cgr.of(s.CGR), s.Z2, pU.FromSI(s.PZ), s.So, s.Mobile, s.CondensateFlow,
		})
	}
	r.Tables = []Table{steps}
	r.Figures = recoveryFigures(rec, pU, sc)
	return r
}

// recoveryFigures draw the recoveries of wet gas, sales gas and condensate
// against the reservoir pressure, and the condensate saturation with the
// critical saturation.
func recoveryFigures(rec *mbal.Recovery, pU units.Unit, sc float64) []*report.Figure {
	wet := report.Series{Label: "Wet gas", Style: report.LinePoints}
	sales := report.Series{Label: "Sales gas", Style: report.LinePoints}
	cond := report.Series{Label: "Condensate", Style: report.LinePoints}
	so := report.Series{Label: "Condensate saturation", Style: report.LinePoints}
	for _, s := range rec.Steps {
		p := pU.FromSI(s.P)
		for _, c := range []struct {
			s *report.Series
			v float64
		}{{&wet, s.WetGasRF}, {&sales, s.SalesGasRF}, {&cond, s.CondensateRF}} {
			c.s.X, c.s.Y = append(c.s.X, p), append(c.s.Y, units.Percent.FromSI(c.v))
		}
		so.X, so.Y = append(so.X, p), append(so.Y, s.So)
	}
	return []*report.Figure{{
		Name:    "recovery",
		Title:   "Depletion recovery",
		Caption: "Cumulative production as a share of the initial in place, against the reservoir pressure, from the initial pressure down to abandonment.",
		X:       report.Axis{Label: "Reservoir pressure", Unit: pU, Reverse: true},
		Y:       report.Axis{Label: "Recovery", Unit: units.Percent},
		Series:  []report.Series{wet, sales, cond},
		Lines:   []report.RefLine{{Label: "Dew point", Value: pU.FromSI(rec.Depletion.Dew.P), Vertical: true}},
	}, {
		Name:    "condensate-saturation",
		Title:   "Condensate saturation in the reservoir",
		Caption: "Retrograde condensate as a fraction of the pore volume against the reservoir pressure; above the critical saturation it can flow.",
		X:       report.Axis{Label: "Reservoir pressure", Unit: pU, Reverse: true},
		Y:       report.Axis{Label: "Condensate saturation, fraction of pore volume"},
		Series:  []report.Series{so},
		Lines:   []report.RefLine{{Label: "Critical condensate saturation", Value: sc}},
	}}
}

// relShare is 100 a/b in percent, or missing when b is not positive.
func relShare(a, b float64) any {
	if !(b > 0) || math.IsInf(a, 0) || math.IsNaN(a) {
		return nil
	}
	return 100 * a / b
}
