package study

import (
	"errors"
	"math"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/uncertain"
)

// withScenarios is base with the sections a [[scenario]] needs and two
// scenarios, one of them named with a space.
const withScenarios = base + `
[wells]
count = 4
start = "2027-01-01"
test_rate = "9 MMscf/d"
test_reservoir_pressure = "5100 psia"
test_flowing_pressure = "4000 psia"
deliverability_exponent = 0.85
minimum_flowing_pressure = "900 psia"

[production]
plateau_rate = "40 MMscf/d"
end = "2050-01-01"

[economics]
currency = "USD"
gas_price = "3.2 USD/MMBtu"
condensate_price = "70 USD/bbl"
discount_rate = 0.1

[[scenario]]
name = "depletion"
kind = "depletion"

[[scenario]]
name = "gas cycling"
kind = "gas-cycling"
return_fraction = 0.85
cycling_years = 8
sweep_efficiency = 0.7
cells = 6
`

const goodUncertainty = `
[uncertainty]
cases = 200
seed = 7
sampling = "monte-carlo"
[uncertainty.vary]
"reservoir.area" = { distribution = "triangular", min = "2100 acre", mode = "2400 acre", max = "2900 acre" }
"reservoir.porosity" = { distribution = "normal", mean = 0.17, sd = 0.015, min = 0.10, max = 0.24 }
"reservoir.water_saturation" = { distribution = "uniform", min = 0.18, max = 0.26 }
"fluid.plus.molar_mass" = { distribution = "uniform", min = 138.0, max = 150.0 }
"scenario.gas cycling.sweep_efficiency" = { distribution = "triangular", min = 0.5, mode = 0.7, max = 0.85 }
"scenario.gas cycling.cells" = { distribution = "discrete", values = [4, 6, 8], probabilities = [0.25, 0.5, 0.25] }
"economics.gas_price" = { distribution = "lognormal", median = "3.2 USD/MMBtu", p90_ratio = 0.7 }
[[uncertainty.correlate]]
between = ["reservoir.porosity", "reservoir.water_saturation"]
rank_correlation = -0.6
`

func TestUncertaintyReads(t *testing.T) {
	s, err := Parse("u.toml", []byte(withScenarios+goodUncertainty))
	if err != nil {
		t.Fatal(err)
	}
	u := s.Uncertainty
	if u == nil {
		t.Fatal("no Uncertainty")
	}
	if u.Cases != 200 || u.Seed != 7 || u.Sampling != MonteCarlo {
		t.Errorf("cases, seed, sampling = %d, %d, %q; want 200, 7, monte-carlo", u.Cases, u.Seed, u.Sampling)
	}
	var paths []string
	for _, in := range u.Inputs {
		paths = append(paths, in.Path)
	}
	want := "reservoir.area reservoir.porosity reservoir.water_saturation fluid.plus.molar_mass scenario.gas cycling.sweep_efficiency scenario.gas cycling.cells economics.gas_price"
	if got := strings.Join(paths, " "); got != want {
		t.Errorf("inputs in file order:\n%s\nwant\n%s", got, want)
	}
	if in := u.Inputs[0]; in.Unit != "acre" || in.Kind != DistTriangular || in.Dist != (uncertain.Triangular{Min: 2100, Mode: 2400, Max: 2900}) {
		t.Errorf("area: %+v", in)
	}
	if in := u.Inputs[6]; in.Unit != "USD/MMBtu" {
		t.Errorf("gas price unit %q, want USD/MMBtu", in.Unit)
	}
	// A lognormal of P90 ratio 0.7: sigma = -ln 0.7 / z(0.9), so that its
	// 10th percentile is 0.7 times the median (the definition of the key).
	if ln, ok := u.Inputs[6].Dist.(uncertain.Lognormal); !ok || math.Abs(ln.Quantile(0.1)-0.7*3.2) > 1e-12 {
		t.Errorf("gas price distribution %+v: P90 %v, want 2.24", u.Inputs[6].Dist, u.Inputs[6].Dist.Quantile(0.1))
	}
	if len(u.Correlations) != 1 || u.Correlations[0] != (Correlation{I: 1, J: 2, Rho: -0.6, Key: "uncertainty.correlate[1]"}) {
		t.Errorf("correlations %+v", u.Correlations)
	}
}

// TestUncertaintyCase sets values at the paths and reads them through the
// study reader: the area in acres converts to m² (1 acre = 4046.8564224 m²,
// NIST SP 811), the scenario's keys land in that scenario, whole values of
// an integer key stay integers.
func TestUncertaintyCase(t *testing.T) {
	s, err := Parse("u.toml", []byte(withScenarios+goodUncertainty))
	if err != nil {
		t.Fatal(err)
	}
	c, err := s.Case([]float64{2500, 0.2, 0.21, 140, 0.6, 8, 4.0})
	if err != nil {
		t.Fatal(err)
	}
	if got, want := c.Reservoir.Area, 2500*4046.8564224; math.Abs(got-want) > 1e-9*want {
		t.Errorf("area %v m², want %v", got, want)
	}
	if c.Reservoir.Porosity != 0.2 || c.Reservoir.WaterSaturation != 0.21 {
		t.Errorf("porosity, water saturation = %v, %v", c.Reservoir.Porosity, c.Reservoir.WaterSaturation)
	}
	cyc := c.Scenarios[1]
	if cyc.Sweep != 0.6 || cyc.Cells != 8 {
		t.Errorf("cycling sweep, cells = %v, %d; want 0.6, 8", cyc.Sweep, cyc.Cells)
	}
	perMMBtu := units.MMBtu.ToSI(1)
	if got := c.Economics.GasPrice * perMMBtu; math.Abs(got-4) > 1e-12 {
		t.Errorf("gas price %v USD/MMBtu, want 4", got)
	}
	if got := cyc.Economics.GasPrice * perMMBtu; math.Abs(got-4) > 1e-12 {
		t.Errorf("the scenario's gas price %v USD/MMBtu, want the study's 4", got)
	}
	if s.Reservoir.Porosity != 0.17 {
		t.Errorf("Case changed the study itself: porosity %v", s.Reservoir.Porosity)
	}
	// The reader checks a case's values as it checks the file's.
	_, err = s.Case([]float64{2500, 1.2, 0.21, 140, 0.6, 8, 4.0})
	var se *Error
	if !errors.As(err, &se) || se.Key != "reservoir.porosity" {
		t.Errorf("porosity 1.2: err %v, want an error at reservoir.porosity", err)
	}
	_, err = s.Case([]float64{2500, 0.2, 0.21, 140, 0.6, 6.5, 4.0})
	if !errors.As(err, &se) || se.Key != "scenario[2].cells" {
		t.Errorf("6.5 cells: err %v, want an error at scenario[2].cells", err)
	}
}

func TestUncertaintyErrors(t *testing.T) {
	vary := func(entry string) string {
		return withScenarios + "\n[uncertainty]\ncases = 50\n[uncertainty.vary]\n" + entry + "\n"
	}
	cases := []struct {
		name, study, key, msg string
	}{
		{"no cases", withScenarios + "\n[uncertainty]\n[uncertainty.vary]\n\"reservoir.porosity\" = { distribution = \"uniform\", min = 0.1, max = 0.2 }\n",
			"uncertainty.cases", "missing"},
		{"too many cases", strings.Replace(vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.1, max = 0.2 }`), "cases = 50", "cases = 100001", 1),
			"uncertainty.cases", "out of range"},
		{"negative seed", strings.Replace(vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.1, max = 0.2 }`), "cases = 50", "cases = 50\nseed = -3", 1),
			"uncertainty.seed", "out of range"},
		{"sampling", strings.Replace(vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.1, max = 0.2 }`), "cases = 50", "cases = 50\nsampling = \"sobol\"", 1),
			"uncertainty.sampling", "unknown value"},
		{"nothing varies", withScenarios + "\n[uncertainty]\ncases = 50\n", "uncertainty.vary", "missing"},
		{"unknown key", vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.1, max = 0.2, mod = 0.15 }`),
			`uncertainty.vary."reservoir.porosity".mod`, "unknown key"},
		{"not a key", vary(`"reservoir.porosty" = { distribution = "uniform", min = 0.1, max = 0.2 }`),
			`uncertainty.vary."reservoir.porosty"`, "reservoir.porosty is not a key of the study"},
		{"not a number", vary(`"fluid.equation" = { distribution = "uniform", min = 0.1, max = 0.2 }`),
			`uncertainty.vary."fluid.equation"`, "not a number or a quantity"},
		{"not given", vary(`"reservoir.rock_compressibility" = { distribution = "uniform", min = "3e-6 1/psi", max = "5e-6 1/psi" }`),
			`uncertainty.vary."reservoir.rock_compressibility"`, "does not give"},
		{"no such scenario", vary(`"scenario.cycling.sweep_efficiency" = { distribution = "uniform", min = 0.5, max = 0.8 }`),
			`uncertainty.vary."scenario.cycling.sweep_efficiency"`, `no [[scenario]] is named "cycling"`},
		{"section", vary(`"reservoir" = { distribution = "uniform", min = 0.5, max = 0.8 }`),
			`uncertainty.vary.reservoir`, "is a section, not a value"},
		{"no distribution", vary(`"reservoir.porosity" = { min = 0.1, max = 0.2 }`),
			`uncertainty.vary."reservoir.porosity".distribution`, "missing"},
		{"unknown distribution", vary(`"reservoir.porosity" = { distribution = "beta", min = 0.1, max = 0.2 }`),
			`uncertainty.vary."reservoir.porosity".distribution`, `unknown value "beta"`},
		{"wrong parameter", vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.1, max = 0.2, mode = 0.15 }`),
			`uncertainty.vary."reservoir.porosity".mode`, "not a parameter of a uniform distribution"},
		{"missing parameter", vary(`"reservoir.porosity" = { distribution = "triangular", min = 0.1, max = 0.2 }`),
			`uncertainty.vary."reservoir.porosity".mode`, "missing"},
		{"mode outside", vary(`"reservoir.porosity" = { distribution = "triangular", min = 0.1, mode = 0.25, max = 0.2 }`),
			`uncertainty.vary."reservoir.porosity".mode`, "above max"},
		{"max below min", vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.2, max = 0.1 }`),
			`uncertainty.vary."reservoir.porosity".max`, "below min"},
		{"negative sd", vary(`"reservoir.porosity" = { distribution = "normal", mean = 0.17, sd = -0.01 }`),
			`uncertainty.vary."reservoir.porosity".sd`, "negative"},
		{"p90 ratio", vary(`"reservoir.porosity" = { distribution = "lognormal", median = 0.17, p90_ratio = 1.3 }`),
			`uncertainty.vary."reservoir.porosity".p90_ratio`, "out of range"},
		{"unit missing", vary(`"reservoir.area" = { distribution = "uniform", min = 2000, max = 2600 }`),
			`uncertainty.vary."reservoir.area".min`, "has no unit"},
		{"unit not wanted", vary(`"reservoir.porosity" = { distribution = "uniform", min = "0.1 ft", max = "0.2 ft" }`),
			`uncertainty.vary."reservoir.porosity".min`, "has a unit"},
		{"two units", vary(`"reservoir.area" = { distribution = "uniform", min = "2000 acre", max = "1100 ha" }`),
			`uncertainty.vary."reservoir.area".max`, "same unit"},
		{"discrete lengths", vary(`"scenario.gas cycling.cells" = { distribution = "discrete", values = [4, 6], probabilities = [1.0] }`),
			`uncertainty.vary."scenario.gas cycling.cells".probabilities`, "one probability per value"},
		{"discrete sum", vary(`"scenario.gas cycling.cells" = { distribution = "discrete", values = [4, 6], probabilities = [0.5, 0.4] }`),
			`uncertainty.vary."scenario.gas cycling.cells"`, "sum to"},
		{"truncation too far", vary(`"reservoir.porosity" = { distribution = "normal", mean = 0.17, sd = 0.0001, min = 0.2, max = 0.3 }`),
			`uncertainty.vary."reservoir.porosity"`, "too far in a tail"},
		{"correlate unknown", vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.1, max = 0.2 }`) +
			"[[uncertainty.correlate]]\nbetween = [\"reservoir.porosity\", \"reservoir.area\"]\nrank_correlation = 0.5\n",
			"uncertainty.correlate[1].between", `"reservoir.area" is not an input`},
		{"correlate range", vary("\"reservoir.porosity\" = { distribution = \"uniform\", min = 0.1, max = 0.2 }\n\"reservoir.water_saturation\" = { distribution = \"uniform\", min = 0.2, max = 0.3 }") +
			"[[uncertainty.correlate]]\nbetween = [\"reservoir.porosity\", \"reservoir.water_saturation\"]\nrank_correlation = 1.0\n",
			"uncertainty.correlate[1].rank_correlation", "out of range"},
		{"correlate twice", vary("\"reservoir.porosity\" = { distribution = \"uniform\", min = 0.1, max = 0.2 }\n\"reservoir.water_saturation\" = { distribution = \"uniform\", min = 0.2, max = 0.3 }") +
			"[[uncertainty.correlate]]\nbetween = [\"reservoir.porosity\", \"reservoir.water_saturation\"]\nrank_correlation = 0.3\n" +
			"[[uncertainty.correlate]]\nbetween = [\"reservoir.water_saturation\", \"reservoir.porosity\"]\nrank_correlation = 0.3\n",
			"uncertainty.correlate[2].between", "again"},
		{"correlate self", vary(`"reservoir.porosity" = { distribution = "uniform", min = 0.1, max = 0.2 }`) +
			"[[uncertainty.correlate]]\nbetween = [\"reservoir.porosity\", \"reservoir.porosity\"]\nrank_correlation = 0.3\n",
			"uncertainty.correlate[1].between", "twice"},
		{"vary itself", vary(`"uncertainty.cases" = { distribution = "uniform", min = 10, max = 20 }`),
			`uncertainty.vary."uncertainty.cases"`, "cannot vary"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse("u.toml", []byte(c.study))
			var se *Error
			if !errors.As(err, &se) {
				t.Fatalf("err = %v, want a *study.Error", err)
			}
			if se.Key != c.key || !strings.Contains(se.Msg, c.msg) {
				t.Errorf("error %q (key %q); want key %q and a message with %q", err, se.Key, c.key, c.msg)
			}
		})
	}
}

func TestSplitPath(t *testing.T) {
	for _, c := range []struct {
		in   string
		want []string
		ok   bool
	}{
		{"reservoir.area", []string{"reservoir", "area"}, true},
		{`scenario."a.b".sweep_efficiency`, []string{"scenario", "a.b", "sweep_efficiency"}, true},
		{"scenario.water injection.sweep_efficiency", []string{"scenario", "water injection", "sweep_efficiency"}, true},
		{"reservoir..area", nil, false},
		{".area", nil, false},
		{"area.", nil, false},
		{`a."b`, nil, false},
	} {
		got, ok := splitPath(c.in)
		if ok != c.ok || strings.Join(got, "|") != strings.Join(c.want, "|") {
			t.Errorf("splitPath(%q) = %q, %v; want %q, %v", c.in, got, ok, c.want, c.ok)
		}
	}
}
