package study

import (
	"errors"
	"math"
	"strings"
	"testing"
)

const scenarioSections = `
[[scenario]]
name = "depletion"
kind = "depletion"

[[scenario]]
name = "cycling"
kind = "gas-cycling"
return_fraction = 0.85
makeup_gas = "0 MMscf/d"
cycling_years = 10
sweep_efficiency = 0.7
cells = 10
compression_capex = "60e6 USD"
compression_cost = "0.30 USD/Mscf"
[scenario.production]
plateau_rate = "40 MMscf/d"

[[scenario]]
name = "water injection"
kind = "water-injection"
voidage_replacement = 1.0
residual_gas_saturation = 0.25
sweep_efficiency = 0.6
injection_capex = "40e6 USD"
injection_cost = "0.6 USD/bbl"
`

// The scenarios in SI (NIST SP 811 (2008), B.8: 1 ft³ = 0.028316846592 m³,
// 1 bbl = 0.158987294928 m³), each with the study's sections but where it
// overrides a key of them.
func TestScenarios(t *testing.T) {
	s, err := Parse("scenarios.toml", []byte(base+forecastSections+scenarioSections))
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Scenarios) != 3 {
		t.Fatalf("%d scenarios, want 3", len(s.Scenarios))
	}
	d, c, w := s.Scenarios[0], s.Scenarios[1], s.Scenarios[2]
	if d.Name != "depletion" || d.Kind != ScenarioDepletion || c.Kind != ScenarioCycling || w.Kind != ScenarioWater || w.Name != "water injection" {
		t.Errorf("names and kinds %q %q, %q %q, %q %q", d.Name, d.Kind, c.Name, c.Kind, w.Name, w.Kind)
	}
	const ft3, bbl = 0.028316846592, 0.158987294928
	if c.ReturnFraction != 0.85 || c.CyclingYears != 10 || c.Sweep != 0.7 || c.Cells != 10 || c.CompressionCapex != 60e6 ||
		math.Abs(c.CompressionCost-0.30/(1e3*ft3)) > 1e-15 || c.MakeupGas != 0 {
		t.Errorf("cycling %+v", c)
	}
	if w.Voidage != 1 || w.Sgr != 0.25 || w.Sweep != 0.6 || w.InjectionCapex != 40e6 || math.Abs(w.InjectionCost-0.6/bbl) > 1e-12 {
		t.Errorf("water injection %+v", w)
	}
	// The override, and the study's value where there is none.
	if got, want := c.Production.PlateauRate, 40e6*ft3/86400; math.Abs(got-want) > 1e-12*want {
		t.Errorf("cycling plateau %g, want its own 40 MMscf/d", got)
	}
	if c.Production.Uptime != s.Production.Uptime || !c.Production.End.Equal(s.Production.End) {
		t.Errorf("cycling production %+v: the keys it does not override are the study's %+v", c.Production, s.Production)
	}
	if w.Production.PlateauRate != s.Production.PlateauRate || w.Economics.DiscountRate != s.Economics.DiscountRate || w.Wells.Count != s.Wells.Count {
		t.Error("a scenario without overrides does not run with the study's sections")
	}
}

func TestScenarioErrors(t *testing.T) {
	with := func(old, new string) string {
		if !strings.Contains(scenarioSections, old) {
			t.Fatalf("the sections lack %q", old)
		}
		return base + forecastSections + strings.Replace(scenarioSections, old, new, 1)
	}
	for _, c := range []struct{ name, text, key, want string }{
		{"unknown kind", with(`kind = "gas-cycling"`, `kind = "cycling"`), "scenario[2].kind", "unknown value"},
		{"no kind", with("kind = \"depletion\"\n", ""), "scenario[1].kind", "missing"},
		{"no name", with("name = \"depletion\"\n", ""), "scenario[1].name", "missing"},
		{"same name", with(`name = "cycling"`, `name = "depletion"`), "scenario[2].name", "earlier scenario"},
		{"return fraction above 1", with(`return_fraction = 0.85`, `return_fraction = 1.2`), "scenario[2].return_fraction", "out of range"},
		{"years and stop CGR", with(`cycling_years = 10`, "cycling_years = 10\nstop_cgr = \"20 STB/MMscf\""), "scenario[2].stop_cgr", "not both"},
		{"neither years nor stop CGR", with("cycling_years = 10\n", ""), "scenario[2].cycling_years", "missing"},
		{"stop CGR without a unit", with(`cycling_years = 10`, `stop_cgr = 20`), "scenario[2].stop_cgr", "has no unit"},
		{"sweep above 1", with(`sweep_efficiency = 0.7`, `sweep_efficiency = 1.7`), "scenario[2].sweep_efficiency", "out of range"},
		{"cells zero", with(`cells = 10`, `cells = 0`), "scenario[2].cells", "out of range"},
		{"compression cost per bbl", with(`"0.30 USD/Mscf"`, `"0.30 USD/bbl"`), "scenario[2].compression_cost", "unknown unit"},
		{"capex in another currency", with(`"60e6 USD"`, `"60e6 EUR"`), "scenario[2].compression_capex", "economics.currency is USD"},
		{"a cycling key on water injection", with(`voidage_replacement = 1.0`, "voidage_replacement = 1.0\ncells = 4"), "scenario[3].cells", `"gas-cycling"`},
		{"a water key on depletion", with("kind = \"depletion\"\n", "kind = \"depletion\"\nresidual_gas_saturation = 0.2\n"), "scenario[1].residual_gas_saturation", "not of a \"depletion\" one"},
		{"residual gas above the movable", with(`residual_gas_saturation = 0.25`, `residual_gas_saturation = 0.9`), "scenario[3].residual_gas_saturation", "no movable gas"},
		{"bad override", with(`plateau_rate = "40 MMscf/d"`, `plateau_rate = "40 MMscf"`), "scenario[2].production.plateau_rate", "want a gas rate"},
		{"override minimum above plateau", with(`plateau_rate = "40 MMscf/d"`, `plateau_rate = "1 MMscf/d"`), "scenario[2].production.minimum_rate", "not below"},
		{"unknown scenario key", with(`cells = 10`, "cells = 10\ncell_count = 3"), "scenario.cell_count", ""},
		{"scenario discount rate", with(`plateau_rate = "40 MMscf/d"`, "plateau_rate = \"40 MMscf/d\"\n[scenario.economics]\ndiscount_rate = 0.15"), "scenario[2].economics.discount_rate", "at the study's economics.discount_rate"},
	} {
		_, err := Parse("scenarios.toml", []byte(c.text))
		var se *Error
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		if !errors.As(err, &se) || !strings.HasPrefix(se.Key, c.key) || !strings.Contains(se.Msg, c.want) {
			t.Errorf("%s: %v; want key %s and a message containing %q", c.name, err, c.key, c.want)
		}
	}
}
