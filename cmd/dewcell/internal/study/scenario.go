package study

import (
	"fmt"
	"reflect"
	"strings"

	"github.com/BurntSushi/toml"

	"dewcell/cmd/dewcell/internal/units"
)

// The kinds of [[scenario]]: depletion, gas cycling and water injection.
const (
	ScenarioDepletion = "depletion"
	ScenarioCycling   = "gas-cycling"
	ScenarioWater     = "water-injection"
)

// DefaultCells is the number of mixing cells in series of a gas-cycling
// scenario that gives none.
const DefaultCells = 10

// maxCells bounds scenario.cells (common practice, no published source:
// more cells than this add cost, not accuracy, for a field-scale model).
const maxCells = 200

// A Scenario is one [[scenario]]: a way to produce the field, with the
// study's wells, production targets, plant and economics as the scenario
// leaves them or overrides them ([scenario.wells], [scenario.production],
// [scenario.plant], [scenario.economics] under its [[scenario]] table,
// key by key).
type Scenario struct {
	Name, Kind string

	// Gas cycling: the share of the plant's outlet gas reinjected, bought
	// dry gas injected as well (standard m³/s), how long cycling lasts
	// (years, or until the producing CGR falls to StopCGR, m³/m³; one of
	// the two is set), the fraction of the hydrocarbon pore volume the
	// injected gas contacts, the mixing cells in series in that volume, and
	// the compression's capital cost and cost per standard m³ injected.
	ReturnFraction, MakeupGas float64
	CyclingYears, StopCGR     float64
	Sweep                     float64
	Cells                     int
	CompressionCapex          float64
	CompressionCost           float64

	// Water injection: reservoir volume of water injected per reservoir
	// volume produced, the gas saturation trapped behind the front, and
	// the injection's capital cost and cost per m³ of water. Sweep is the
	// fraction of the pore volume the water sweeps.
	Voidage, Sgr                  float64
	InjectionCapex, InjectionCost float64

	// The sections the scenario runs with: the study's, with the
	// scenario's overrides; nil where the study has none either.
	Wells      *Wells
	Production *Production
	Plant      *Plant
	Economics  *Economics
}

type fileScenario struct {
	Name             value `toml:"name"`
	Kind             value `toml:"kind"`
	ReturnFraction   value `toml:"return_fraction"`
	MakeupGas        value `toml:"makeup_gas"`
	CyclingYears     value `toml:"cycling_years"`
	StopCGR          value `toml:"stop_cgr"`
	Sweep            value `toml:"sweep_efficiency"`
	Cells            value `toml:"cells"`
	CompressionCapex value `toml:"compression_capex"`
	CompressionCost  value `toml:"compression_cost"`
	Voidage          value `toml:"voidage_replacement"`
	Sgr              value `toml:"residual_gas_saturation"`
	InjectionCapex   value `toml:"injection_capex"`
	InjectionCost    value `toml:"injection_cost"`

	Wells      *fileWells      `toml:"wells"`
	Production *fileProduction `toml:"production"`
	Plant      *filePlant      `toml:"plant"`
	Economics  *fileEconomics  `toml:"economics"`
}

// kindKeys are the keys of each kind of scenario beyond name and kind.
var kindKeys = map[string][]string{
	ScenarioDepletion: nil,
	ScenarioCycling:   {"return_fraction", "makeup_gas", "cycling_years", "stop_cgr", "sweep_efficiency", "cells", "compression_capex", "compression_cost"},
	ScenarioWater:     {"voidage_replacement", "residual_gas_saturation", "sweep_efficiency", "injection_capex", "injection_cost"},
}

// overlay returns a copy of base with the values over sets: every value
// field given, every slice and map given, replaces base's. Either may be
// nil.
func overlay[T any](base, over *T) *T {
	switch {
	case over == nil:
		return base
	case base == nil:
		return over
	}
	out := *base
	o, b := reflect.ValueOf(&out).Elem(), reflect.ValueOf(over).Elem()
	for i := range o.NumField() {
		f := b.Field(i)
		switch v := f.Interface().(type) {
		case value:
			if v.set {
				o.Field(i).Set(f)
			}
		default:
			if (f.Kind() == reflect.Slice || f.Kind() == reflect.Map) && !f.IsNil() {
				o.Field(i).Set(f)
			}
		}
	}
	return &out
}

// scenarios reads the [[scenario]] tables; fs is the file's study, whose
// sections the scenarios start from.
func (r *reader) scenarios(s *Study, fs *fileStudy, list []fileScenario, md toml.MetaData) {
	seen := map[string]bool{}
	for i, f := range list {
		k := fmt.Sprintf("scenario[%d]", i+1)
		sc := Scenario{Name: r.text(k+".name", f.Name, true), Kind: r.choice(k+".kind", f.Kind, "", ScenarioDepletion, ScenarioCycling, ScenarioWater)}
		if r.err != nil {
			return
		}
		if !f.Kind.set {
			r.missing(k+".kind", fmt.Sprintf("one of %s", quoteAll([]string{ScenarioDepletion, ScenarioCycling, ScenarioWater})))
			return
		}
		if strings.TrimSpace(sc.Name) == "" {
			r.failf(k+".name", "is empty; want a name for the scenario, such as \"cycling\"")
			return
		}
		if seen[sc.Name] {
			r.failf(k+".name", "%q names an earlier scenario too; give each its own name", sc.Name)
			return
		}
		seen[sc.Name] = true
		r.scenarioKeys(k, sc.Kind, &f)
		switch sc.Kind {
		case ScenarioCycling:
			sc.ReturnFraction, _ = r.between(k+".return_fraction", f.ReturnFraction, "the share of the plant's outlet gas reinjected", true, 0, 1, false, false)
			if m, ok := r.quantity(k+".makeup_gas", f.MakeupGas, units.GasRate, false); ok {
				if m < 0 {
					r.failf(k+".makeup_gas", "%s: want a gas rate of 0 or more", textOf(f.MakeupGas))
				}
				sc.MakeupGas = m
			}
			switch {
			case f.CyclingYears.set && f.StopCGR.set:
				r.failf(k+".stop_cgr", "give either cycling_years or stop_cgr, not both: cycling ends at one of them")
			case f.CyclingYears.set:
				sc.CyclingYears, _ = r.between(k+".cycling_years", f.CyclingYears, "the years of cycling before blowdown", true, 0, 200, true, false)
			case f.StopCGR.set:
				cgr, ok := r.quantity(k+".stop_cgr", f.StopCGR, units.LiquidGasRatio, true)
				if ok && !(cgr > 0) {
					r.failf(k+".stop_cgr", "%s: want a producing CGR above 0 at which cycling stops", textOf(f.StopCGR))
				}
				sc.StopCGR = cgr
			default:
				r.missing(k+".cycling_years", `how long cycling lasts before blowdown: cycling_years = 10, or stop_cgr = "20 STB/MMscf"`)
			}
			sc.Sweep, _ = r.between(k+".sweep_efficiency", f.Sweep, "the fraction of the hydrocarbon pore volume the injected gas contacts", true, 0, 1, true, false)
			sc.Cells = DefaultCells
			if f.Cells.set {
				if n, ok := r.integer(k+".cells", f.Cells, "the number of mixing cells in series", 1, maxCells); ok {
					sc.Cells = n
				}
			}
			sc.CompressionCapex = r.scenarioMoney(s, fs, k+".compression_capex", f.CompressionCapex, nil)
			sc.CompressionCost = r.scenarioMoney(s, fs, k+".compression_cost", f.CompressionCost, gasUnits)
		case ScenarioWater:
			sc.Voidage, _ = r.between(k+".voidage_replacement", f.Voidage, "the reservoir volume of water injected per reservoir volume produced", true, 0, 2, true, false)
			sc.Sgr, _ = r.between(k+".residual_gas_saturation", f.Sgr, "the gas saturation trapped behind the water front", true, 0, 1, false, true)
			sc.Sweep, _ = r.between(k+".sweep_efficiency", f.Sweep, "the fraction of the pore volume the water sweeps", true, 0, 1, true, false)
			if r.err == nil && sc.Sgr >= 1-s.Reservoir.WaterSaturation {
				r.failf(k+".residual_gas_saturation", "%g leaves no movable gas above the connate water (reservoir.water_saturation %g)", sc.Sgr, s.Reservoir.WaterSaturation)
			}
			sc.InjectionCapex = r.scenarioMoney(s, fs, k+".injection_capex", f.InjectionCapex, nil)
			sc.InjectionCost = r.scenarioMoney(s, fs, k+".injection_cost", f.InjectionCost, liquidUnits)
		}
		if r.err != nil {
			return
		}
		// Scenarios are compared at the study's currency and discount
		// rate: a scenario may change prices and costs, not those.
		if e := f.Economics; e != nil {
			for _, c := range []struct {
				key string
				v   value
			}{{"currency", e.Currency}, {"discount_rate", e.DiscountRate}, {"discounting", e.Discounting}} {
				if c.v.set {
					r.failf(k+".economics."+c.key, "a scenario is compared with the others at the study's economics.%s: give it in [economics] only", c.key)
					return
				}
			}
		}
		// The sections with the scenario's overrides, read as the study's
		// are, with the scenario's keys in the messages.
		t := &Study{File: s.File, Fluid: s.Fluid, Z: s.Z, specs: s.specs, groups: s.groups, Reservoir: s.Reservoir}
		r.rename = func(key string) string {
			for _, sec := range []struct {
				name string
				over bool
			}{{"wells", f.Wells != nil}, {"production", f.Production != nil}, {"plant", f.Plant != nil}, {"economics", f.Economics != nil}} {
				if sec.over && (key == sec.name || strings.HasPrefix(key, sec.name+".")) {
					return k + "." + key
				}
			}
			return key
		}
		r.wells(t, overlay(fs.Wells, f.Wells))
		r.production(t, overlay(fs.Production, f.Production))
		r.plant(t, overlay(fs.Plant, f.Plant), md)
		r.economics(t, overlay(fs.Economics, f.Economics))
		r.rename = nil
		sc.Wells, sc.Production, sc.Plant, sc.Economics = t.Wells, t.Production, t.Plant, t.Economics
		if r.err != nil {
			return
		}
		s.Scenarios = append(s.Scenarios, sc)
	}
}

// scenarioKeys refuses the keys of another kind of scenario.
func (r *reader) scenarioKeys(k, kind string, f *fileScenario) {
	given := map[string]bool{
		"return_fraction": f.ReturnFraction.set, "makeup_gas": f.MakeupGas.set, "cycling_years": f.CyclingYears.set, "stop_cgr": f.StopCGR.set,
		"sweep_efficiency": f.Sweep.set, "cells": f.Cells.set, "compression_capex": f.CompressionCapex.set, "compression_cost": f.CompressionCost.set,
		"voidage_replacement": f.Voidage.set, "residual_gas_saturation": f.Sgr.set, "injection_capex": f.InjectionCapex.set, "injection_cost": f.InjectionCost.set,
	}
	for _, key := range []string{"return_fraction", "makeup_gas", "cycling_years", "stop_cgr", "sweep_efficiency", "cells", "compression_capex", "compression_cost",
		"voidage_replacement", "residual_gas_saturation", "injection_capex", "injection_cost"} {
		if !given[key] {
			continue
		}
		ok := false
		for _, a := range kindKeys[kind] {
			ok = ok || a == key
		}
		if !ok {
			var owners []string
			for _, kd := range []string{ScenarioCycling, ScenarioWater} {
				for _, a := range kindKeys[kd] {
					if a == key {
						owners = append(owners, fmt.Sprintf("%q", kd))
					}
				}
			}
			r.failf(k+"."+key, "is a key of %s scenarios, not of a %q one", strings.Join(owners, " and "), kind)
			return
		}
	}
}

// scenarioMoney reads a cost of a scenario in the study's currency (that
// of [economics], which a scenario with costs needs), per one of the units
// of per (nil: a plain amount); 0 when not given.
func (r *reader) scenarioMoney(s *Study, fs *fileStudy, k string, v value, per map[string]float64) float64 {
	if !v.set {
		return 0
	}
	cur := ""
	if s.Economics != nil {
		cur = s.Economics.Currency
	}
	if cur == "" {
		r.failf(k, "is a cost, but the study has no [economics] with its currency")
		return 0
	}
	ex := fmt.Sprintf("%q", "60e6 "+cur)
	if per != nil {
		ex = fmt.Sprintf("%q", "0.3 "+cur+"/Mscf")
		if _, ok := per["bbl"]; ok {
			ex = fmt.Sprintf("%q", "0.6 "+cur+"/bbl")
		}
	}
	var x float64
	if per == nil {
		x, _, _ = r.price(k, v, cur, true, ex)
	} else {
		x, _, _ = r.price(k, v, cur, true, ex, per)
	}
	return x
}
