package study

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/internal/phys"
)

// The sections of the production forecast and its economics: [wells],
// [production], [plant] and [economics]. Rates are in SI per second, prices
// in the study's currency per SI unit (per joule of gross heating value, per
// standard m³ of gas, per m³ of liquid), yearly costs per year.

// Wells holds [wells] and its [[wells.add]] drilling schedule.
type Wells struct {
	Count int
	Start time.Time
	// TestRate is one well's wet-gas rate in its test, standard m³/s, at
	// the average reservoir pressure TestReservoirPressure and the
	// bottomhole flowing pressure TestFlowingPressure (Pa).
	TestRate                                   float64
	TestReservoirPressure, TestFlowingPressure float64
	// Exponent is n of the back-pressure equation q = C (pR² − pwf²)^n.
	Exponent float64
	// MinimumFlowingPressure is the lowest bottomhole flowing pressure, Pa.
	MinimumFlowingPressure float64
	// BankFactor multiplies the wells' productivity once the reservoir is
	// below the dew point; 1 when not given.
	BankFactor float64
	// Add are the wells drilled later, by date.
	Add []WellAdd
}

// A WellAdd is a number of wells that start producing on a date.
type WellAdd struct {
	Date  time.Time
	Count int
}

// Production holds [production].
type Production struct {
	// PlateauRate is the field's sales-gas target, standard m³/s.
	PlateauRate float64
	// Uptime is the fraction of the time the wells produce, (0, 1].
	Uptime float64
	// MinimumRate is the field's sales-gas rate below which production
	// stops, standard m³/s; 0 when not given.
	MinimumRate float64
	// End is the forecast horizon.
	End time.Time
	// StepMonths is the forecast's reporting step in months (1, 3, 6, 12).
	StepMonths int
}

// Plant holds [plant]: per model component (the plus fraction's name
// expanded to its pseudo-components), the fraction removed and the
// fraction recovered as NGL, and the fuel burnt, a fraction of the plant's
// inlet gas.
type Plant struct {
	Remove, NGL map[string]float64
	Fuel        float64
}

// Economics holds [economics] in the study's currency.
type Economics struct {
	Currency string
	// GasPrice is per joule of gross heating value when GasPerEnergy, else
	// per standard m³ of sales gas.
	GasPrice     float64
	GasPerEnergy bool
	// CondensatePrice and NGLPrice are per m³ of stock-tank liquid.
	CondensatePrice, NGLPrice float64
	Royalty, DiscountRate     float64
	// MidYear is the mid-year discounting convention, else end-of-year.
	MidYear bool
	// OpexFixed is per year, OpexPerWell per producing well and year,
	// OpexGas per standard m³ of sales gas, OpexCondensate per m³ of
	// condensate.
	OpexFixed, OpexPerWell, OpexGas, OpexCondensate float64
	AbandonmentCost                                 float64
	Capex                                           []Capex
}

// A Capex is a capital expense on a date.
type Capex struct {
	Date   time.Time
	Amount float64
	What   string
}

// The steps [production] step accepts, in months.
var productionSteps = map[string]int{
	"1 month": 1, "3 months": 3, "6 months": 6, "1 year": 12, "12 months": 12,
}

// Limits that catch typing and unit mistakes (common practice, no
// published source).
const (
	maxWells        = 10000
	earliestDate    = 1900
	latestDate      = 2200
	maxDiscountRate = 1.0 // 100 % a year
)

type fileWells struct {
	Count              value         `toml:"count"`
	Start              value         `toml:"start"`
	TestRate           value         `toml:"test_rate"`
	TestReservoirP     value         `toml:"test_reservoir_pressure"`
	TestFlowingP       value         `toml:"test_flowing_pressure"`
	Exponent           value         `toml:"deliverability_exponent"`
	MinimumFlowingP    value         `toml:"minimum_flowing_pressure"`
	CondensateBankMult value         `toml:"condensate_bank_factor"`
	Add                []fileWellAdd `toml:"add"`
}

type fileWellAdd struct {
	Date  value `toml:"date"`
	Count value `toml:"count"`
}

type fileProduction struct {
	PlateauRate value `toml:"plateau_rate"`
	Uptime      value `toml:"uptime"`
	MinimumRate value `toml:"minimum_rate"`
	End         value `toml:"end"`
	Step        value `toml:"step"`
}

type filePlant struct {
	Remove map[string]value `toml:"remove"`
	NGL    map[string]value `toml:"ngl_recovery"`
	Fuel   value            `toml:"fuel"`
}

type fileEconomics struct {
	Currency        value       `toml:"currency"`
	GasPrice        value       `toml:"gas_price"`
	CondensatePrice value       `toml:"condensate_price"`
	NGLPrice        value       `toml:"ngl_price"`
	Royalty         value       `toml:"royalty"`
	DiscountRate    value       `toml:"discount_rate"`
	Discounting     value       `toml:"discounting"`
	OpexFixed       value       `toml:"opex_fixed"`
	OpexPerWell     value       `toml:"opex_per_well"`
	OpexGas         value       `toml:"opex_gas"`
	OpexCondensate  value       `toml:"opex_condensate"`
	Abandonment     value       `toml:"abandonment_cost"`
	Capex           []fileCapex `toml:"capex"`
}

type fileCapex struct {
	Date   value `toml:"date"`
	Amount value `toml:"amount"`
	What   value `toml:"what"`
}

// dateIn reads a date and checks it is a plausible calendar date.
func (r *reader) dateIn(k string, v value, required bool) (time.Time, bool) {
	if !v.set {
		if required {
			r.missing(k, "a date such as 2027-01-01")
		}
		return time.Time{}, false
	}
	d := r.date(k, v)
	if r.err != nil {
		return time.Time{}, false
	}
	if y := d.Year(); y < earliestDate || y > latestDate {
		r.failf(k, "%s is out of range; want a date from %d to %d", d.Format(dateLayout), earliestDate, latestDate)
		return time.Time{}, false
	}
	return d, true
}

func (r *reader) wells(s *Study, f *fileWells) {
	if f == nil {
		return
	}
	w := &Wells{BankFactor: 1}
	if n, ok := r.integer("wells.count", f.Count, "the number of producing wells", 0, maxWells); ok {
		w.Count = n
	} else if r.err == nil {
		r.missing("wells.count", "the number of producing wells, such as count = 6")
	}
	w.Start, _ = r.dateIn("wells.start", f.Start, true)
	rate, ok := r.quantity("wells.test_rate", f.TestRate, units.GasRate, true)
	if ok && !(rate > 0) {
		r.failf("wells.test_rate", "%s: want a well's wet-gas rate above 0", textOf(f.TestRate))
	}
	w.TestRate = rate
	w.TestReservoirPressure = r.positivePressure("wells.test_reservoir_pressure", f.TestReservoirP, true)
	w.TestFlowingPressure = r.positivePressure("wells.test_flowing_pressure", f.TestFlowingP, true)
	if r.err == nil && !(w.TestFlowingPressure < w.TestReservoirPressure) {
		r.failf("wells.test_flowing_pressure", "%s is not below wells.test_reservoir_pressure (%s): a well flows only when its bottomhole pressure is below the reservoir's",
			textOf(f.TestFlowingP), textOf(f.TestReservoirP))
	}
	w.Exponent, _ = r.between("wells.deliverability_exponent", f.Exponent, "the exponent n of q = C (pR^2 - pwf^2)^n, from 0.5 (turbulent) to 1 (laminar flow)", true, 0.5, 1, false, false)
	w.MinimumFlowingPressure = r.positivePressure("wells.minimum_flowing_pressure", f.MinimumFlowingP, true)
	if pi := s.Reservoir.InitialPressure; r.err == nil && pi > 0 && w.MinimumFlowingPressure >= pi {
		r.failf("wells.minimum_flowing_pressure", "%s is not below reservoir.initial_pressure: the wells could never flow", textOf(f.MinimumFlowingP))
	}
	if bf, ok := r.between("wells.condensate_bank_factor", f.CondensateBankMult, "a productivity multiplier below the dew point", false, 0, 1, true, false); ok {
		w.BankFactor = bf
	}
	last := w.Start
	for i, a := range f.Add {
		k := fmt.Sprintf("wells.add[%d]", i+1)
		d, ok := r.dateIn(k+".date", a.Date, true)
		n, okN := r.integer(k+".count", a.Count, "the number of wells added", 1, maxWells)
		if r.err == nil && !okN {
			r.missing(k+".count", "the number of wells that start producing on the date, such as count = 2")
		}
		if r.err == nil && ok && !d.After(last) {
			r.failf(k+".date", "%s is not after %s: the drilling schedule runs forward from wells.start", d.Format(dateLayout), last.Format(dateLayout))
		}
		last = d
		w.Add = append(w.Add, WellAdd{Date: d, Count: n})
	}
	if r.err == nil && w.Count == 0 && len(w.Add) == 0 {
		r.failf("wells.count", "0 wells and no [[wells.add]]: nothing would produce")
	}
	s.Wells = w
}

func (r *reader) production(s *Study, f *fileProduction) {
	if f == nil {
		return
	}
	p := &Production{Uptime: 1}
	rate, ok := r.quantity("production.plateau_rate", f.PlateauRate, units.GasRate, true)
	if ok && !(rate > 0) {
		r.failf("production.plateau_rate", "%s: want the field's sales-gas target above 0", textOf(f.PlateauRate))
	}
	p.PlateauRate = rate
	if u, ok := r.between("production.uptime", f.Uptime, "the fraction of the time the wells produce", false, 0, 1, true, false); ok {
		p.Uptime = u
	}
	if m, ok := r.quantity("production.minimum_rate", f.MinimumRate, units.GasRate, false); ok {
		if m < 0 {
			r.failf("production.minimum_rate", "%s: want a sales-gas rate of 0 or more", textOf(f.MinimumRate))
		} else if r.err == nil && m >= p.PlateauRate {
			r.failf("production.minimum_rate", "%s is not below production.plateau_rate (%s): the field would stop at once", textOf(f.MinimumRate), textOf(f.PlateauRate))
		}
		p.MinimumRate = m
	}
	p.End, _ = r.dateIn("production.end", f.End, true)
	p.StepMonths = 1
	if f.Step.set {
		st := r.text("production.step", f.Step, false)
		if n, ok := productionSteps[strings.Join(strings.Fields(st), " ")]; ok {
			p.StepMonths = n
		} else if r.err == nil {
			names := make([]string, 0, len(productionSteps))
			for k := range productionSteps {
				names = append(names, k)
			}
			sort.Slice(names, func(i, j int) bool {
				return productionSteps[names[i]] < productionSteps[names[j]] || productionSteps[names[i]] == productionSteps[names[j]] && names[i] < names[j]
			})
			r.failf("production.step", "unknown step %q; want one of %s", st, quoteAll(names))
		}
	}
	if s.Wells != nil && r.err == nil && !p.End.After(s.Wells.Start) {
		r.failf("production.end", "%s is not after wells.start (%s)", p.End.Format(dateLayout), s.Wells.Start.Format(dateLayout))
	}
	if s.Wells != nil && r.err == nil {
		for i, a := range s.Wells.Add {
			if !a.Date.Before(p.End) {
				r.failf(fmt.Sprintf("wells.add[%d].date", i+1), "%s is not before production.end (%s): the wells would never produce", a.Date.Format(dateLayout), p.End.Format(dateLayout))
			}
		}
	}
	s.Production = p
}

// fractions reads a table of fractions by component name of the study (a
// plus fraction's name stands for its pseudo-components), expanded to the
// model's components.
func (r *reader) fractions(s *Study, k string, m map[string]value, what string, order []string) map[string]float64 {
	out := map[string]float64{}
	for _, name := range order {
		v, ok := m[name]
		if !ok {
			continue
		}
		kk := key(append(strings.Split(k, "."), name)...)
		x, ok := r.between(kk, v, what, true, 0, 1, false, false)
		if !ok {
			continue
		}
		idx, known := s.groups[name]
		if !known {
			r.failf(kk, "%q is not a component of the study; its components are %s", name, strings.Join(s.componentNames(), ", "))
			continue
		}
		for _, i := range idx {
			out[s.Fluid.Component(i).Name] = x
		}
	}
	return out
}

// componentNames lists the names the study's components go by: those of
// [fluid.composition], then the pseudo-components.
func (s *Study) componentNames() []string {
	var names []string
	seen := map[string]bool{}
	for _, sp := range s.specs {
		names, seen[sp.name] = append(names, sp.name), true
	}
	if s.Fluid != nil {
		for i := range s.Fluid.N() {
			if n := s.Fluid.Component(i).Name; !seen[n] {
				names, seen[n] = append(names, n), true
			}
		}
	}
	return names
}

func (r *reader) plant(s *Study, f *filePlant, md toml.MetaData) {
	if f == nil || s.Fluid == nil {
		return
	}
	p := &Plant{}
	p.Remove = r.fractions(s, "plant.remove", f.Remove, "the fraction of the component taken out", tableOrder(md, "plant", "remove"))
	p.NGL = r.fractions(s, "plant.ngl_recovery", f.NGL, "the fraction of the component recovered as NGL", tableOrder(md, "plant", "ngl_recovery"))
	for name, x := range p.NGL {
		if y := p.Remove[name]; r.err == nil && x+y > 1 {
			r.failf("plant.ngl_recovery", "%s: %g removed and %g recovered as NGL add up to more than all of it", name, y, x)
		}
	}
	if fu, ok := r.between("plant.fuel", f.Fuel, "the fraction of the plant's inlet gas burnt as fuel", false, 0, 1, false, true); ok {
		p.Fuel = fu
	}
	s.Plant = p
}

// money is a number, the currency and an optional "/unit": "3.2 USD/MMBtu".
var money = regexp.MustCompile(`^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([A-Za-z]{3})\s*(?:/\s*(.+?))?\s*$`)

// Units prices may be given per, in SI per unit: energy in J, gas in
// standard m³, liquid in m³, time in years.
var (
	btu         = 1055.05585262 // J, the International Table Btu (NIST SP 811 (2008), B.8), exact
	energyUnits = map[string]float64{"MMBtu": 1e6 * btu, "Btu": btu, "MMbtu": 1e6 * btu, "GJ": 1e9, "MJ": 1e6, "kWh": 3.6e6}
	gasUnits    = map[string]float64{"Mscf": 1e3 * phys.M3PerFt3, "Mcf": 1e3 * phys.M3PerFt3, "MMscf": 1e6 * phys.M3PerFt3, "scf": phys.M3PerFt3,
		"sm3": 1, "Sm3": 1, "1e3 sm3": 1e3, "1e3sm3": 1e3}
	liquidUnits = map[string]float64{"bbl": phys.M3PerBbl, "STB": phys.M3PerBbl, "m3": 1, "sm3": 1, "Sm3": 1}
	yearUnits   = map[string]float64{"year": 1, "yr": 1, "a": 1}
)

// price reads an amount of the study's currency, per one of the units of
// per (nil: a plain amount), in the currency per SI unit. perOf says which
// table the unit came from when there are two (the gas price).
func (r *reader) price(k string, v value, currency string, required bool, example string, per ...map[string]float64) (x float64, table int, ok bool) {
	if !v.set {
		if required {
			r.missing(k, example)
		}
		return 0, -1, false
	}
	s, isString := v.raw.(string)
	if !isString {
		r.failf(k, "%s was given; want an amount with its currency, such as %s", describe(v.raw), example)
		return 0, -1, false
	}
	m := money.FindStringSubmatch(s)
	if m == nil {
		r.failf(k, "%q is not an amount of money; want a number, the currency and the unit, such as %s", s, example)
		return 0, -1, false
	}
	n, err := strconv.ParseFloat(m[1], 64)
	if err != nil || math.IsInf(n, 0) {
		r.failf(k, "%s is not a finite number", m[1])
		return 0, -1, false
	}
	if n < 0 {
		r.failf(k, "%s: want an amount of 0 or more", s)
		return 0, -1, false
	}
	if currency != "" && m[2] != currency {
		r.failf(k, "%s is in %s, but economics.currency is %s: give every amount in the one currency", s, m[2], currency)
		return 0, -1, false
	}
	unit := strings.Join(strings.Fields(m[3]), " ")
	switch {
	case len(per) == 0 && unit == "":
		return n, -1, true
	case len(per) == 0:
		r.failf(k, "%s: want a plain amount, such as %s, not one per %s", s, example, unit)
		return 0, -1, false
	case unit == "":
		r.failf(k, "%s has no unit to be per; want such as %s", s, example)
		return 0, -1, false
	}
	for i, t := range per {
		if f, ok := t[unit]; ok {
			return n / f, i, true
		}
	}
	var known []string
	for _, t := range per {
		for u := range t {
			known = append(known, u)
		}
	}
	sort.Strings(known)
	r.failf(k, "%s: unknown unit %q to be per; want one of %s, such as %s", s, unit, strings.Join(known, ", "), example)
	return 0, -1, false
}

func (r *reader) economics(s *Study, f *fileEconomics) {
	if f == nil {
		return
	}
	e := &Economics{}
	e.Currency = r.text("economics.currency", f.Currency, true)
	if r.err == nil && !regexp.MustCompile(`^[A-Za-z]{3}$`).MatchString(e.Currency) {
		r.failf("economics.currency", "%q: want a three-letter currency code, such as \"USD\" or \"EUR\"", e.Currency)
	}
	cur := e.Currency
	ex := func(unit string) string { return fmt.Sprintf("%q", "3.2 "+cur+unit) }
	var t int
	e.GasPrice, t, _ = r.price("economics.gas_price", f.GasPrice, cur, true, ex("/MMBtu")+" or "+ex("/Mscf"), energyUnits, gasUnits)
	e.GasPerEnergy = t == 0
	e.CondensatePrice, _, _ = r.price("economics.condensate_price", f.CondensatePrice, cur, true, ex("/bbl"), liquidUnits)
	e.NGLPrice, _, _ = r.price("economics.ngl_price", f.NGLPrice, cur, false, ex("/bbl"), liquidUnits)
	e.Royalty, _ = r.between("economics.royalty", f.Royalty, "the royalty, a fraction of the revenue", false, 0, 1, false, true)
	e.DiscountRate, _ = r.between("economics.discount_rate", f.DiscountRate, "the discount rate, a fraction per year", true, 0, maxDiscountRate, false, false)
	e.MidYear = r.choice("economics.discounting", f.Discounting, "mid-year", "mid-year", "end-of-year") == "mid-year"
	e.OpexFixed, _, _ = r.price("economics.opex_fixed", f.OpexFixed, cur, false, ex("/year"), yearUnits)
	e.OpexPerWell, _, _ = r.price("economics.opex_per_well", f.OpexPerWell, cur, false, ex("/year"), yearUnits)
	e.OpexGas, _, _ = r.price("economics.opex_gas", f.OpexGas, cur, false, ex("/Mscf"), gasUnits)
	e.OpexCondensate, _, _ = r.price("economics.opex_condensate", f.OpexCondensate, cur, false, ex("/bbl"), liquidUnits)
	e.AbandonmentCost, _, _ = r.price("economics.abandonment_cost", f.Abandonment, cur, false, fmt.Sprintf("%q", "30e6 "+cur))
	for i, c := range f.Capex {
		k := fmt.Sprintf("economics.capex[%d]", i+1)
		d, _ := r.dateIn(k+".date", c.Date, true)
		a, _, _ := r.price(k+".amount", c.Amount, cur, true, fmt.Sprintf("%q", "180e6 "+cur))
		e.Capex = append(e.Capex, Capex{Date: d, Amount: a, What: r.text(k+".what", c.What, false)})
	}
	if s.Wells != nil && s.Production != nil && r.err == nil {
		for i, c := range e.Capex {
			if !c.Date.Before(s.Production.End) {
				r.failf(fmt.Sprintf("economics.capex[%d].date", i+1), "%s is not before production.end (%s): nothing would follow the spending",
					c.Date.Format(dateLayout), s.Production.End.Format(dateLayout))
			}
		}
	}
	s.Economics = e
}

// textOf is a value as the file gives it, for messages.
func textOf(v value) string {
	if s, ok := v.raw.(string); ok {
		return fmt.Sprintf("%q", s)
	}
	return fmt.Sprint(v.raw)
}
