package study

import (
	"errors"
	"math"
	"os"
	"strings"
	"testing"
	"time"
)

// surfaceAndHistory is a valid [surface] section and [[history]] table, added
// to base (initial pressure 5200 psia) by the tests below.
const surfaceAndHistory = `
[surface]
oil_api = 52.0
oil_molar_mass = 118.0
correlation = "standing-condensate"

[surface.impurities]
N2 = 0.5
CO2 = 2.5

[[surface.stage]]
gor = "6000 scf/STB"
gas_gravity = 0.68

[[surface.stage]]
gor = "180 sm3/sm3"
gas_gravity = 1.2

[[history]]
date = 2020-01-01
pressure = "5200 psia"
sales_gas = "0 Bscf"
condensate = "0 STB"

[[history]]
date = 2020-07-01
pressure = "4800 psia"
sales_gas = "12.5 Bscf"
condensate = "1.25 MMSTB"
water = "2 MSTB"

[[history]]
date = "2021-01-01"
pressure = "300 bara"
sales_gas = "700 1e6 sm3"
condensate = "4.5e5 sm3"
water = "2.5 MSTB"
`

func TestSurfaceAndHistory(t *testing.T) {
	st, err := Parse("case.toml", []byte(base+surfaceAndHistory))
	if err != nil {
		t.Fatal(err)
	}
	const (
		ft3 = 0.028316846592 // m3, NIST SP 811 B.9 (exact)
		bbl = 0.158987294928 // m3, 42 US gal of 231 in3 (NIST SP 811 B.9, exact)
		psi = 6894.757293168361
	)
	sf := st.Surface
	if sf == nil || len(sf.Stages) != 2 {
		t.Fatalf("surface %+v, want two stages", sf)
	}
	checks := []struct {
		what      string
		got, want float64
	}{
		{"stage 1 GOR", sf.Stages[0].GOR, 6000 * ft3 / bbl},
		{"stage 1 gravity", sf.Stages[0].Gravity, 0.68},
		{"stage 2 GOR", sf.Stages[1].GOR, 180},
		{"oil API", sf.OilAPI, 52},
		{"oil molar mass (kg/mol)", sf.OilM, 0.118},
		{"N2 fraction", sf.N2, 0.005},
		{"CO2 fraction", sf.CO2, 0.025},
		{"history[2] pressure", st.History[1].Pressure, 4800 * psi},
		{"history[2] sales gas", st.History[1].SalesGas, 12.5e9 * ft3},
		{"history[2] condensate", st.History[1].Condensate, 1.25e6 * bbl},
		{"history[2] water", st.History[1].Water, 2e3 * bbl},
		{"history[3] pressure", st.History[2].Pressure, 300e5},
		{"history[3] sales gas", st.History[2].SalesGas, 700e6},
		{"history[3] condensate", st.History[2].Condensate, 4.5e5},
		{"history[3] water", st.History[2].Water, 2.5e3 * bbl},
	}
	for _, c := range checks {
		if rel(c.got, c.want) > 1e-14 {
			t.Errorf("%s = %.15g, want %.15g (unit definitions, NIST SP 811)", c.what, c.got, c.want)
		}
	}
	if sf.Correlation != "standing-condensate" || sf.OilSG != 0 || sf.H2S != 0 {
		t.Errorf("surface %+v: want the Standing condensate correlation, no specific gravity, no H2S", sf)
	}
	if len(st.History) != 3 {
		t.Fatalf("%d history rows, want 3", len(st.History))
	}
	want := []string{"2020-01-01", "2020-07-01", "2021-01-01"}
	for i, h := range st.History {
		if h.Label != want[i] || h.Date.Format(time.DateOnly) != want[i] {
			t.Errorf("history[%d] label %q date %v, want %s", i+1, h.Label, h.Date, want[i])
		}
	}
	if st.History[0].Production() || !st.History[1].Production() {
		t.Error("history[1] is the initial state, history[2] has production")
	}
}

func TestHistorySteps(t *testing.T) {
	rows := `
[[history]]
step = 1
pressure = "4800 psia"
sales_gas = "12.5 Bscf"
condensate = "1.25 MMSTB"

[[history]]
step = 4
pressure = "4500 psia"
sales_gas = "20 Bscf"
condensate = "1.9 MMSTB"
`
	st, err := Parse("case.toml", []byte(base+rows))
	if err != nil {
		t.Fatal(err)
	}
	if st.History[1].Step != 4 || st.History[1].Label != "4" || !st.History[1].Date.IsZero() {
		t.Errorf("history[2] = %+v, want step 4", st.History[1])
	}
}

// badSurfaceHistory each change one thing in surfaceAndHistory.
var badSurfaceHistory = []struct {
	name, old, new, key, msg string
}{
	{"no stage", "[[surface.stage]]\ngor = \"6000 scf/STB\"\ngas_gravity = 0.68\n\n[[surface.stage]]\ngor = \"180 sm3/sm3\"\ngas_gravity = 1.2\n", "", "surface.stage", "missing"},
	{"GOR without unit", `gor = "6000 scf/STB"`, `gor = 6000`, "surface.stage[1].gor", "no unit"},
	{"GOR in a volume unit", `gor = "6000 scf/STB"`, `gor = "6000 scf"`, "surface.stage[1].gor", "gas-oil ratio"},
	{"gravity as a string", `gas_gravity = 0.68`, `gas_gravity = "0.68"`, "surface.stage[1].gas_gravity", "bare number"},
	{"gravity zero", `gas_gravity = 0.68`, `gas_gravity = 0`, "surface.stage[1].gas_gravity", "out of range"},
	{"no gas", "gor = \"6000 scf/STB\"\ngas_gravity = 0.68\n\n[[surface.stage]]\ngor = \"180 sm3/sm3\"", "gor = \"0 scf/STB\"\ngas_gravity = 0.68\n\n[[surface.stage]]\ngor = \"0 sm3/sm3\"", "surface.stage", "no surface gas"},
	{"both oil gravities", `oil_api = 52.0`, "oil_api = 52.0\noil_specific_gravity = 0.77", "surface.oil_specific_gravity", "not both"},
	{"no oil gravity", `oil_api = 52.0`, ``, "surface.oil_api", "missing"},
	{"unknown correlation", `correlation = "standing-condensate"`, `correlation = "sutton85"`, "surface.correlation", "unknown value"},
	{"lower-case impurity", `N2 = 0.5`, `n2 = 0.5`, "surface.impurities.n2", "unknown key"},
	{"impurities fill the gas", `CO2 = 2.5`, `CO2 = 99.6`, "surface.impurities", "no hydrocarbons"},
	{"unknown surface key", `oil_api = 52.0`, "oil_api = 52.0\nseparator_gor = 1", "surface.separator_gor", "unknown key"},
	{"dates out of order", `date = "2021-01-01"`, `date = "2020-03-01"`, "history[3].date", "time order"},
	{"date not a date", `date = "2021-01-01"`, `date = "Jan 2021"`, "history[3].date", "YYYY-MM-DD"},
	{"date and step", `date = "2021-01-01"`, "date = \"2021-01-01\"\nstep = 3", "history[3].step", "not both"},
	{"step among dates", `date = "2021-01-01"`, `step = 3`, "history[3].step", "the same"},
	{"date missing", `date = "2021-01-01"`, ``, "history[3].date", "missing"},
	{"sales gas falls", `sales_gas = "700 1e6 sm3"`, `sales_gas = "300 1e6 sm3"`, "history[3].sales_gas", "never falls"},
	{"condensate falls", `condensate = "4.5e5 sm3"`, `condensate = "1 sm3"`, "history[3].condensate", "never falls"},
	{"water falls", `water = "2.5 MSTB"`, `water = "1 MSTB"`, "history[3].water", "never falls"},
	{"water left out", `water = "2.5 MSTB"`, ``, "history[3].water", "every row"},
	{"pressure without unit", `pressure = "4800 psia"`, `pressure = 4800`, "history[2].pressure", "no unit"},
	{"pressure above initial", `pressure = "4800 psia"`, `pressure = "5300 psia"`, "history[2].pressure", "initial_pressure"},
	{"sales gas without unit", `sales_gas = "12.5 Bscf"`, `sales_gas = 12.5`, "history[2].sales_gas", "no unit"},
	{"sales gas in a liquid unit", `sales_gas = "12.5 Bscf"`, `sales_gas = "12.5 MMSTB"`, "history[2].sales_gas", "stock-tank liquid volume"},
	{"condensate missing", `condensate = "1.25 MMSTB"`, ``, "history[2].condensate", "missing"},
	{"no production later", `sales_gas = "12.5 Bscf"` + "\ncondensate = \"1.25 MMSTB\"", `sales_gas = "0 Bscf"` + "\ncondensate = \"0 MMSTB\"", "history[2].sales_gas", "initial state"},
	{"unknown history key", `water = "2 MSTB"`, `water_cut = 0.1`, "history.water_cut", "unknown key"},
}

func TestBadSurfaceAndHistory(t *testing.T) {
	for _, tt := range badSurfaceHistory {
		t.Run(tt.name, func(t *testing.T) {
			if strings.Count(surfaceAndHistory, tt.old) != 1 {
				t.Fatalf("test setup: %q occurs %d times", tt.old, strings.Count(surfaceAndHistory, tt.old))
			}
			data := base + strings.Replace(surfaceAndHistory, tt.old, tt.new, 1)
			_, err := Parse("case.toml", []byte(data))
			var se *Error
			if !errors.As(err, &se) {
				t.Fatalf("error %v (%T), want a *study.Error", err, err)
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, "case.toml: ") || se.Key != tt.key || !strings.Contains(msg, tt.msg) {
				t.Errorf("error %q (key %q), want file case.toml, key %q and %q", msg, se.Key, tt.key, tt.msg)
			}
		})
	}
}

func TestHistoryNeedsInitialPressure(t *testing.T) {
	data := strings.Replace(base, "initial_pressure = \"5200 psia\"\n", "", 1) + surfaceAndHistory
	_, err := Parse("case.toml", []byte(data))
	var se *Error
	if !errors.As(err, &se) || se.Key != "reservoir.initial_pressure" {
		t.Errorf("error %v, want one naming reservoir.initial_pressure", err)
	}
}

func TestExampleSurfaceAndHistory(t *testing.T) {
	data, err := os.ReadFile("../../../../examples/sablewick.toml")
	if err != nil {
		t.Fatal(err)
	}
	st, err := Parse("../../../../examples/sablewick.toml", data)
	if err != nil {
		t.Fatal(err)
	}
	if st.Surface == nil || len(st.Surface.Stages) != 3 {
		t.Errorf("the example's [surface] = %+v, want the two separators and the stock tank", st.Surface)
	}
	if n := len(st.History); n < 7 || n > 10 {
		t.Errorf("the example has %d history rows, want about 8", n)
	}
}

// rel is the relative difference of got from want.
func rel(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}
