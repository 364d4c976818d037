package phys

import (
	"math"
	"strconv"
	"testing"
)

// decimal is the float64 nearest to the decimal s.
func decimal(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// TestExact checks the definitions against the decimal values their
// sources print in full: each constant must round to the float64 nearest the
// exact value, as a decimal copy of fewer digits may not.
func TestExact(t *testing.T) {
	for _, c := range []struct {
		name string
		got  float64
		want string
		src  string
	}{
		{"R", R, "8.31446261815324", "CODATA 2018: R = 8.314 462 618 153 24 J/(mol K), exact"},
		{"PaPerPsi", PaPerPsi, "6894.757293168361336", "0.45359237 kg × 9.80665 m/s² / (0.0254 m)², to 19 digits (NIST SP 811 B.9 prints 6.894 757 E+03)"},
		{"M3PerFt3", M3PerFt3, "0.028316846592", "0.3048³ m³, exact (NIST SP 811 B.9 prints 2.831 685 E-02)"},
		{"M3PerUSGallon", M3PerUSGallon, "0.003785411784", "231 in³, exact (NIST SP 811 B.9 prints 3.785 412 E-03)"},
		{"M3PerBbl", M3PerBbl, "0.158987294928", "42 US gal, exact (NIST SP 811 B.9 prints 1.589 873 E-01)"},
		{"MolPerLbmol", MolPerLbmol, "453.59237", "1 lb = 0.45359237 kg (1959)"},
		{"KgM3PerLbFt3", KgM3PerLbFt3, "16.018463373960139", "NIST SP 811 B.9 prints 1.601 846 E+01 kg/m³ per lb/ft³; 17 digits of 0.45359237/0.028316846592"},
		{"PaPerAtm", PaPerAtm, "101325", "10th CGPM (1954)"},
		{"FieldStandardT", FieldStandardT, "288.70555555555555556", "60 °F = 519.67 °R = 519.67/1.8 K (METHODS 5.1)"},
		{"MetricStandardT", MetricStandardT, "288.15", "15 °C"},
		{"MetricStandardP", MetricStandardP, "101325", "101.325 kPa"},
	} {
		if want := decimal(t, c.want); c.got != want {
			t.Errorf("%s = %.17g, want %.17g, the float64 nearest %s (%s)", c.name, c.got, want, c.want, c.src)
		}
	}
	// 14.696 psia is one standard atmosphere, 101.325 kPa = 14.695949 psia
	// (METHODS front matter), to 4e-6.
	if r := FieldStandardP/PaPerAtm - 1; !(r > 0 && r < 4e-6) {
		t.Errorf("14.696 psia / 1 atm − 1 = %g, want between 0 and 4e-6 (METHODS front matter)", r)
	}
	if got, want := PaPerAtm/PaPerPsi, 14.695949; math.Abs(got-want) > 5e-7 {
		t.Errorf("1 atm = %.9g psia, want %g (METHODS front matter, 8 digits)", got, want)
	}
}

// TestFieldConstants: the trade's field-unit constants (METHODS 5.1) from the
// definitions.
func TestFieldConstants(t *testing.T) {
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
		src       string
	}{
		{"R in psia ft³/(lbmol °R)", R / PaPerPsi / M3PerFt3 * MolPerLbmol * KelvinPerRankine, 10.7316, 5e-5, "METHODS 5.1, 6 significant figures"},
		// 379.49 printed in METHODS 5.1 is one unit high in its last digit
		// (10.7316 × 519.67/14.696 = 379.484): one unit of tolerance.
		{"R T_sc/p_sc in scf/lbmol", R * FieldStandardT / FieldStandardP * MolPerLbmol / M3PerFt3, 379.49, 0.01, "METHODS 5.1"},
		{"ft³ per bbl", M3PerBbl / M3PerFt3, 5.614583, 5e-7, "METHODS 5.1: 1 bbl = 5.614583 ft³"},
		{"water at 60 °F, lb/ft³", WaterDensity60F / KgM3PerLbFt3, 62.366, 0.001, "METHODS 5.1: 62.366 (truncated, so one unit)"},
		{"1 STB of water, lb", WaterDensity60F * M3PerBbl / KgPerPound, 350.16, 0.01, "METHODS 5.1: 350.16 lbm"},
		{"air, g/mol", MolarMassAir * 1000, 28.97, 0.01, "METHODS §2 and 5.4: 28.97 commonly (one unit)"},
		{"1 bar in psia", PaPerBar / PaPerPsi, 14.503774, 5e-7, "METHODS front matter: 1 bar = 14.503774 psia"},
	} {
		if math.Abs(c.got-c.want) > c.tol {
			t.Errorf("%s = %.8g, want %g ± %g (%s)", c.name, c.got, c.want, c.tol, c.src)
		}
	}
}

func TestTemperature(t *testing.T) {
	for _, c := range []struct {
		f, k float64
		src  string
	}{
		{-40, 233.15, "−40 °F = −40 °C, where the scales cross"},
		{32, 273.15, "the ice point, 32 °F = 0 °C"},
		{212, 373.15, "100 °C = 212 °F (the scales' definitions)"},
		{60, 288.7055555555556, "60 °F = 519.67/1.8 K (METHODS 5.1)"},
		{-459.67, 0, "0 °R = 0 K"},
	} {
		if got := KelvinFromFahrenheit(c.f); math.Abs(got-c.k) > 1e-12 {
			t.Errorf("KelvinFromFahrenheit(%g) = %.15g, want %.15g (%s)", c.f, got, c.k, c.src)
		}
		if got := FahrenheitFromKelvin(c.k); math.Abs(got-c.f) > 1e-12 {
			t.Errorf("FahrenheitFromKelvin(%g) = %.15g, want %.15g (%s)", c.k, got, c.f, c.src)
		}
	}
	if RankinePerKelvin*KelvinPerRankine != 1 {
		t.Error("1.8 × 5/9 is not 1")
	}
}

func TestAPI(t *testing.T) {
	for _, c := range []struct {
		sg, api float64
		tolSG   float64 // half a unit in the last digit of the printed SG
		tolAPI  float64 // that half unit times dAPI/dSG = 141.5/SG²
		src     string
	}{
		{1, 10, 0, 0, "water is 10 °API by the scale's definition"},
		{0.75871, 55, 5e-6, 5e-6 * 141.5 / (0.75871 * 0.75871), "METHODS C9: 55 °API, γo = 0.75871 (5 digits)"},
	} {
		if got := APIGravity(c.sg); math.Abs(got-c.api) > c.tolAPI {
			t.Errorf("APIGravity(%g) = %.8g, want %g (%s)", c.sg, got, c.api, c.src)
		}
		if got := SpecificGravity(c.api); math.Abs(got-c.sg) > c.tolSG {
			t.Errorf("SpecificGravity(%g) = %.8g, want %g (%s)", c.api, got, c.sg, c.src)
		}
	}
	for _, sg := range []float64{0.6, 0.75, 0.9, 1.1} {
		if back := SpecificGravity(APIGravity(sg)); math.Abs(back-sg) > 1e-15 {
			t.Errorf("SpecificGravity(APIGravity(%g)) = %.17g: the two are inverses", sg, back)
		}
	}
}
