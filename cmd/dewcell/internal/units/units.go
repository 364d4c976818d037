package units

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"dewcell/internal/phys"
)

// Exact conversion factors to SI, from the definitions of package phys
// (listed in the package comment). Go evaluates constant expressions exactly,
// so each is rounded to float64 once, where it is used.
const (
	MetrePerFoot  = phys.MetrePerFoot                   // international foot (1959)
	MetrePerInch  = phys.MetrePerInch                   // international inch (1959)
	KgPerLb       = phys.KgPerPound                     // avoirdupois pound (1959)
	StandardG     = phys.StandardGravity                // m/s², standard acceleration of gravity (3rd CGPM, 1901)
	PaPerPsi      = phys.PaPerPsi                       // 1 lbf/in² = 6894.757293168361336… Pa
	PaPerBar      = phys.PaPerBar                       // bar
	PaPerAtm      = phys.PaPerAtm                       // standard atmosphere (10th CGPM, 1954)
	KPerDegR      = phys.KelvinPerRankine               // one degree Rankine or Fahrenheit, in kelvin
	DegRAt0F      = phys.RankineAt0F                    // °R at 0 °F
	KAt0C         = phys.KelvinAt0C                     // K at 0 °C
	M2PerAcre     = 43560 * MetrePerFoot * MetrePerFoot // international acre, 4046.8564224 m²
	M2PerHectare  = 1e4                                 // hectare
	M3PerFt3      = phys.M3PerFt3                       // 0.028316846592 m³
	M3PerBbl      = phys.M3PerBbl                       // US oil barrel, 42 US gal of 231 in³: 0.158987294928 m³
	M3PerAcreFt   = M2PerAcre * MetrePerFoot            // acre-foot, 1233.48183754752 m³
	MolPerLbmol   = phys.MolPerLbmol                    // 453.59237 mol
	KgM3PerLbFt3  = phys.KgM3PerLbFt3                   // 16.018463373960139… kg/m³
	M3MolPerFt3Lb = phys.M3MolPerFt3Lb                  // 1 ft³/lbmol = 6.2427960576144…e-5 m³/mol
)

// A Kind is the physical dimension of a quantity.
type Kind int

// The kinds of quantity a study file, the command line or a report uses.
const (
	Dimensionless   Kind = iota
	Temperature          // K
	Pressure             // Pa
	Length               // m
	Area                 // m²
	Volume               // m³
	Compressibility      // 1/Pa
	Density              // kg/m³
	MolarMass            // kg/mol
	MolarVolume          // m³/mol
	GasVolume            // standard m³ of gas: ideal-gas volume at the study's standard conditions
	LiquidVolume         // m³ of stock-tank liquid (condensate, water) at standard conditions
	GasOilRatio          // standard m³ of gas per m³ of stock-tank liquid
	GasPerBulk           // standard m³ of gas per m³ of bulk rock (output only)
	LiquidPerBulk        // m³ of stock-tank liquid per m³ of bulk rock (output only)
	Viscosity            // Pa·s
	LiquidGasRatio       // m³ of stock-tank liquid per standard m³ of gas (a condensate-gas ratio)
	GasRate              // standard m³ of gas per second (shown per day)
	LiquidRate           // m³ of stock-tank liquid per second (shown per day)
	Energy               // J (output only)
	HeatingValue         // J per standard m³ of gas (output only)
)

var kindNames = [...]string{
	Dimensionless:   "dimensionless number",
	Temperature:     "temperature",
	Pressure:        "pressure",
	Length:          "length",
	Area:            "area",
	Volume:          "volume",
	Compressibility: "compressibility",
	Density:         "density",
	MolarMass:       "molar mass",
	MolarVolume:     "molar volume",
	GasVolume:       "standard gas volume",
	LiquidVolume:    "stock-tank liquid volume",
	GasOilRatio:     "gas-oil ratio",
	GasPerBulk:      "standard gas volume per bulk rock volume",
	LiquidPerBulk:   "stock-tank liquid volume per bulk rock volume",
	Viscosity:       "viscosity",
	LiquidGasRatio:  "condensate-gas ratio",
	GasRate:         "gas rate",
	LiquidRate:      "liquid rate",
	Energy:          "energy",
	HeatingValue:    "heating value",
}

// kindExamples show a user what to write for each kind.
var kindExamples = [...]string{
	Dimensionless:   `a bare number`,
	Temperature:     `"245 degF", "118 degC", "390 K" or "705 degR" (also °F, F, °C, C, °R, R)`,
	Pressure:        `"6200 psia", "1200 psig", "427.5 bara", "10 barg", "42.75 MPa", "101.325 kPa", "1e5 Pa" or "1 atm"`,
	Length:          `"85 ft", "26 m", "2600 cm" or "1.2 km"`,
	Area:            `"2400 acre", "970 ha", "9.7 km2", "1.05e8 ft2" or "9.7e6 m2"`,
	Volume:          `"1.5e9 bbl", "1500 MMbbl", "2.4e8 m3", "8.4e9 ft3" or "1.9e5 acre-ft"`,
	Compressibility: `"4e-6 1/psi", "3e-5 1/bar", "5e-4 1/MPa" or "6e-10 1/Pa"`,
	Density:         `"45 lb/ft3", "720 kg/m3" or "0.72 g/cm3"`,
	MolarMass:       `"143 g/mol", "143 kg/kmol", "143 lb/lbmol" or "0.143 kg/mol"`,
	MolarVolume:     `"0.0986 m3/kmol", "98.6 cm3/mol", "1.58 ft3/lbmol" or "9.86e-5 m3/mol"`,
	GasVolume:       `"12.4 Bscf", "850 MMscf", "3.2e6 Mscf", "2.6e9 scf", "350 1e6 sm3" or "7.4e7 sm3"`,
	LiquidVolume:    `"1.85 MMSTB", "420 MSTB", "2.9e5 STB", "1200 bbl", "4.6e4 sm3" or "46 1e3 sm3"`,
	GasOilRatio:     `"6500 scf/STB", "6.5 Mscf/STB" or "1160 sm3/sm3"`,
	GasPerBulk:      `"1300 Mscf/acre-ft" (output only)`,
	LiquidPerBulk:   `"160 STB/acre-ft" (output only)`,
	Viscosity:       `"0.0285 cP", "0.0285 mPa.s", "28.5 uPa.s" or "2.85e-5 Pa.s"`,
	LiquidGasRatio:  `"95 STB/MMscf", "0.095 STB/Mscf" or "534 sm3/1e6sm3"`,
	GasRate:         `"45 MMscf/d", "9000 Mscf/d", "1.3 1e6 sm3/d" or "1.3e6 sm3/d"`,
	LiquidRate:      `"4500 STB/d", "4500 bbl/d" or "715 sm3/d"`,
	Energy:          `"1.2e6 MMBtu" or "1.27e6 GJ" (output only)`,
	HeatingValue:    `"1050 Btu/scf" or "39.1 MJ/sm3" (output only)`,
}

func (k Kind) String() string {
	if k >= 0 && int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// Examples shows how values of kind k are written, for error messages.
func (k Kind) Examples() string {
	if k >= 0 && int(k) < len(kindExamples) {
		return kindExamples[k]
	}
	return ""
}

// A Unit converts values of one kind between itself and SI:
//
//	SI = (v + zero) × scale,   v = SI × inv − zero
//
// with inv = 1/scale, each rounded once from its exact value.
// zero is non-zero only for the temperature scales with an offset origin
// (degC, degF). The zero Unit is a dimensionless number with no symbol.
type Unit struct {
	Kind   Kind
	Symbol string // as written in a study file or a table header: "psia", "degF", "lb/ft3"
	Key    string // suffix of JSON and CSV keys: "psia", "degF", "lb_ft3"; empty when dimensionless
	scale  float64
	inv    float64
	zero   float64
	gauge  bool // a gauge pressure: SI adds the atmospheric pressure
}

// ToSI converts v in u to SI. For a gauge pressure unit it gives the
// difference from the atmospheric pressure; Parse adds that.
//
// Where the scale or its inverse is a whole number (1e5 Pa per bar, 1000 g
// per kg), the conversion divides or multiplies by that exact number, so
// that "4.6 MPa" comes out as 46 bara and not 46.00000000000001.
func (u Unit) ToSI(v float64) float64 {
	switch {
	case u.scale == 0: // the zero Unit
		return v
	case whole(u.inv) && !whole(u.scale):
		return (v + u.zero) / u.inv
	}
	return (v + u.zero) * u.scale
}

// FromSI converts an SI value to u.
func (u Unit) FromSI(si float64) float64 {
	switch {
	case u.scale == 0:
		return si
	case whole(u.scale) && !whole(u.inv):
		return si/u.scale - u.zero
	}
	return si*u.inv - u.zero
}

func whole(x float64) bool { return x == math.Trunc(x) }

// Gauge reports whether u is a gauge pressure unit (psig, barg).
func (u Unit) Gauge() bool { return u.gauge }

func (u Unit) String() string { return u.Symbol }

// Units accepted in input, by symbol. Symbols are case-sensitive: "mPa" is not "MPa".
var table = map[string]Unit{}

// def defines a unit under one or more symbols; inv is 1/scale, given
// separately so that both are rounded once from exact constants.
func def(k Kind, key string, scale, inv, zero float64, symbols ...string) Unit {
	u := Unit{Kind: k, Symbol: symbols[0], Key: key, scale: scale, inv: inv, zero: zero}
	for _, s := range symbols {
		v := u
		v.Symbol = s
		table[s] = v
	}
	return u
}

func defGauge(key string, scale, inv float64, symbols ...string) Unit {
	u := def(Pressure, key, scale, inv, 0, symbols...)
	u.gauge = true
	for _, s := range symbols {
		v := table[s]
		v.gauge = true
		table[s] = v
	}
	return u
}

// Units that the output systems use, and Percent for composition columns.
var (
	// The temperature scales accept their usual spellings: degF, °F or F;
	// degC, °C or C; degR, °R or R; K. Output uses the first.
	Kelvin    = def(Temperature, "K", 1, 1, 0, "K")
	DegC      = def(Temperature, "degC", 1, 1, KAt0C, "degC", "°C", "C")
	DegF      = def(Temperature, "degF", KPerDegR, 1/KPerDegR, DegRAt0F, "degF", "°F", "F")
	DegR      = def(Temperature, "degR", KPerDegR, 1/KPerDegR, 0, "degR", "°R", "R")
	Pascal    = def(Pressure, "Pa", 1, 1, 0, "Pa")
	KPa       = def(Pressure, "kPa", 1e3, 1/1e3, 0, "kPa")
	MPa       = def(Pressure, "MPa", 1e6, 1/1e6, 0, "MPa")
	Bara      = def(Pressure, "bara", PaPerBar, 1/PaPerBar, 0, "bara")
	Psia      = def(Pressure, "psia", PaPerPsi, 1/PaPerPsi, 0, "psia")
	Atm       = def(Pressure, "atm", PaPerAtm, 1/PaPerAtm, 0, "atm")
	Barg      = defGauge("barg", PaPerBar, 1/PaPerBar, "barg")
	Psig      = defGauge("psig", PaPerPsi, 1/PaPerPsi, "psig")
	Metre     = def(Length, "m", 1, 1, 0, "m")
	Foot      = def(Length, "ft", MetrePerFoot, 1/MetrePerFoot, 0, "ft")
	Acre      = def(Area, "acre", M2PerAcre, 1/M2PerAcre, 0, "acre")
	Hectare   = def(Area, "ha", M2PerHectare, 1/M2PerHectare, 0, "ha")
	CuMetre   = def(Volume, "m3", 1, 1, 0, "m3", "m³")
	Barrel    = def(Volume, "bbl", M3PerBbl, 1/M3PerBbl, 0, "bbl")
	PerPsi    = def(Compressibility, "per_psi", 1/PaPerPsi, PaPerPsi, 0, "1/psi", "psi-1")
	PerBar    = def(Compressibility, "per_bar", 1/PaPerBar, PaPerBar, 0, "1/bar", "bar-1")
	KgPerM3   = def(Density, "kg_m3", 1, 1, 0, "kg/m3", "kg/m³")
	LbPerFt3  = def(Density, "lb_ft3", KgM3PerLbFt3, 1/KgM3PerLbFt3, 0, "lb/ft3", "lb/ft³")
	GPerMol   = def(MolarMass, "g_mol", 1e-3, 1/1e-3, 0, "g/mol")
	M3PerKmol = def(MolarVolume, "m3_kmol", 1e-3, 1/1e-3, 0, "m3/kmol")
	Ft3PerLb  = def(MolarVolume, "ft3_lbmol", M3MolPerFt3Lb, 1/M3MolPerFt3Lb, 0, "ft3/lbmol")
	// Centipoise is the viscosity unit of laboratory reports, the same as mPa·s.
	Centipoise = def(Viscosity, "cP", 1e-3, 1/1e-3, 0, "cP", "mPa.s", "mPa·s")

	// Percent is a dimensionless fraction shown in percent (mole %, saturation %).
	Percent = Unit{Kind: Dimensionless, Symbol: "%", Key: "pct", scale: 0.01, inv: 100}
	// Fraction is a dimensionless number shown as it is (mole fraction, Z-factor).
	Fraction = Unit{Kind: Dimensionless}
)

func init() {
	// Input-only units: accepted in study files and flags, not used for output.
	def(Length, "cm", 1e-2, 1/1e-2, 0, "cm")
	def(Length, "mm", 1e-3, 1/1e-3, 0, "mm")
	def(Length, "km", 1e3, 1/1e3, 0, "km")
	def(Length, "in", MetrePerInch, 1/MetrePerInch, 0, "in")
	def(Area, "m2", 1, 1, 0, "m2", "m²")
	def(Area, "km2", 1e6, 1/1e6, 0, "km2", "km²")
	def(Area, "ft2", MetrePerFoot*MetrePerFoot, 1/(MetrePerFoot*MetrePerFoot), 0, "ft2", "ft²")
	def(Volume, "ft3", M3PerFt3, 1/M3PerFt3, 0, "ft3", "ft³")
	def(Volume, "Mbbl", 1e3*M3PerBbl, 1/(1e3*M3PerBbl), 0, "Mbbl")
	def(Volume, "MMbbl", 1e6*M3PerBbl, 1/(1e6*M3PerBbl), 0, "MMbbl")
	def(Compressibility, "per_Pa", 1, 1, 0, "1/Pa", "Pa-1")
	def(Compressibility, "per_kPa", 1e-3, 1/1e-3, 0, "1/kPa", "kPa-1")
	def(Compressibility, "per_MPa", 1e-6, 1/1e-6, 0, "1/MPa", "MPa-1")
	def(Compressibility, "per_atm", 1.0/PaPerAtm, PaPerAtm, 0, "1/atm", "atm-1")
	def(Density, "g_cm3", 1e3, 1/1e3, 0, "g/cm3", "g/cm³")
	def(MolarMass, "kg_mol", 1, 1, 0, "kg/mol")
	def(MolarMass, "kg_kmol", 1e-3, 1/1e-3, 0, "kg/kmol")
	def(MolarMass, "lb_lbmol", 1e-3, 1/1e-3, 0, "lb/lbmol")
	def(MolarVolume, "m3_mol", 1, 1, 0, "m3/mol")
	def(MolarVolume, "cm3_mol", 1e-6, 1/1e-6, 0, "cm3/mol")
	def(MolarVolume, "L_mol", 1e-3, 1/1e-3, 0, "L/mol")
	// Viscosities as laboratory reports give them: 1 cP = 1 mPa·s = 1e-3 Pa·s
	// (NIST SP 811 (2008), B.9: centipoise 1.0 E-03 Pa·s, exact). The micro
	// prefix is written u, µ (the micro sign) or μ (the Greek letter).
	def(Viscosity, "Pa_s", 1, 1, 0, "Pa.s", "Pa·s")
	def(Viscosity, "uPa_s", 1e-6, 1/1e-6, 0, "uPa.s", "uPa·s", "µPa.s", "µPa·s", "μPa.s", "μPa·s")
}

// ambiguous lists symbols we refuse because they do not say whether the
// pressure is absolute or gauge.
var ambiguous = map[string]string{
	"psi": `write "psia" for an absolute pressure or "psig" for a gauge one`,
	"bar": `write "bara" for an absolute pressure or "barg" for a gauge one`,
}

// Lookup returns the input unit with the given symbol.
func Lookup(symbol string) (Unit, bool) {
	u, ok := table[symbol]
	return u, ok
}

// Symbols lists the symbols Lookup accepts for units of kind k, in
// alphabetical order regardless of case, for messages that say what a
// header or a flag may name.
func Symbols(k Kind) []string {
	var s []string
	for sym, u := range table {
		if u.Kind == k {
			s = append(s, sym)
		}
	}
	sort.Slice(s, func(i, j int) bool {
		if a, b := strings.ToLower(s[i]), strings.ToLower(s[j]); a != b {
			return a < b
		}
		return s[i] < s[j]
	})
	return s
}

// Errors wrapped in *Error. Use errors.Is.
var (
	ErrSyntax      = errors.New("not a number followed by a unit")
	ErrNoUnit      = errors.New("missing unit")
	ErrUnknownUnit = errors.New("unknown unit")
	ErrAmbiguous   = errors.New("ambiguous unit")
	ErrWrongKind   = errors.New("wrong kind of unit")
	ErrNotFinite   = errors.New("not a finite number")
	ErrNegative    = errors.New("below zero")
	ErrNoAtm       = errors.New("gauge pressure without an atmospheric pressure")
	ErrOutOfRange  = errors.New("outside the accepted range")
)

// The range of the pressures and temperatures of a fluid's state (the
// reservoir, a separator stage, the standard conditions, a flash) that
// ParseState accepts.
//
// The pressures are those the equation-of-state solvers search: saturation
// points are sought from 400 MPa (58,015 psia) down to 1 kPa (0.145 psia),
// and no reservoir or surface state lies outside. The temperatures reach
// well beyond any reservoir or process plant, from 100 K (−279.67 °F, below
// the coldest cryogenic gas plant) to 1500 K (2240.33 °F), where the
// component properties and correlations long stop meaning anything (common
// practice, no published source).
const (
	MinStatePressure    = 1e3   // Pa
	MaxStatePressure    = 400e6 // Pa
	MinStateTemperature = 100.0 // K
	MaxStateTemperature = 1500  // K
)

// Error describes why a string could not be read as a quantity, in the manner
// of strconv.NumError.
type Error struct {
	Input string // the string as given
	Want  Kind   // the kind of quantity wanted
	Err   error  // one of the Err… values above
	msg   string // the explanation shown to the user
}

func (e *Error) Error() string { return fmt.Sprintf("%q: %s", e.Input, e.msg) }

// Unwrap lets errors.Is(err, ErrUnknownUnit) work.
func (e *Error) Unwrap() error { return e.Err }

// quantity splits a number from its unit. A unit is one word, or a power of
// ten and a word ("1e6 sm3", "1e3 sm3"), as volumes are often written.
var quantity = regexp.MustCompile(`^\s*([+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?)\s*((?:1e[0-9]+\s+)?\S*)\s*$`)

// Parse reads s, a number followed by a unit ("245 degF", "6200 psia",
// "4e-6 1/psi"; the space may be left out), as a quantity of kind want and
// returns it in SI. atm is the atmospheric pressure in Pa used for gauge
// pressures; atm <= 0 makes a gauge unit an error.
//
// Special cases are:
//
//	a bare number, or a unit of another kind      ErrNoUnit, ErrWrongKind
//	"psi" or "bar" alone                          ErrAmbiguous (absolute or gauge?)
//	NaN, Inf, or overflow on conversion           ErrNotFinite
//	temperature at or below 0 K                   ErrNegative
//	any other quantity below zero (after adding   ErrNegative
//	atm to a gauge pressure)
//
// On error the value returned is 0.
func Parse(s string, want Kind, atm float64) (float64, error) {
	u, v, err := parse(s, want)
	if err != nil {
		return 0, err
	}
	fail := func(e error, format string, args ...any) (float64, error) {
		return 0, &Error{Input: s, Want: want, Err: e, msg: fmt.Sprintf(format, args...)}
	}
	si := u.ToSI(v)
	if u.gauge {
		if !(atm > 0) || math.IsInf(atm, 0) {
			return fail(ErrNoAtm, "a gauge pressure needs the atmospheric pressure, which is not known here; give an absolute pressure")
		}
		si += atm
	}
	if math.IsInf(si, 0) || math.IsNaN(si) {
		return fail(ErrNotFinite, "too large: %s is not a finite number", want)
	}
	switch {
	case want == Temperature && si <= 0:
		return fail(ErrNegative, "at or below absolute zero")
	case want == Pressure && si < 0:
		return fail(ErrNegative, "below zero absolute pressure")
	case si < 0:
		return fail(ErrNegative, "a %s cannot be negative", want)
	}
	return si, nil
}

// ParseState reads s as Parse does and, for a pressure or a temperature,
// checks that it lies within the range of a fluid's state
// (MinStatePressure to MaxStatePressure, MinStateTemperature to
// MaxStateTemperature), a value outside being ErrOutOfRange with the range
// given in the unit of s. Other kinds are read as Parse reads them.
func ParseState(s string, want Kind, atm float64) (float64, error) {
	si, err := Parse(s, want, atm)
	if err != nil {
		return 0, err
	}
	var lo, hi float64
	switch want {
	case Pressure:
		lo, hi = MinStatePressure, MaxStatePressure
	case Temperature:
		lo, hi = MinStateTemperature, MaxStateTemperature
	default:
		return si, nil
	}
	if si >= lo && si <= hi {
		return si, nil
	}
	u, _, _ := parse(s, want) // it parsed above
	in := func(x float64) string {
		if u.gauge {
			x -= atm
		}
		return strconv.FormatFloat(u.FromSI(x), 'g', 6, 64) + " " + u.Symbol
	}
	why := fmt.Sprintf("%g K to %g K", lo, hi)
	if want == Pressure {
		why = fmt.Sprintf("%g kPa to %g MPa, the pressures the equation-of-state solvers search", lo/1e3, hi/1e6)
	}
	what := "out of range"
	if want == Pressure && si <= 0 {
		what = "out of range: an absolute pressure must be above zero"
	}
	return 0, &Error{Input: s, Want: want, Err: ErrOutOfRange,
		msg: fmt.Sprintf("%s; want a %s from %s to %s (%s)", what, want, in(lo), in(hi), why)}
}

// parse splits s into a number and a unit of kind want.
func parse(s string, want Kind) (Unit, float64, error) {
	fail := func(e error, format string, args ...any) (Unit, float64, error) {
		return Unit{}, 0, &Error{Input: s, Want: want, Err: e, msg: fmt.Sprintf(format, args...)}
	}
	m := quantity.FindStringSubmatch(s)
	if m == nil {
		f := strings.Fields(s)
		if len(f) > 0 && isNonFinite(f[0]) {
			return fail(ErrNotFinite, "%s is not a finite number", f[0])
		}
		if len(f) == 0 {
			return fail(ErrSyntax, "empty; want a %s such as %s", want, want.Examples())
		}
		return fail(ErrSyntax, "want a number and a unit, such as %s", want.Examples())
	}
	num, sym := m[1], strings.Join(strings.Fields(m[2]), " ")
	if sym == "" {
		return fail(ErrNoUnit, "missing unit; want a %s such as %s", want, want.Examples())
	}
	if hint, ok := ambiguous[sym]; ok && want == Pressure {
		return fail(ErrAmbiguous, "%sa or %sg? %q does not say whether the pressure is absolute or gauge; %s", sym, sym, sym, hint)
	}
	u, ok := table[sym]
	if alt, isAlt := alias[want][sym]; isAlt {
		u, ok = alt, true
	}
	if !ok {
		if hint, ok := ambiguous[sym]; ok {
			return fail(ErrAmbiguous, "%q is ambiguous (%s), and a %s is wanted here, such as %s", sym, hint, want, want.Examples())
		}
		return fail(ErrUnknownUnit, "unknown unit %q%s; want a %s such as %s", sym, suggest(sym), want, want.Examples())
	}
	if u.Kind != want {
		return fail(ErrWrongKind, "%s is a unit of %s; want a %s such as %s", sym, u.Kind, want, want.Examples())
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return fail(ErrNotFinite, "%s is not a finite number", num)
	}
	return u, v, nil
}

func isNonFinite(t string) bool {
	t = strings.ToLower(strings.TrimLeft(t, "+-"))
	return strings.HasPrefix(t, "nan") || strings.HasPrefix(t, "inf")
}

// suggest names a known symbol that differs from sym only in case.
func suggest(sym string) string {
	var near []string
	for k := range table {
		if strings.EqualFold(k, sym) {
			near = append(near, strconv.Quote(k))
		}
	}
	if len(near) == 0 {
		return ""
	}
	sort.Strings(near)
	return fmt.Sprintf(" (did you mean %s? units are case-sensitive)", strings.Join(near, " or "))
}
