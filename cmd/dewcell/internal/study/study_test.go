package study

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
)

// base is a valid study; the bad-input tests each change one thing in it.
const base = `title = "test case"

[reservoir]
temperature = "245 degF"
initial_pressure = "5200 psia"
area = "2400 acre"
net_thickness = "85 ft"
porosity = 0.17
water_saturation = 0.22
abandonment_pressure = "700 psia"

[fluid]
equation = "PR78"

[fluid.composition]
N2 = 0.5
CO2 = 2.5
C1 = 74.0
C2 = 8.0
C3 = 4.0
nC4 = 3.0
"C7+" = 8.0

[fluid.plus]
name = "C7+"
molar_mass = 143.0
specific_gravity = 0.795

[[separator.stage]]
pressure = "815 psia"
temperature = "75 degF"

[[separator.stage]]
pressure = "65 psia"
temperature = "70 degF"

[depletion]
pressures = ["4000 psia", "3000 psia", "2000 psia"]
`

// edit replaces old by new in base, failing the test if old is absent.
func edit(t *testing.T, old, new string) string {
	t.Helper()
	if !strings.Contains(base, old) {
		t.Fatalf("test setup: %q is not in the base study", old)
	}
	return strings.Replace(base, old, new, 1)
}

// TestReservoirExtras: the optional water formation volume factor and the
// [relative_permeability] section are read as given; absent, they are 0
// (the documented defaults apply later).
func TestReservoirExtras(t *testing.T) {
	st, err := Parse("base.toml", []byte(edit(t, "porosity = 0.17", "porosity = 0.17\nwater_formation_volume_factor = 1.03")+
		"\n[relative_permeability]\ngas_exponent = 2.5\ncondensate_exponent = 3\ngas_endpoint = 0.8\ncondensate_endpoint = 0.4\n"))
	if err != nil {
		t.Fatal(err)
	}
	if st.Reservoir.WaterFVF != 1.03 || st.RelPerm != (RelPerm{GasExponent: 2.5, CondensateExponent: 3, GasEndpoint: 0.8, CondensateEndpoint: 0.4}) {
		t.Errorf("water FVF %g, relative permeability %+v", st.Reservoir.WaterFVF, st.RelPerm)
	}
	st, err = Parse("base.toml", []byte(base))
	if err != nil {
		t.Fatal(err)
	}
	if st.Reservoir.WaterFVF != 0 || st.RelPerm != (RelPerm{}) {
		t.Errorf("absent: water FVF %g, relative permeability %+v", st.Reservoir.WaterFVF, st.RelPerm)
	}
}

func TestBaseIsValid(t *testing.T) {
	st, err := Parse("base.toml", []byte(base))
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Warnings) != 0 {
		t.Errorf("warnings for a composition summing to 100: %q", st.Warnings)
	}
}

var badStudies = []struct {
	name     string
	old, new string // edit of base
	key      string // the key the error must name
	msg      string // a piece of the message
}{
	{"composition sum", "C1 = 74.0", "C1 = 73.9", "fluid.composition", "sums to 99.9"},
	{"composition sum just outside", "C1 = 74.0", "C1 = 74.06", "fluid.composition", "within 0.05"},
	{"negative fraction", "C2 = 8.0", "C2 = -8.0", "fluid.composition.C2", "out of range"},
	{"NaN fraction", "C2 = 8.0", "C2 = nan", "fluid.composition.C2", "not a finite number"},
	{"fraction as string", "C2 = 8.0", `C2 = "8.0"`, "fluid.composition.C2", "bare number"},
	{"unknown component", "C3 = 4.0", "Xy3 = 4.0", "fluid.composition.Xy3", "unknown component"},
	{"component name case", "C3 = 4.0", "c3 = 4.0", "fluid.composition.c3", "unknown component"},
	{"same library component twice", "C3 = 4.0", "C6 = 2.0\nnC6 = 2.0", "fluid.composition.nC6", "same library component"},
	{"plus without molar mass", "molar_mass = 143.0\n", "", "fluid.plus.molar_mass", "missing"},
	{"plus without specific gravity", "specific_gravity = 0.795\n", "", "fluid.plus.specific_gravity", "missing"},
	{"specific gravity too high", "specific_gravity = 0.795", "specific_gravity = 1.25", "fluid.plus.specific_gravity", "out of range"},
	{"specific gravity too low", "specific_gravity = 0.795", "specific_gravity = 0.55", "fluid.plus.specific_gravity", "out of range"},
	{"plus molar mass below C7", "molar_mass = 143.0", "molar_mass = 80.0", "fluid.plus.molar_mass", "out of range"},
	{"plus molar mass in kg/mol", "molar_mass = 143.0", "molar_mass = 0.143", "fluid.plus.molar_mass", "out of range"},
	{"plus molar mass absurd", "molar_mass = 143.0", "molar_mass = 5000.0", "fluid.plus.molar_mass", "out of range"},
	{"plus name not in composition", `name = "C7+"`, `name = "C10+"`, "fluid.plus.name", "not in fluid.composition"},
	{"plus fraction without section", "[fluid.plus]\nname = \"C7+\"\nmolar_mass = 143.0\nspecific_gravity = 0.795\n", "", "fluid.plus", "missing"},
	{"plus fraction of zero", `"C7+" = 8.0`, `"C7+" = 0.0` + "\nC5 = 8.0", "fluid.composition.\"C7+\"", "0 mol%"},
	{"unknown split", "specific_gravity = 0.795", "specific_gravity = 0.795\nsplit = \"weibull\"", "fluid.plus.split", "unknown value"},
	{"gamma shape with exponential", "specific_gravity = 0.795", "specific_gravity = 0.795\nsplit = \"exponential\"\ngamma_shape = 1.2", "fluid.plus.gamma_shape", "only with split"},
	{"pseudo components zero", "specific_gravity = 0.795", "specific_gravity = 0.795\npseudo_components = 0", "fluid.plus.pseudo_components", "out of range"},
	{"pseudo components not whole", "specific_gravity = 0.795", "specific_gravity = 0.795\npseudo_components = 4.0", "fluid.plus.pseudo_components", "whole number"},
	{"split none with pseudo components", "specific_gravity = 0.795", "specific_gravity = 0.795\nsplit = \"none\"\npseudo_components = 3", "fluid.plus.pseudo_components", "one pseudo-component"},
	{"first carbon disagrees", "specific_gravity = 0.795", "specific_gravity = 0.795\nfirst_carbon = 8", "fluid.plus.first_carbon", "says 7"},
	{"unknown correlation", "specific_gravity = 0.795", "specific_gravity = 0.795\ncorrelation = \"lee-kesler-2\"", "fluid.plus.correlation", "unknown value"},
	{"unknown acentric method", "specific_gravity = 0.795", "specific_gravity = 0.795\nacentric = \"pitzer\"", "fluid.plus.acentric", "unknown value"},
	{"missing unit", `temperature = "245 degF"`, "temperature = 245", "reservoir.temperature", "no unit"},
	{"missing unit in string", `temperature = "245 degF"`, `temperature = "245"`, "reservoir.temperature", "missing unit"},
	{"unknown unit", `temperature = "245 degF"`, `temperature = "245 degX"`, "reservoir.temperature", "unknown unit"},
	{"wrong kind of unit", `initial_pressure = "5200 psia"`, `initial_pressure = "85 ft"`, "reservoir.initial_pressure", "length"},
	{"ambiguous pressure", `initial_pressure = "5200 psia"`, `initial_pressure = "5200 psi"`, "reservoir.initial_pressure", "psig"},
	{"below absolute zero", `temperature = "245 degF"`, `temperature = "-500 degF"`, "reservoir.temperature", "absolute zero"},
	{"not finite", `initial_pressure = "5200 psia"`, `initial_pressure = "Inf psia"`, "reservoir.initial_pressure", "finite"},
	// The range of a state: 1 kPa to 400 MPa (0.145038 to 58015.1 psia), 100 K to 1500 K
	// (-279.67 to 2240.33 degF), given in the unit of the input (units.ParseState).
	{"absurd pressure", `initial_pressure = "5200 psia"`, `initial_pressure = "1e30 psia"`, "reservoir.initial_pressure", "out of range; want a pressure from 0.145038 psia to 58015.1 psia"},
	{"tiny pressure", `abandonment_pressure = "700 psia"`, `abandonment_pressure = "1e-30 psia"`, "reservoir.abandonment_pressure", "from 0.145038 psia"},
	{"absurd temperature", `temperature = "245 degF"`, `temperature = "1e9 degF"`, "reservoir.temperature", "out of range; want a temperature from -279.67 degF to 2240.33 degF"},
	{"absurd separator pressure", `pressure = "815 psia"`, `pressure = "5000 bara"`, "separator.stage[1].pressure", "from 0.01 bara to 4000 bara"},
	{"absurd separator temperature", `temperature = "75 degF"`, `temperature = "50 K"`, "separator.stage[1].temperature", "from 100 K to 1500 K"},
	{"absurd depletion pressure", `pressures = ["4000 psia"`, `pressures = ["1e30 psia"`, "depletion.pressures[1]", "out of range"},
	{"absurd standard temperature", "[[separator.stage]]", "[standard_conditions]\ntemperature = \"2000 degC\"\n\n[[separator.stage]]", "standard_conditions.temperature", "from -173.15 degC to 1226.85 degC"},
	{"missing temperature", "temperature = \"245 degF\"\ninitial", "initial", "reservoir.temperature", "missing"},
	{"missing reservoir", "[reservoir]\ntemperature = \"245 degF\"\ninitial_pressure = \"5200 psia\"\narea = \"2400 acre\"\nnet_thickness = \"85 ft\"\nporosity = 0.17\nwater_saturation = 0.22\nabandonment_pressure = \"700 psia\"\n", "", "reservoir", "missing section"},
	{"porosity as string", "porosity = 0.17", `porosity = "0.17"`, "reservoir.porosity", "bare number"},
	{"porosity above 1", "porosity = 0.17", "porosity = 17", "reservoir.porosity", "out of range"},
	{"area without thickness", "net_thickness = \"85 ft\"\n", "", "reservoir.net_thickness", "missing"},
	{"pore volume and area", "porosity = 0.17", "porosity = 0.17\npore_volume = \"1e9 bbl\"", "reservoir.pore_volume", "not both"},
	{"abandonment above initial", `abandonment_pressure = "700 psia"`, `abandonment_pressure = "5300 psia"`, "reservoir.abandonment_pressure", "below reservoir.initial_pressure"},
	{"saturations add to one", "water_saturation = 0.22", "water_saturation = 0.22\ncritical_condensate_saturation = 0.8", "reservoir.critical_condensate_saturation", "no room"},
	{"negative compressibility", "porosity = 0.17", "porosity = 0.17\nrock_compressibility = \"-4e-6 1/psi\"", "reservoir.rock_compressibility", "negative"},
	{"unknown key", "porosity = 0.17", "porosity = 0.17\nporosoty = 0.17", "reservoir.porosoty", "unknown key"},
	{"key in the wrong case", "porosity = 0.17", "Porosity = 0.17", "reservoir.Porosity", "unknown key"},
	{"unknown section", "[fluid]\n", "[fluids]\nx = 1\n[fluid]\n", "fluids", "unknown key"},
	{"unknown equation", `equation = "PR78"`, `equation = "RK"`, "fluid.equation", "unknown value"},
	{"volume shift not a boolean", `equation = "PR78"`, "equation = \"PR78\"\nvolume_shift = \"yes\"", "fluid.volume_shift", "true or false"},
	{"Chueh-Prausnitz A out of range", `equation = "PR78"`, "equation = \"PR78\"\nhydrocarbon_kij_a = 1.5", "fluid.hydrocarbon_kij_a", "out of range"},
	{"user component undefined", "C3 = 4.0", "F1 = 4.0", "fluid.composition.F1", "unknown component"},
	{"properties of a stranger", "[[separator.stage]]", "[fluid.properties.F9]\nmolar_mass = 110.0\n[[separator.stage]]", "fluid.properties.F9", "not in fluid.composition"},
	{"properties of the plus fraction", "[[separator.stage]]", "[fluid.properties.\"C7+\"]\nmolar_mass = 110.0\n[[separator.stage]]", "fluid.properties.\"C7+\"", "describe it in [fluid.plus]"},
	{"override out of range", "[[separator.stage]]", "[fluid.properties.C1]\nacentric_factor = 5.0\n[[separator.stage]]", "fluid.properties.C1.acentric_factor", "out of range"},
	{"override with a wrong unit", "[[separator.stage]]", "[fluid.properties.C1]\ncritical_pressure = \"45 ft\"\n[[separator.stage]]", "fluid.properties.C1.critical_pressure", "length"},
	{"unknown property", "[[separator.stage]]", "[fluid.properties.C1]\ncritical_density = 0.1\n[[separator.stage]]", "fluid.properties.C1.critical_density", "unknown key"},
	{"interaction unknown component", "[[separator.stage]]", "[fluid.interaction]\n\"C1/Zz\" = 0.05\n[[separator.stage]]", `fluid.interaction."C1/Zz"`, "not a component"},
	{"interaction out of range", "[[separator.stage]]", "[fluid.interaction]\n\"C1/C3\" = 1.5\n[[separator.stage]]", `fluid.interaction."C1/C3"`, "out of range"},
	{"interaction not a pair", "[[separator.stage]]", "[fluid.interaction]\nC1-C3 = 0.05\n[[separator.stage]]", "fluid.interaction.C1-C3", "pair of component names"},
	{"interaction with itself", "[[separator.stage]]", "[fluid.interaction]\n\"C1/C1\" = 0.05\n[[separator.stage]]", `fluid.interaction."C1/C1"`, "itself"},
	{"interaction given twice", "[[separator.stage]]", "[fluid.interaction]\n\"C1/C3\" = 0.05\n\"C3/C1\" = 0.04\n[[separator.stage]]", `fluid.interaction."C3/C1"`, "already set"},
	{"separator stage without pressure", "pressure = \"65 psia\"\n", "", "separator.stage[2].pressure", "missing"},
	{"separator pressure rising", `pressure = "65 psia"`, `pressure = "900 psia"`, "separator.stage[2].pressure", "must be below"},
	{"depletion not falling", `"3000 psia", "2000 psia"`, `"3000 psia", "3500 psia"`, "depletion.pressures[3]", "fall"},
	{"depletion not a list", `pressures = ["4000 psia", "3000 psia", "2000 psia"]`, `pressures = "4000 psia"`, "depletion.pressures", "list of pressures"},
	{"depletion without unit", `pressures = ["4000 psia", "3000 psia", "2000 psia"]`, `pressures = [4000, 3000]`, "depletion.pressures[1]", "no unit"},
	{"lab file missing", "[[separator.stage]]", "[lab]\ncce = \"no-such-file.csv\"\n[[separator.stage]]", "lab.cce", "no-such-file.csv"},
	{"gauge atmospheric pressure", "[[separator.stage]]", "[standard_conditions]\natmospheric_pressure = \"0 psig\"\n[[separator.stage]]", "standard_conditions.atmospheric_pressure", "gauge"},
	{"water FVF with a unit", "porosity = 0.17", "porosity = 0.17\nwater_formation_volume_factor = \"1.02 rb/STB\"", "reservoir.water_formation_volume_factor", "bare number"},
	{"water FVF out of range", "porosity = 0.17", "porosity = 0.17\nwater_formation_volume_factor = 5.6", "reservoir.water_formation_volume_factor", "out of range"},
	{"relative permeability exponent below 1", "[[separator.stage]]", "[relative_permeability]\ngas_exponent = 0.5\n[[separator.stage]]", "relative_permeability.gas_exponent", "out of range"},
	{"relative permeability end point above 1", "[[separator.stage]]", "[relative_permeability]\ncondensate_endpoint = 1.3\n[[separator.stage]]", "relative_permeability.condensate_endpoint", "out of range"},
	{"relative permeability end point zero", "[[separator.stage]]", "[relative_permeability]\ngas_endpoint = 0\n[[separator.stage]]", "relative_permeability.gas_endpoint", "out of range"},
	{"relative permeability unknown key", "[[separator.stage]]", "[relative_permeability]\ngas_exponant = 2\n[[separator.stage]]", "relative_permeability.gas_exponant", "condensate_endpoint, condensate_exponent, gas_endpoint, gas_exponent"},
	{"TOML syntax", "porosity = 0.17", "porosity = = 0.17", "reservoir.porosity", "line 8"},
	{"table where a value goes", "porosity = 0.17", "porosity = 0.17\n[reservoir.temperature]\nvalue = 1", "", "reservoir.temperature"},
}

func TestBadStudies(t *testing.T) {
	for _, tt := range badStudies {
		t.Run(tt.name, func(t *testing.T) {
			data := edit(t, tt.old, tt.new)
			st, err := Parse("case.toml", []byte(data))
			if err == nil {
				t.Fatalf("no error; fluid has %d components", st.Fluid.N())
			}
			var se *Error
			if !errors.As(err, &se) {
				t.Fatalf("error %v (%T) is not a *study.Error", err, err)
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, "case.toml: ") {
				t.Errorf("error %q does not start with the file name", msg)
			}
			if tt.key != "" && se.Key != tt.key {
				t.Errorf("error %q names key %q, want %q", msg, se.Key, tt.key)
			}
			if !strings.Contains(msg, tt.msg) {
				t.Errorf("error %q does not say %q", msg, tt.msg)
			}
		})
	}
}

func TestPlusNameWithoutCarbonNumber(t *testing.T) {
	data := strings.Replace(edit(t, `"C7+" = 8.0`, `HEAVY = 8.0`), `name = "C7+"`, `name = "HEAVY"`, 1)
	_, err := Parse("case.toml", []byte(data))
	var se *Error
	if !errors.As(err, &se) || se.Key != "fluid.plus.first_carbon" || !strings.Contains(err.Error(), "does not say it") {
		t.Errorf("plus fraction HEAVY without first_carbon: %v, want a missing fluid.plus.first_carbon", err)
	}
	data = strings.Replace(data, `name = "HEAVY"`, "name = \"HEAVY\"\nfirst_carbon = 7", 1)
	st, err := Parse("case.toml", []byte(data))
	if err != nil {
		t.Fatalf("plus fraction HEAVY with first_carbon = 7: %v", err)
	}
	if n := st.Fluid.N(); n != 6+4 {
		t.Errorf("%d components, want 6 defined and 4 pseudo-components (the eos default)", n)
	}
}

func TestUserComponentIncomplete(t *testing.T) {
	data := edit(t, "C3 = 4.0", "F1 = 4.0")
	data = strings.Replace(data, "[[separator.stage]]", `[fluid.properties.F1]
molar_mass = 110.0
critical_temperature = "560 degF"
critical_pressure = "380 psia"

[[separator.stage]]`, 1)
	_, err := Parse("case.toml", []byte(data))
	var se *Error
	if !errors.As(err, &se) || se.Key != "fluid.properties.F1.acentric_factor" || !strings.Contains(err.Error(), "missing") {
		t.Errorf("user component without acentric factor: %v, want a missing fluid.properties.F1.acentric_factor", err)
	}
}

// TestUserComponentEstimates: what a user component does not give is said,
// not filled in silently. Without critical_volume the viscosity uses
// Zc R Tc/Pc with Zc = 0.2918 − 0.0928 ω (Reid, Prausnitz and Sherwood
// 1977, as eos.Fluid.CriticalVolume documents); without volume_shift, while
// volume shifts are applied, the shift is 0. Both appear in Estimates and as
// a warning naming the component and the method; the plus fraction's
// pseudo-components name their split and correlations.
func TestUserComponentEstimates(t *testing.T) {
	props := `[fluid.properties.F1]
molar_mass = 110.0
critical_temperature = "560 degF"
critical_pressure = "380 psia"
acentric_factor = 0.3
%s
[[separator.stage]]`
	data := edit(t, "C3 = 4.0", "F1 = 4.0")
	data = strings.Replace(data, "equation = \"PR78\"", "equation = \"PR78\"\nvolume_shift = true", 1)
	bare := strings.Replace(data, "[[separator.stage]]", fmt.Sprintf(props, ""), 1)
	st, err := Parse("case.toml", []byte(bare))
	if err != nil {
		t.Fatal(err)
	}
	i := index(t, st, "F1")
	est := st.Estimates[i]
	for _, want := range []string{"critical volume", "0.2918 − 0.0928 ω", "Reid, Prausnitz and Sherwood 1977", "volume shift not given: 0"} {
		if !strings.Contains(est, want) {
			t.Errorf("estimate of F1 %q lacks %q", est, want)
		}
	}
	warned := strings.Join(st.Warnings, "\n")
	for _, want := range []string{"case.toml: fluid.properties.F1 gives no critical_volume", "0.2918 − 0.0928 ω", "fluid.properties.F1 gives no volume_shift"} {
		if !strings.Contains(warned, want) {
			t.Errorf("warnings %q lack %q", st.Warnings, want)
		}
	}
	if vc, estimated := st.Fluid.CriticalVolume(i); !estimated || !(vc > 0) {
		t.Errorf("F1 critical volume %g (estimated %v), want an estimate", vc, estimated)
	}
	for j, c := range st.Fluid.Components() {
		_, isLib := eos.LibraryComponent(c.Name)
		switch {
		case j != i && !isLib: // a pseudo-component
			if !strings.Contains(st.Estimates[j], "C7+ split") || !strings.Contains(st.Estimates[j], "kesler-lee") {
				t.Errorf("pseudo-component %s: estimate %q, want the split and its correlation", c.Name, st.Estimates[j])
			}
		case j != i && st.Estimates[j] != "":
			t.Errorf("library component %s: estimate %q, want none", c.Name, st.Estimates[j])
		}
	}

	// Given, nothing is estimated or warned of.
	full := strings.Replace(data, "[[separator.stage]]", fmt.Sprintf(props, "critical_volume = \"0.45 m3/kmol\"\nvolume_shift = 0.02\n"), 1)
	if st, err = Parse("case.toml", []byte(full)); err != nil {
		t.Fatal(err)
	}
	i = index(t, st, "F1")
	if vc, estimated := st.Fluid.CriticalVolume(i); st.Estimates[i] != "" || len(st.Warnings) != 0 || estimated || vc != 0.45e-3 {
		t.Errorf("F1 with its critical volume: estimate %q, warnings %q, Vc %g (estimated %v); want none, 0.45 m3/kmol", st.Estimates[i], st.Warnings, vc, estimated)
	}
}

// index is the position of the component name in the study's fluid.
// TestSRKStudy: equation = "SRK" gives a Soave–Redlich–Kwong fluid whose
// volume shifts, where the file gives none, are those of Peneloux, Rauzy and
// Fréze (1982) for SRK (the library's and the plus-fraction correlation's
// shifts are Peng–Robinson's); a volume_shift the file gives is kept.
func TestSRKStudy(t *testing.T) {
	data := strings.Replace(base, "equation = \"PR78\"", "equation = \"SRK\"\nvolume_shift = true", 1)
	if data == base {
		t.Fatal("test setup: no equation in the base study")
	}
	data = strings.Replace(data, "[[separator.stage]]", "[fluid.properties.C2]\nvolume_shift = 0.035\n\n[[separator.stage]]", 1)
	st, err := Parse("case.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	if got := st.Fluid.Options(); got.Equation != eos.SRK || !got.VolumeShift {
		t.Fatalf("options %+v, want SRK with volume shift", got)
	}
	pseudo := 0
	for _, c := range st.Fluid.Components() {
		want := eos.PenelouxSRKShift(c.Omega)
		if c.Name == "C2" {
			want = 0.035
		}
		if c.Shift != want {
			t.Errorf("%s: shift %.6g, want %.6g", c.Name, c.Shift, want)
		}
		if _, lib := eos.LibraryComponent(c.Name); !lib {
			pseudo++
		}
	}
	if pseudo == 0 {
		t.Error("no pseudo-components: the check of their shifts did not run")
	}
}

func index(t *testing.T, st *Study, name string) int {
	t.Helper()
	for i, c := range st.Fluid.Components() {
		if c.Name == name {
			return i
		}
	}
	t.Fatalf("no component %s", name)
	return -1
}

func TestReadMissingFile(t *testing.T) {
	_, err := Read(filepath.Join(t.TempDir(), "absent.toml"))
	if err == nil || !strings.Contains(err.Error(), "absent.toml") {
		t.Errorf("Read of a missing file: %v, want an error naming it", err)
	}
}

// o9 is fluid O9 of pr-open.md: every constant and interaction coefficient
// explicit (../../../../testdata/o9.toml, a copy of the reference study).
var o9 = []struct {
	name  string
	z     float64 // mole fraction
	tc    float64 // K
	pc    float64 // Pa
	omega float64
	m     float64 // g/mol
}{
	// pr-open.md part C, component table.
	{"N2", 0.008, 126.2, 3.398e6, 0.037, 28.014},
	{"CO2", 0.035, 304.12, 7.374e6, 0.225, 44.01},
	{"C1", 0.74, 190.56, 4.599e6, 0.0115, 16.043},
	{"C2", 0.075, 305.32, 4.872e6, 0.0995, 30.07},
	{"C3", 0.04, 369.83, 4.248e6, 0.1523, 44.097},
	{"nC4", 0.027, 425.12, 3.796e6, 0.2002, 58.123},
	{"nC5", 0.015, 469.7, 3.37e6, 0.2515, 72.15},
	{"P1", 0.045, 555.0, 3e6, 0.33, 105.0},
	{"P2", 0.015, 700.0, 1.85e6, 0.58, 195.0},
}

// o9Kij holds the nonzero coefficients of pr-open.md part C; all others are 0.
var o9Kij = map[[2]string]float64{
	{"N2", "C1"}: 0.025, {"N2", "C2"}: 0.08, {"N2", "C3"}: 0.08, {"N2", "nC4"}: 0.08, {"N2", "nC5"}: 0.08, {"N2", "P1"}: 0.08, {"N2", "P2"}: 0.08,
	{"CO2", "C1"}: 0.105, {"CO2", "C2"}: 0.12, {"CO2", "C3"}: 0.12, {"CO2", "nC4"}: 0.12, {"CO2", "nC5"}: 0.12, {"CO2", "P1"}: 0.12, {"CO2", "P2"}: 0.12,
	{"C1", "P1"}: 0.025, {"C1", "P2"}: 0.045,
}

func TestReadO9(t *testing.T) {
	st, err := Read("../../../../testdata/o9.toml")
	if err != nil {
		t.Fatal(err)
	}
	fl := st.Fluid
	if fl.N() != len(o9) {
		t.Fatalf("%d components, want %d", fl.N(), len(o9))
	}
	if got := fl.Options(); got.Equation != eos.PR78 || got.VolumeShift {
		t.Errorf("options %+v, want PR78 without volume shift (pr-open.md: PR78, no volume shift)", got)
	}
	// 220 degF = 377.5944444 K (pr-open.md part C heading, 10 digits).
	if d := math.Abs(st.Reservoir.Temperature - 377.5944444); d > 1e-6 {
		t.Errorf("reservoir temperature %.10g K, want 377.5944444 K (pr-open.md)", st.Reservoir.Temperature)
	}
	sum := 0.0
	for i, w := range o9 {
		c := fl.Component(i)
		if c.Name != w.name {
			t.Errorf("component %d is %s, want %s: the order of the file", i, c.Name, w.name)
			continue
		}
		// Exact: the file's values, converted by exact factors (MPa, K, g/mol).
		if math.Abs(st.Z[i]-w.z) > 1e-15 || math.Abs(c.Tc-w.tc) > 1e-12 || math.Abs(c.Pc-w.pc) > 1e-6 ||
			c.Omega != w.omega || math.Abs(c.M-w.m/1000) > 1e-17 {
			t.Errorf("%s: z %g, Tc %g K, Pc %g Pa, omega %g, M %g kg/mol; want %g, %g, %g, %g, %g (pr-open.md part C)",
				w.name, st.Z[i], c.Tc, c.Pc, c.Omega, c.M, w.z, w.tc, w.pc, w.omega, w.m/1000)
		}
		sum += st.Z[i]
	}
	if sum != 1 {
		t.Errorf("mole fractions sum to %.17g, want exactly 1", sum)
	}
	for i := range o9 {
		for j := range o9 {
			want := o9Kij[[2]string{o9[i].name, o9[j].name}] + o9Kij[[2]string{o9[j].name, o9[i].name}]
			if got := fl.Kij(i, j); got != want {
				t.Errorf("kij %s/%s = %g, want %g (pr-open.md part C)", o9[i].name, o9[j].name, got, want)
			}
		}
	}
	if len(st.Depletion) != 7 || st.Depletion[0] != 3500*units.PaPerPsi {
		t.Errorf("depletion pressures %v", st.Depletion)
	}
}

func TestCompositionOrderAndNormalisation(t *testing.T) {
	data := edit(t, "C1 = 74.0", "C1 = 73.97")
	data = strings.Replace(data, "N2 = 0.5\nCO2 = 2.5\n", "", 1)
	data = strings.Replace(data, "nC4 = 3.0\n", "nC4 = 3.0\nCO2 = 2.5\nN2 = 0.5\n", 1)
	st, err := Parse("order.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"C1", "C2", "C3", "nC4", "CO2", "N2"}
	for i, name := range want {
		if got := st.Fluid.Component(i).Name; got != name {
			t.Errorf("component %d = %s, want %s (file order)", i, got, name)
		}
	}
	if len(st.Warnings) != 1 || !strings.Contains(st.Warnings[0], "99.97") {
		t.Errorf("warnings %q, want one about the 99.97 mol%% sum", st.Warnings)
	}
	sum := 0.0
	for _, z := range st.Z {
		sum += z
	}
	if sum != 1 {
		t.Errorf("normalised mole fractions sum to %.17g, want exactly 1", sum)
	}
	// C1 = 73.97 of 99.97 mol %.
	if got, want := st.Z[0], 73.97/99.97; math.Abs(got-want) > 1e-15 {
		t.Errorf("z_C1 = %.17g, want %.17g", got, want)
	}
}

// A sum off 100 only in the fourth decimal (a lab report rounded to 0.0001
// mol %) is named with its digits, not rounded to "100".
func TestCompositionSumWarningShowsDigits(t *testing.T) {
	st, err := Parse("sum.toml", []byte(edit(t, "C1 = 74.0", "C1 = 74.0003")))
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Warnings) != 1 || !strings.Contains(st.Warnings[0], "sums to 100.0003 mol%") {
		t.Errorf("warnings %q, want one naming the 100.0003 mol%% sum", st.Warnings)
	}
}

// Whitson (1983) splits conserve the plus fraction's moles and mass
// (METHODS.md 3.1, "Constraints to test").
func TestPlusSplit(t *testing.T) {
	data := edit(t, "specific_gravity = 0.795", "specific_gravity = 0.795\nsplit = \"gamma\"\npseudo_components = 3\ngamma_shape = 1.0")
	data = strings.Replace(data, "[[separator.stage]]", "[fluid.interaction]\n\"C1/C7+\" = 0.04\n\n[[separator.stage]]", 1)
	st, err := Parse("plus.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	fl := st.Fluid
	if fl.N() != 6+3 {
		t.Fatalf("%d components, want 6 defined + 3 pseudo", fl.N())
	}
	zPlus, mass := 0.0, 0.0
	for i := 6; i < fl.N(); i++ {
		zPlus += st.Z[i]
		mass += st.Z[i] * fl.Component(i).M
		if k := fl.Kij(2, i); k != 0.04 || fl.Kij(i, 2) != 0.04 {
			t.Errorf("kij C1/%s = %g, want 0.04 from \"C1/C7+\"", fl.Component(i).Name, k)
		}
	}
	if math.Abs(zPlus-0.08) > 1e-14 {
		t.Errorf("pseudo-components hold %.15g of the feed, want 0.08", zPlus)
	}
	if m := mass / zPlus; math.Abs(m-0.143) > 1e-12 {
		t.Errorf("mean molar mass of the pseudo-components %.12g kg/mol, want 0.143", m)
	}
	// split = "none" keeps the plus fraction whole, under its own name.
	data = edit(t, "specific_gravity = 0.795", "specific_gravity = 0.795\nsplit = \"none\"")
	st, err = Parse("none.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	if n := st.Fluid.N(); n != 7 || st.Fluid.Component(6).Name != "C7+" || math.Abs(st.Fluid.Component(6).M-0.143) > 1e-15 {
		t.Errorf("split none: %d components, last %+v; want 7, the last C7+ of 143 g/mol", n, st.Fluid.Component(6))
	}
}

func TestOverridesAndUserComponents(t *testing.T) {
	data := edit(t, "C3 = 4.0", "C3 = 3.0\nF1 = 1.0")
	data = strings.Replace(data, "[[separator.stage]]", `[fluid.properties.C1]
critical_temperature = "190.0 K"
volume_shift = -0.15

[fluid.properties.F1]
molar_mass = 110.0
critical_temperature = "560 degF"
critical_pressure = "380 psia"
acentric_factor = 0.35
critical_volume = "0.45 m3/kmol"

[fluid.interaction]
"C1/F1" = 0.05

[[separator.stage]]`, 1)
	st, err := Parse("props.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	lib, ok := eos.LibraryComponent("C1")
	if !ok {
		t.Fatal("C1 is not in the library")
	}
	c1 := st.Fluid.Component(2)
	if c1.Tc != 190 || c1.Shift != -0.15 {
		t.Errorf("C1 Tc %g K, shift %g; want the overrides 190 K and -0.15", c1.Tc, c1.Shift)
	}
	if c1.Pc != lib.Pc || c1.M != lib.M || c1.Omega != lib.Omega || c1.Vc != lib.Vc {
		t.Errorf("C1 %+v: properties not overridden must stay the library's %+v", c1, lib)
	}
	f1 := st.Fluid.Component(5)
	if f1.Name != "F1" || f1.M != 0.11 || math.Abs(f1.Tc-(560+459.67)/1.8) > 1e-12 || math.Abs(f1.Pc-380*units.PaPerPsi) > 1e-8 ||
		f1.Omega != 0.35 || math.Abs(f1.Vc-0.45e-3) > 1e-18 {
		t.Errorf("F1 = %+v, want the file's values in SI", f1)
	}
	if k := st.Fluid.Kij(2, 5); k != 0.05 {
		t.Errorf("kij C1/F1 = %g, want 0.05", k)
	}
}

// hydrocarbon_kij_a = 0 turns the Chueh–Prausnitz coefficients off: every
// hydrocarbon pair gets 0, while N2 and CO2 keep their published values.
func TestChuehPrausnitzOff(t *testing.T) {
	st, err := Parse("cp.toml", []byte(edit(t, `equation = "PR78"`, "equation = \"PR78\"\nhydrocarbon_kij_a = 0")))
	if err != nil {
		t.Fatal(err)
	}
	def, err := Parse("cp.toml", []byte(base))
	if err != nil {
		t.Fatal(err)
	}
	fl, fd := st.Fluid, def.Fluid
	for i := 2; i < fl.N(); i++ { // C1 onwards: hydrocarbons
		for j := 2; j < fl.N(); j++ {
			if k := fl.Kij(i, j); k != 0 {
				t.Errorf("kij %s/%s = %g with hydrocarbon_kij_a = 0, want 0", fl.Component(i).Name, fl.Component(j).Name, k)
			}
		}
		if fl.Kij(0, i) != fd.Kij(0, i) || fl.Kij(1, i) != fd.Kij(1, i) {
			t.Errorf("N2 or CO2 with %s changed with hydrocarbon_kij_a", fl.Component(i).Name)
		}
	}
	if fd.Kij(2, 6) == 0 {
		t.Errorf("default kij C1/%s is 0; the Chueh–Prausnitz default should make it positive", fd.Component(6).Name)
	}
}

func TestAliasKeepsFileName(t *testing.T) {
	// eos.LibraryComponent accepts C6 for nC6; the fluid keeps the file's name.
	data := edit(t, "C3 = 4.0", "C3 = 3.0\nC6 = 1.0")
	st, err := Parse("alias.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	if name := st.Fluid.Component(5).Name; name != "C6" {
		t.Errorf("component 5 is %q, want C6 as written", name)
	}
}

func TestGaugeAndStandardConditions(t *testing.T) {
	st, err := Parse("std.toml", []byte(base))
	if err != nil {
		t.Fatal(err)
	}
	if st.Atmospheric != 101325 {
		t.Errorf("default atmospheric pressure %g Pa, want 101325 (1 atm)", st.Atmospheric)
	}
	// DESIGN.md: 60 degF and 14.696 psia (field), 15 degC and 101.325 kPa (metric) by default.
	if c := st.StandardConditions(units.Field); c != units.Field.Standard() {
		t.Errorf("field standard conditions %+v, want %+v", c, units.Field.Standard())
	}
	if c := st.StandardConditions(units.Metric); c.T != 288.15 || c.P != 101325 {
		t.Errorf("metric standard conditions %+v, want 288.15 K and 101325 Pa", c)
	}
	data := edit(t, `initial_pressure = "5200 psia"`, `initial_pressure = "5185.3 psig"`)
	data = strings.Replace(data, "[[separator.stage]]", "[standard_conditions]\natmospheric_pressure = \"14.7 psia\"\ntemperature = \"15 degC\"\n\n[[separator.stage]]", 1)
	st, err = Parse("gauge.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	if p := st.Reservoir.InitialPressure / units.PaPerPsi; math.Abs(p-5200) > 1e-9 {
		t.Errorf("5185.3 psig with 14.7 psia atmospheric = %.12g psia, want 5200", p)
	}
	c := st.StandardConditions(units.Field)
	if c.T != 288.15 || c.P != units.Field.Standard().P {
		t.Errorf("standard conditions %+v, want 15 degC as set and the field default pressure", c)
	}
}

func TestInlineComposition(t *testing.T) {
	data := `[reservoir]
temperature = "200 degF"
[fluid]
composition = { C3 = 40, C1 = 60 }
`
	st, err := Parse("inline.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	if st.Fluid.Component(0).Name != "C3" || st.Z[0] != 0.4 {
		t.Errorf("first component %s with z %g, want C3 with 0.4 (file order)", st.Fluid.Component(0).Name, st.Z[0])
	}
}

func TestExampleReads(t *testing.T) {
	data, err := os.ReadFile("../../../../examples/sablewick.toml")
	if err != nil {
		t.Fatal(err)
	}
	st, err := Parse("../../../../examples/sablewick.toml", data)
	if err != nil {
		t.Fatal(err)
	}
	// DESIGN of the example: 70-75 mol % C1, 6-10 mol % C7+ split into about
	// four pseudo-components, 12-14 components in all.
	if n := st.Fluid.N(); n < 12 || n > 14 {
		t.Errorf("%d components, want 12 to 14", n)
	}
	if st.Reservoir.InitialPressure <= 0 || len(st.Separator) != 2 || len(st.Depletion) == 0 {
		t.Errorf("example lacks initial pressure, two separator stages or depletion pressures: %+v", st)
	}
}

// TestQuadratureSplitAndRD87: split = "gamma-quadrature" gives the number of
// pseudo-components asked for, still holding the plus fraction's mole
// fraction and molar mass (the properties the split must preserve, issue
// "thermodynamic core"), and correlation = "riazi-daubert-1987" is accepted.
func TestQuadratureSplitAndRD87(t *testing.T) {
	data := edit(t, "specific_gravity = 0.795", "specific_gravity = 0.795\nsplit = \"gamma-quadrature\"\npseudo_components = 3\ncorrelation = \"riazi-daubert-1987\"")
	st, err := Parse("quad.toml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	fl := st.Fluid
	if fl.N() != 6+3 {
		t.Fatalf("%d components, want 6 defined + 3 quadrature pseudo-components", fl.N())
	}
	zPlus, mass := 0.0, 0.0
	for i := 6; i < fl.N(); i++ {
		zPlus += st.Z[i]
		mass += st.Z[i] * fl.Component(i).M
	}
	if math.Abs(zPlus-0.08) > 1e-14 || math.Abs(mass/zPlus-0.143) > 1e-12 {
		t.Errorf("quadrature pseudo-components hold %.15g at %.12g kg/mol, want 0.08 at 0.143", zPlus, mass/zPlus)
	}
	data = edit(t, "specific_gravity = 0.795", "specific_gravity = 0.795\nsplit = \"exponential\"\ngamma_shape = 2")
	if _, err := Parse("bad.toml", []byte(data)); err == nil || !strings.Contains(err.Error(), "fluid.plus.gamma_shape") {
		t.Errorf("gamma_shape with an exponential split: err = %v", err)
	}
}
