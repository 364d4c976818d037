package study

import (
	"math"
	"strings"
	"testing"

	"dewcell/eos"
)

const tuneSection = `
[fluid.interaction]
"C1/C7+" = 0.03
[[tune.parameter]]
property = "critical_temperature"
component = "C7+"
min = 0.9
max = 1.1

[[tune.parameter]]
property = "interaction"
pair = "C1/C7+"
min = 0.0
max = 0.2

[[tune.parameter]]
property = "molar_mass"
component = "C7+"
min = 0.8
max = 1.2

[tune.weights]
saturation_pressure = 5
gas_C1 = 0.5
`

func tuneStudy(t *testing.T, text string) *Study {
	t.Helper()
	s, err := Parse("tune.toml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// Tuned at the starting values is the study's own fluid, to the last bit:
// the rebuild goes through the same reading of the file. (The study
// sets the C1 coefficients of the pseudo-components to one value, so that
// the common value tuning starts from is the study's; a pair whose
// coefficients differ starts from their mean, with a warning.)
func TestTunedAtStart(t *testing.T) {
	s := tuneStudy(t, base+tuneSection)
	if got := len(s.Tune.Parameters); got != 3 {
		t.Fatalf("%d parameters, want 3", got)
	}
	if s.Tune.Weights["saturation_pressure"] != 5 || s.Tune.Weights["gas_C1"] != 0.5 {
		t.Errorf("weights %v", s.Tune.Weights)
	}
	x := make([]float64, 3)
	for i, p := range s.Tune.Parameters {
		x[i] = p.Start
	}
	fl, z, err := s.Tuned(x)
	if err != nil {
		t.Fatal(err)
	}
	sameFluid(t, fl, z, s.Fluid, s.Z)
}

func sameFluid(t *testing.T, fl *eos.Fluid, z []float64, want *eos.Fluid, wantZ []float64) {
	t.Helper()
	if fl.N() != want.N() {
		t.Fatalf("%d components, want %d", fl.N(), want.N())
	}
	for i := range fl.N() {
		if fl.Component(i) != want.Component(i) || z[i] != wantZ[i] {
			t.Errorf("component %d: %+v %g, want %+v %g", i, fl.Component(i), z[i], want.Component(i), wantZ[i])
		}
		for j := range fl.N() {
			if fl.Kij(i, j) != want.Kij(i, j) {
				t.Errorf("kij %d,%d = %g, want %g", i, j, fl.Kij(i, j), want.Kij(i, j))
			}
		}
	}
}

// The multiplier of the plus fraction scales every pseudo-component by one
// factor; the interaction sets every C1/pseudo-component pair; the molar
// mass re-splits the plus fraction at the same mole fraction and specific
// gravity (the split's invariants: Σ z_i = z+, Σ z_i M_i / Σ z_i = M+).
func TestTunedValues(t *testing.T) {
	s := tuneStudy(t, base+tuneSection)
	plus := s.groups["C7+"]
	// Temperature and interaction only.
	fl, _, err := s.Tuned([]float64{1.05, 0.07, 1})
	if err != nil {
		t.Fatal(err)
	}
	c1 := s.groups["C1"][0]
	for _, i := range plus {
		if got, want := fl.Component(i).Tc, 1.05*s.Fluid.Component(i).Tc; math.Abs(got-want) > 1e-12*want {
			t.Errorf("%s: Tc %g, want %g", fl.Component(i).Name, got, want)
		}
		if fl.Component(i).Pc != s.Fluid.Component(i).Pc {
			t.Errorf("%s: Pc changed", fl.Component(i).Name)
		}
		if fl.Kij(c1, i) != 0.07 || fl.Kij(i, c1) != 0.07 {
			t.Errorf("kij C1/%s = %g, want 0.07", fl.Component(i).Name, fl.Kij(c1, i))
		}
	}
	// The molar mass: 143 × 1.1 g/mol.
	fl, z, err := s.Tuned([]float64{1, 0, 1.1})
	if err != nil {
		t.Fatal(err)
	}
	zPlus, zm := 0.0, 0.0
	for _, i := range plus {
		zPlus += z[i]
		zm += z[i] * fl.Component(i).M
	}
	wantZ := 0.0
	for _, i := range plus {
		wantZ += s.Z[i]
	}
	if math.Abs(zPlus-wantZ) > 1e-12 {
		t.Errorf("plus mole fraction %g, want %g", zPlus, wantZ)
	}
	if got := zm / zPlus; math.Abs(got-0.1573) > 1e-6 {
		t.Errorf("plus molar mass %g kg/mol, want 0.1573 (143 g/mol × 1.1)", got)
	}
}

// [fluid.properties] may name a pseudo-component by the name fluid prints.
func TestPseudoComponentOverride(t *testing.T) {
	plain := tuneStudy(t, base)
	name := plain.Fluid.Component(plain.groups["C7+"][1]).Name
	s := tuneStudy(t, base+"\n[fluid.properties.\""+name+"\"]\ncritical_temperature = \"700 K\"\nacentric_factor = 0.61\n")
	i := s.groups["C7+"][1]
	if c := s.Fluid.Component(i); c.Tc != 700 || c.Omega != 0.61 || c.Pc != plain.Fluid.Component(i).Pc {
		t.Errorf("%s: %+v; want Tc 700 K, omega 0.61, Pc unchanged", name, c)
	}
}

func TestTuneErrors(t *testing.T) {
	plain := tuneStudy(t, base)
	pseudo := plain.Fluid.Component(plain.groups["C7+"][0]).Name
	param := func(body string) string { return base + "\n[[tune.parameter]]\n" + body + "\n" }
	for _, c := range []struct{ text, want string }{
		{param(`property = "critical_volume"` + "\ncomponent = \"C1\"\nmin = 0.9\nmax = 1.1"), `tune.parameter[1].property`},
		{param(`property = "critical_temperature"` + "\ncomponent = \"C9\"\nmin = 0.9\nmax = 1.1"), `"C9" is not a component of the fluid`},
		{param(`property = "critical_temperature"` + "\ncomponent = \"C1\"\nmin = 0.95\nmax = 0.99"), "must enclose 1"},
		{param(`property = "critical_temperature"` + "\ncomponent = \"C1\"\nmin = 1.1\nmax = 0.9"), "must be above min"},
		{param(`property = "molar_mass"` + "\ncomponent = \"C1\"\nmin = 0.9\nmax = 1.1"), "plus fraction only"},
		{param(`property = "volume_shift"` + "\ncomponent = \"C1\"\nmin = 0.9\nmax = 1.1"), "fluid.volume_shift is false"},
		{param(`property = "interaction"` + "\npair = \"C1/C1\"\nmin = 0\nmax = 0.1"), "does not interact with itself"},
		{param(`property = "interaction"` + "\npair = \"C1/C7+\"\nmin = 0.07\nmax = 0.1"), "lies outside"},
		{param(`property = "interaction"` + "\ncomponent = \"C1\"\nmin = 0\nmax = 0.1"), "names a pair"},
		{param(`property = "critical_temperature"`+"\ncomponent = \"C7+\"\nmin = 0.9\nmax = 1.1") +
			"\n[[tune.parameter]]\nproperty = \"critical_temperature\"\ncomponent = \"" + pseudo + "\"\nmin = 0.9\nmax = 1.1\n", "overlaps"},
		{param(`property = "molar_mass"`+"\ncomponent = \"C7+\"\nmin = 0.9\nmax = 1.1") +
			"\n[[tune.parameter]]\nproperty = \"acentric_factor\"\ncomponent = \"" + pseudo + "\"\nmin = 0.9\nmax = 1.1\n", "re-splits"},
		{param(`property = "critical_temperature"`+"\ncomponent = \"C1\"\nmin = 0.9\nmax = 1.1") + "\n[tune.weights]\nliquid_drop = 1\n", "unknown quantity"},
		{param(`property = "critical_temperature"`+"\ncomponent = \"C1\"\nmin = 0.9\nmax = 1.1") + "\n[tune.weights]\nz_gas = -1\n", "tune.weights.z_gas"},
		{base + "\n[tune.weights]\nz_gas = 1\n", "tune.parameter"},
		{base + "\n[fluid.properties.C99]\ncritical_temperature = \"700 K\"\n", "nor a pseudo-component of the plus fraction"},
	} {
		_, err := Parse("tune.toml", []byte(c.text))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("error %v, want one containing %q", err, c.want)
		}
	}
}
