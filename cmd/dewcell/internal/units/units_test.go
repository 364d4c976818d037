package units

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// rel is the relative difference of got from want.
func rel(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

var parseTests = []struct {
	in   string
	kind Kind
	atm  float64 // Pa
	want float64 // SI
	tol  float64 // relative
	src  string
}{
	// pr-open.md (../shared/refdata, also testdata/pr-open.md) prints T both ways.
	{"220 degF", Temperature, 0, 377.5944444, 1e-9, "pr-open.md part C: 220 degF = 377.5944444 K (10 digits)"},
	{"160 degF", Temperature, 0, 344.2611111, 1e-9, "pr-open.md part B: 160 degF = 344.2611111 K (10 digits)"},
	{"-288.166 degF", Temperature, 0, 95.28, 1e-9, "pr-open.md part A: C1 Tr = 0.5, 95.28 K = -288.166 degF"},
	{"118 degC", Temperature, 0, 391.15, 1e-15, "definition: T/K = t/degC + 273.15"},
	{"390 K", Temperature, 0, 390, 0, "SI"},
	{"700 degR", Temperature, 0, 700 / 1.8, 1e-15, "definition: 1 degR = 5/9 K (NIST SP 811, B.9)"},
	{"491.67 °R", Temperature, 0, 273.15, 1e-15, "definition: 32 degF = 491.67 degR = 273.15 K"},
	{"-40 °F", Temperature, 0, 233.15, 1e-14, "-40 degF = -40 degC: the scales cross there (definitions)"},
	{"245degF", Temperature, 0, (245 + 459.67) / 1.8, 1e-15, "definition; the space is optional"},
	// The usual spellings of the scales: F, C and R alone (NIST SP 811 writes °F, °C and °R).
	{"245 F", Temperature, 0, (245 + 459.67) / 1.8, 1e-15, "definition: T/K = (t/°F + 459.67)/1.8"},
	{"-40 F", Temperature, 0, 233.15, 1e-14, "-40 °F = -40 °C (definitions)"},
	{"118 C", Temperature, 0, 391.15, 1e-15, "definition: T/K = t/°C + 273.15"},
	{"118C", Temperature, 0, 391.15, 1e-15, "definition; the space is optional"},
	{"700 R", Temperature, 0, 700 / 1.8, 1e-15, "definition: 1 °R = 5/9 K (NIST SP 811, B.9)"},
	{"491.67 R", Temperature, 0, 273.15, 1e-15, "definition: 491.67 °R = 273.15 K"},
	{"390 K", Temperature, 0, 390, 0, "SI"},

	// Pressures against the psia and Pa columns of pr-open.md.
	{"1000 psia", Pressure, 0, 6894757.293, 1e-10, "pr-open.md part B: 1000 psia = 6894757.293 Pa"},
	{"3797.796273 psia", Pressure, 0, 26184883.55, 1e-9, "pr-open.md part C: P_dew = 3797.796273 psia = 26184883.55 Pa"},
	{"3.398 MPa", Pressure, 0, 492.838 * 6894.757293168361, 1e-6, "pr-open.md: N2 Pc 3.398e6 Pa = 492.838 psia (6 digits)"},
	{"1 atm", Pressure, 0, 101325, 0, "10th CGPM (1954): 1 atm = 101325 Pa"},
	{"14.695949 psia", Pressure, 0, 101325, 4e-8, "METHODS.md units line: 1 atm = 14.695949 psia = 101325 Pa (8 digits: half a unit in the last is 3.4e-8)"},
	{"1 bara", Pressure, 0, 14.503774 * 6894.757293168361, 4e-8, "METHODS.md units line: 1 bar = 14.503774 psia (8 digits: half a unit in the last is 3.4e-8)"},
	{"427.5 bara", Pressure, 0, 42.75e6, 1e-15, "definition: 1 bar = 1e5 Pa"},
	{"42.75 MPa", Pressure, 0, 42.75e6, 0, "SI prefix"},
	{"101.325 kPa", Pressure, 0, 101325, 1e-15, "SI prefix"},
	{"1e5 Pa", Pressure, 0, 1e5, 0, "SI"},
	{"1 psia", Pressure, 0, 6.894757e3, 1e-7, "NIST SP 811 (2008) B.9: psi = 6.894 757 E+03 Pa (7 digits)"},
	{"1200 psig", Pressure, 101325, 1200*6894.757293168361 + 101325, 1e-15, "gauge + atmospheric (definition)"},
	{"10 barg", Pressure, 101325, 1101325, 1e-15, "gauge + atmospheric: 10 barg = 11.01325 bara"},
	{"-14.696 psig", Pressure, 14.696 * 6894.757293168361, 0, 1e-9, "full vacuum: gauge = -atmospheric"},

	{"85 ft", Length, 0, 25.908, 1e-15, "1 ft = 0.3048 m (1959 agreement)"},
	{"26 m", Length, 0, 26, 0, "SI"},
	{"12 in", Length, 0, 0.3048, 1e-15, "1 in = 0.0254 m (1959 agreement)"},
	{"2400 acre", Area, 0, 2400 * 4046.8564224, 1e-15, "international acre = 43560 ft2 = 4046.8564224 m2 (NIST SP 811, B.9 footnote)"},
	{"1 ft2", Area, 0, 9.290304e-2, 1e-15, "NIST SP 811 B.9: square foot 9.290 304 E-02 m2 (exact)"},
	{"970 ha", Area, 0, 9.7e6, 1e-15, "hectare = 1e4 m2"},
	{"1 bbl", Volume, 0, 1.589873e-1, 1e-6, "NIST SP 811 B.9: barrel (42 US gal) 1.589 873 E-01 m3 (7 digits)"},
	{"1 ft3", Volume, 0, 2.831685e-2, 1e-6, "NIST SP 811 B.9: cubic foot 2.831 685 E-02 m3 (7 digits)"},
	{"1 MMbbl", Volume, 0, 158987.294928, 1e-15, "1e6 bbl of 0.158987294928 m3 (42 x 231 in3)"},
	{"1 acre-ft", Volume, 0, 1233.48183754752, 1e-15, "43560 ft3 (definition)"},
	{"4e-6 1/psi", Compressibility, 0, 4e-6 / 6894.757293168361, 1e-15, "1/psi = 1/(6894.757... Pa)"},
	{"3e-6 1/bar", Compressibility, 0, 3e-11, 1e-15, "1/bar = 1e-5 1/Pa"},
	{"1 lb/ft3", Density, 0, 1.601846e1, 1e-6, "NIST SP 811 B.9: pound per cubic foot 1.601 846 E+01 kg/m3 (7 digits)"},
	{"143 g/mol", MolarMass, 0, 0.143, 1e-15, "SI prefix"},
	{"0.0285 cP", Viscosity, 0, 2.85e-5, 1e-15, "NIST SP 811 B.9: centipoise 1.0 E-03 Pa·s (exact)"},
	{"0.0285 mPa·s", Viscosity, 0, 2.85e-5, 1e-15, "SI prefix: 1 mPa·s = 1 cP"},
	{"28.5 µPa.s", Viscosity, 0, 2.85e-5, 1e-15, "SI prefix"},
	{"2.85e-5 Pa.s", Viscosity, 0, 2.85e-5, 0, "SI"},
	{"1 ft3/lbmol", MolarVolume, 0, 1 / 0.01601846 * 1e-6, 1e-6, "METHODS.md units line: 1 cm3/mol = 0.01601846 ft3/lbmol (7 digits)"},
}

func TestParse(t *testing.T) {
	t.Parallel()
	for _, tt := range parseTests {
		got, err := Parse(tt.in, tt.kind, tt.atm)
		if err != nil {
			t.Errorf("Parse(%q, %v): %v (%s)", tt.in, tt.kind, err, tt.src)
			continue
		}
		if tt.want == 0 {
			if math.Abs(got) > 1e-9 {
				t.Errorf("Parse(%q, %v) = %.12g, want 0 (%s)", tt.in, tt.kind, got, tt.src)
			}
			continue
		}
		if d := rel(got, tt.want); d > tt.tol {
			t.Errorf("Parse(%q, %v) = %.12g, want %.12g, rel. diff %.2g > %g (%s)", tt.in, tt.kind, got, tt.want, d, tt.tol, tt.src)
		}
	}
}

// The psi constant is the exact value 0.45359237 × 9.80665 / 0.0254² Pa
// rounded once to float64; printed to 16 digits it is 6894.757293168361
// (pr-open.md: "1 psi = 6894.757293168361 Pa").
func TestPsiConstant(t *testing.T) {
	t.Parallel()
	if d := rel(PaPerPsi, 6894.757293168361); d > 2e-16 {
		t.Errorf("PaPerPsi = %.17g, want 6894.757293168361 (pr-open.md), rel. diff %.2g", float64(PaPerPsi), d)
	}
}

var parseErrors = []struct {
	in   string
	kind Kind
	atm  float64
	want error
	msg  string // a piece of the message the user reads
}{
	{"6200", Pressure, 0, ErrNoUnit, "missing unit"},
	{"245", Temperature, 0, ErrNoUnit, "degF"},
	{"", Length, 0, ErrSyntax, "empty"},
	{"   ", Length, 0, ErrSyntax, "empty"},
	{"psia", Pressure, 0, ErrSyntax, "number and a unit"},
	{"62 00 psia", Pressure, 0, ErrSyntax, "number and a unit"},
	{"6200 furlongs", Pressure, 0, ErrUnknownUnit, `unknown unit "furlongs"`},
	{"6200 PSIA", Pressure, 0, ErrUnknownUnit, `did you mean "psia"`},
	{"42 mpa", Pressure, 0, ErrUnknownUnit, `"MPa"`},
	{"6200 psi", Pressure, 0, ErrAmbiguous, "psia or psig?"},
	{"300 bar", Pressure, 0, ErrAmbiguous, "bara or barg?"},
	{"245 f", Temperature, 0, ErrUnknownUnit, `did you mean "F"`},
	{"245 F", Pressure, 0, ErrWrongKind, "temperature"},
	{"85 ft", Pressure, 0, ErrWrongKind, "length"},
	{"245 degF", Pressure, 0, ErrWrongKind, "temperature"},
	{"6200 psia", Temperature, 0, ErrWrongKind, "pressure"},
	{"2400 acre", Length, 0, ErrWrongKind, "area"},
	{"NaN psia", Pressure, 0, ErrNotFinite, "finite"},
	{"-Inf degF", Temperature, 0, ErrNotFinite, "finite"},
	{"inf", Pressure, 0, ErrNotFinite, "finite"},
	{"1e400 psia", Pressure, 0, ErrNotFinite, "finite"},
	{"1e308 MMbbl", Volume, 0, ErrNotFinite, "finite"},
	{"-500 degF", Temperature, 0, ErrNegative, "absolute zero"},
	{"-1 K", Temperature, 0, ErrNegative, "absolute zero"},
	{"0 degR", Temperature, 0, ErrNegative, "absolute zero"},
	{"-5 psia", Pressure, 0, ErrNegative, "below zero"},
	{"-20 psig", Pressure, 101325, ErrNegative, "below zero"},
	{"-3 ft", Length, 0, ErrNegative, "negative"},
	{"1200 psig", Pressure, 0, ErrNoAtm, "atmospheric"},
	{"10 barg", Pressure, math.NaN(), ErrNoAtm, "atmospheric"},
}

func TestParseErrors(t *testing.T) {
	t.Parallel()
	for _, tt := range parseErrors {
		got, err := Parse(tt.in, tt.kind, tt.atm)
		if !errors.Is(err, tt.want) {
			t.Errorf("Parse(%q, %v) = %g, %v; want error %v", tt.in, tt.kind, got, err, tt.want)
			continue
		}
		if got != 0 {
			t.Errorf("Parse(%q, %v) returned %g with its error, want 0", tt.in, tt.kind, got)
		}
		if !strings.Contains(err.Error(), tt.msg) || !strings.Contains(err.Error(), tt.in) && tt.in != "" {
			t.Errorf("Parse(%q, %v) error %q, want it to quote the input and mention %q", tt.in, tt.kind, err, tt.msg)
		}
	}
}

// Output conversion inverts input conversion, for every unit of both systems.
func TestRoundTrip(t *testing.T) {
	t.Parallel()
	for _, sys := range []System{Field, Metric} {
		for k := Temperature; k <= MolarVolume; k++ {
			u := sys.Unit(k)
			if u.Kind != k || u.Key == "" || u.Symbol == "" {
				t.Errorf("%v.Unit(%v) = %+v, want a named unit of that kind", sys, k, u)
				continue
			}
			in, ok := Lookup(u.Symbol)
			if !ok || in.Kind != k {
				t.Errorf("%v unit %q for %v cannot be read back", sys, u.Symbol, k)
				continue
			}
			for _, v := range []float64{0.5, 1, 7, 245, 6200} {
				// Through an offset origin (459.67 degR at 0 degF) the absolute
				// error is a few ulp of the intermediate, not of v.
				if back := u.FromSI(in.ToSI(v)); math.Abs(back-v) > 4e-16*(math.Abs(v)+1000) {
					t.Errorf("%v: %g %s -> SI -> %g %s", sys, v, u.Symbol, back, u.Symbol)
				}
			}
		}
	}
}

// Output unit names become the ends of JSON keys (DESIGN.md: dew_pressure_psia,
// temperature_degF, pressure_bara).
func TestOutputKeys(t *testing.T) {
	t.Parallel()
	want := []struct {
		sys  System
		kind Kind
		key  string
	}{
		{Field, Pressure, "psia"}, {Field, Temperature, "degF"}, {Field, Length, "ft"}, {Field, Area, "acre"},
		{Field, Density, "lb_ft3"}, {Field, MolarMass, "g_mol"},
		{Metric, Pressure, "bara"}, {Metric, Temperature, "degC"}, {Metric, Length, "m"}, {Metric, Area, "ha"},
		{Metric, Density, "kg_m3"},
	}
	for _, w := range want {
		if got := w.sys.Unit(w.kind).Key; got != w.key {
			t.Errorf("%v.Unit(%v).Key = %q, want %q", w.sys, w.kind, got, w.key)
		}
	}
	if Percent.FromSI(0.0731) != 7.31 || Percent.Key != "pct" {
		t.Errorf("Percent converts 0.0731 to %g with key %q, want 7.31 and pct", Percent.FromSI(0.0731), Percent.Key)
	}
}

// DESIGN.md: standard conditions 60 degF and 14.696 psia (field), 15 degC and
// 101.325 kPa (metric).
func TestStandard(t *testing.T) {
	t.Parallel()
	f, m := Field.Standard(), Metric.Standard()
	if rel(DegF.FromSI(f.T), 60) > 1e-14 || rel(Psia.FromSI(f.P), 14.696) > 1e-14 {
		t.Errorf("field standard conditions %g degF, %g psia; want 60 degF, 14.696 psia", DegF.FromSI(f.T), Psia.FromSI(f.P))
	}
	if m.T != 288.15 || m.P != 101325 {
		t.Errorf("metric standard conditions %g K, %g Pa; want 288.15 K, 101325 Pa", m.T, m.P)
	}
	for _, s := range []string{"field", "metric"} {
		if sys, err := ParseSystem(s); err != nil || sys.String() != s {
			t.Errorf("ParseSystem(%q) = %v, %v", s, sys, err)
		}
	}
	if _, err := ParseSystem("imperial"); err == nil {
		t.Error("ParseSystem(imperial) gave no error")
	}
}

// TestParseState: pressures and temperatures of a state outside the
// documented range (1 kPa to 400 MPa, 100 K to 1500 K) are ErrOutOfRange,
// the message giving the range in the unit of the input; the limits
// themselves and values inside are accepted as Parse reads them. The
// converted limits follow from the definitions: 400 MPa = 58015.1 psia and
// 1 kPa = 0.145038 psia (1 psi = 6894.757 Pa, NIST SP 811); 100 K =
// -279.67 degF = -173.15 degC, 1500 K = 2240.33 degF = 1226.85 degC.
func TestParseState(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		in   string
		kind Kind
		msg  string // "" when accepted
	}{
		{"1e30 psia", Pressure, "from 0.145038 psia to 58015.1 psia"},
		{"1e-30 psia", Pressure, "from 0.145038 psia to 58015.1 psia"},
		{"0 psia", Pressure, "above zero; want a pressure from 0.145038 psia to 58015.1 psia"},
		{"-14.69 psig", Pressure, "out of range; want a pressure from -14.5509 psig to 58000.4 psig"},
		{"5000 bara", Pressure, "from 0.01 bara to 4000 bara"},
		{"500 MPa", Pressure, "from 0.001 MPa to 400 MPa"},
		{"1e9 psig", Pressure, "from -14.5509 psig to 58000.4 psig"},
		{"1e9 degF", Temperature, "from -279.67 degF to 2240.33 degF"},
		{"1300 degC", Temperature, "from -173.15 degC to 1226.85 degC"},
		{"50 K", Temperature, "from 100 K to 1500 K"},
		{"-300 F", Temperature, "from -279.67 F to 2240.33 F"},
		{"400 MPa", Pressure, ""},
		{"1 kPa", Pressure, ""},
		{"58000 psia", Pressure, ""},
		{"100 K", Temperature, ""},
		{"1500 K", Temperature, ""},
		{"-250 degF", Temperature, ""},
		{"1e30 ft", Length, ""}, // no range for other kinds
	} {
		got, err := ParseState(c.in, c.kind, PaPerAtm)
		if c.msg == "" {
			want, werr := Parse(c.in, c.kind, PaPerAtm)
			if err != nil || werr != nil || got != want {
				t.Errorf("ParseState(%q) = %g, %v; want %g as Parse gives", c.in, got, err, want)
			}
			continue
		}
		if !errors.Is(err, ErrOutOfRange) || got != 0 || !strings.Contains(err.Error(), c.in) || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("ParseState(%q) = %g, %v; want ErrOutOfRange quoting the input and %q", c.in, got, err, c.msg)
		}
	}
	if _, err := ParseState("6200 psi", Pressure, PaPerAtm); !errors.Is(err, ErrAmbiguous) {
		t.Errorf("ParseState keeps the errors of Parse: %v", err)
	}
}

// Symbols lists every symbol of a kind that Lookup reads back as that kind,
// and no other: the pressure units are those of the package's definitions.
func TestSymbols(t *testing.T) {
	t.Parallel()
	got := strings.Join(Symbols(Pressure), " ")
	if want := "atm bara barg kPa MPa Pa psia psig"; got != want {
		t.Errorf("Symbols(Pressure) = %q, want %q", got, want)
	}
	for _, k := range []Kind{Temperature, Density, Viscosity, LiquidGasRatio} {
		syms := Symbols(k)
		if len(syms) == 0 {
			t.Errorf("Symbols(%v) is empty", k)
		}
		for _, s := range syms {
			if u, ok := Lookup(s); !ok || u.Kind != k {
				t.Errorf("Symbols(%v) lists %q, which Lookup gives as %v, %v", k, s, u.Kind, ok)
			}
		}
	}
}
