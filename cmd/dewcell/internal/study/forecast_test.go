package study

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"
)

const forecastSections = `
[wells]
count = 6
start = "2027-01-01"
test_rate = "9 MMscf/d"
test_reservoir_pressure = "4050 psia"
test_flowing_pressure = "3000 psia"
deliverability_exponent = 0.85
minimum_flowing_pressure = "1000 psia"
condensate_bank_factor = 0.6
[[wells.add]]
date = "2029-01-01"
count = 2

[production]
plateau_rate = "45 MMscf/d"
uptime = 0.95
minimum_rate = "2 MMscf/d"
end = "2060-01-01"
step = "3 months"

[plant]
remove = { CO2 = 1.0 }
ngl_recovery = { C3 = 0.8, "C7+" = 1.0 }
fuel = 0.02

[economics]
currency = "USD"
gas_price = "3.2 USD/MMBtu"
condensate_price = "68 USD/bbl"
ngl_price = "28 USD/bbl"
royalty = 0.125
discount_rate = 0.10
discounting = "end-of-year"
opex_fixed = "4.0e6 USD/year"
opex_per_well = "0.25e6 USD/year"
opex_gas = "0.35 USD/Mscf"
opex_condensate = "2.5 USD/bbl"
abandonment_cost = "30e6 USD"
[[economics.capex]]
date = "2026-07-01"
amount = "180e6 USD"
what = "wells and facilities"
`

// The sections in SI, each value against its definition: 1 MMscf =
// 1e6 × 0.028316846592 m³, 1 bbl = 0.158987294928 m³, 1 psi =
// 6894.757293168 Pa (NIST SP 811 (2008), B.8), 1 Btu_IT = 1055.05585262 J
// (NIST SP 811, B.8), a day 86400 s.
func TestForecastSections(t *testing.T) {
	s, err := Parse("forecast.toml", []byte(base+forecastSections))
	if err != nil {
		t.Fatal(err)
	}
	const ft3, bbl, psi, btu, day = 0.028316846592, 0.158987294928, 6894.757293168361, 1055.05585262, 86400.0
	near := func(what string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > 1e-12*math.Abs(want) {
			t.Errorf("%s = %.15g, want %.15g", what, got, want)
		}
	}
	w := s.Wells
	near("test_rate", w.TestRate, 9e6*ft3/day)
	near("test_reservoir_pressure", w.TestReservoirPressure, 4050*psi)
	near("minimum_flowing_pressure", w.MinimumFlowingPressure, 1000*psi)
	if w.Count != 6 || w.Exponent != 0.85 || w.BankFactor != 0.6 || len(w.Add) != 1 || w.Add[0].Count != 2 ||
		!w.Start.Equal(time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)) || !w.Add[0].Date.Equal(time.Date(2029, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("wells %+v", w)
	}
	p := s.Production
	near("plateau_rate", p.PlateauRate, 45e6*ft3/day)
	near("minimum_rate", p.MinimumRate, 2e6*ft3/day)
	if p.Uptime != 0.95 || p.StepMonths != 3 {
		t.Errorf("production %+v", p)
	}
	pl := s.Plant
	if pl.Remove["CO2"] != 1 || pl.NGL["C3"] != 0.8 || pl.Fuel != 0.02 {
		t.Errorf("plant %+v", pl)
	}
	for _, i := range s.groups["C7+"] { // the plus fraction stands for its pseudo-components
		if pl.NGL[s.Fluid.Component(i).Name] != 1 {
			t.Errorf("plant NGL of %s: %g, want the plus fraction's 1", s.Fluid.Component(i).Name, pl.NGL[s.Fluid.Component(i).Name])
		}
	}
	e := s.Economics
	near("gas_price", e.GasPrice, 3.2/(1e6*btu))
	near("condensate_price", e.CondensatePrice, 68/bbl)
	near("opex_gas", e.OpexGas, 0.35/(1e3*ft3))
	near("opex_fixed", e.OpexFixed, 4e6)
	if !e.GasPerEnergy || e.MidYear || e.Currency != "USD" || e.Royalty != 0.125 || len(e.Capex) != 1 || e.Capex[0].Amount != 180e6 || e.AbandonmentCost != 30e6 {
		t.Errorf("economics %+v", e)
	}
	s2, err := Parse("forecast.toml", []byte(base+strings.Replace(forecastSections, `"3.2 USD/MMBtu"`, `"3.6 USD/Mscf"`, 1)))
	if err != nil {
		t.Fatal(err)
	}
	near("gas_price per volume", s2.Economics.GasPrice, 3.6/(1e3*ft3))
	if s2.Economics.GasPerEnergy {
		t.Error("a price per Mscf taken as per energy")
	}
}

func TestForecastSectionErrors(t *testing.T) {
	with := func(old, new string) string {
		if !strings.Contains(forecastSections, old) {
			t.Fatalf("the sections lack %q", old)
		}
		return base + strings.Replace(forecastSections, old, new, 1)
	}
	for _, c := range []struct{ name, text, key, want string }{
		{"rate without a unit", with(`test_rate = "9 MMscf/d"`, `test_rate = 9`), "wells.test_rate", "has no unit"},
		{"rate as a volume", with(`test_rate = "9 MMscf/d"`, `test_rate = "9 MMscf"`), "wells.test_rate", "want a gas rate"},
		{"exponent above 1", with(`deliverability_exponent = 0.85`, `deliverability_exponent = 1.3`), "wells.deliverability_exponent", "out of range"},
		{"exponent missing", with("deliverability_exponent = 0.85\n", ""), "wells.deliverability_exponent", "missing"},
		{"flowing above reservoir", with(`test_flowing_pressure = "3000 psia"`, `test_flowing_pressure = "4100 psia"`), "wells.test_flowing_pressure", "not below"},
		{"bank factor zero", with(`condensate_bank_factor = 0.6`, `condensate_bank_factor = 0`), "wells.condensate_bank_factor", "out of range"},
		{"start not a date", with(`start = "2027-01-01"`, `start = "January 2027"`), "wells.start", "is not a date"},
		{"wells added before the start", with(`date = "2029-01-01"`, `date = "2026-01-01"`), "wells.add[1].date", "is not after"},
		{"end before the start", with(`end = "2060-01-01"`, `end = "2020-01-01"`), "production.end", "not after wells.start"},
		{"unknown step", with(`step = "3 months"`, `step = "2 weeks"`), "production.step", "unknown step"},
		{"minimum above plateau", with(`minimum_rate = "2 MMscf/d"`, `minimum_rate = "50 MMscf/d"`), "production.minimum_rate", "not below"},
		{"uptime above 1", with(`uptime = 0.95`, `uptime = 1.2`), "production.uptime", "out of range"},
		{"plant component unknown", with(`remove = { CO2 = 1.0 }`, `remove = { H2O = 1.0 }`), "plant.remove.H2O", "not a component of the study"},
		{"plant fraction above 1", with(`remove = { CO2 = 1.0 }`, `remove = { CO2 = 1.5 }`), "plant.remove.CO2", "out of range"},
		{"plant removes and recovers", with(`remove = { CO2 = 1.0 }`, `remove = { C3 = 0.5 }`), "plant.ngl_recovery", "more than all"},
		{"fuel of 1", with(`fuel = 0.02`, `fuel = 1.0`), "plant.fuel", "out of range"},
		{"price in another currency", with(`"68 USD/bbl"`, `"68 EUR/bbl"`), "economics.condensate_price", "economics.currency is USD"},
		{"price per an unknown unit", with(`"68 USD/bbl"`, `"68 USD/gallon"`), "economics.condensate_price", "unknown unit"},
		{"price without a unit", with(`"68 USD/bbl"`, `"68 USD"`), "economics.condensate_price", "no unit"},
		{"gas price per liquid", with(`"3.2 USD/MMBtu"`, `"3.2 USD/bbl"`), "economics.gas_price", "unknown unit"},
		{"negative price", with(`"68 USD/bbl"`, `"-68 USD/bbl"`), "economics.condensate_price", "0 or more"},
		{"royalty of 1", with(`royalty = 0.125`, `royalty = 1.0`), "economics.royalty", "out of range"},
		{"discounting unknown", with(`discounting = "end-of-year"`, `discounting = "continuous"`), "economics.discounting", "unknown value"},
		{"capex amount per year", with(`amount = "180e6 USD"`, `amount = "180e6 USD/year"`), "economics.capex[1].amount", "plain amount"},
		{"capex without a date", with("date = \"2026-07-01\"\n", ""), "economics.capex[1].date", "missing"},
		{"capex after the end", with(`date = "2026-07-01"`, `date = "2061-07-01"`), "economics.capex[1].date", "not before production.end"},
		{"currency not a code", with(`currency = "USD"`, `currency = "dollars"`), "economics.currency", "three-letter"},
		{"unknown key", with(`uptime = 0.95`, "uptime = 0.95\nplateau = 3"), "production.plateau", ""},
		{"minimum flowing above the initial pressure", with(`minimum_flowing_pressure = "1000 psia"`, `minimum_flowing_pressure = "5300 psia"`), "wells.minimum_flowing_pressure", "could never flow"},
		{"wells added after the end", with(`date = "2029-01-01"`, `date = "2061-01-01"`), "wells.add[1].date", "not before production.end"},
	} {
		_, err := Parse("forecast.toml", []byte(c.text))
		var se *Error
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		if !errors.As(err, &se) || se.Key != c.key || !strings.Contains(se.Msg, c.want) {
			t.Errorf("%s: %v; want key %s and a message containing %q", c.name, err, c.key, c.want)
		}
	}
}
