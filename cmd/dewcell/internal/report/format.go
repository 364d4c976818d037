package report

import (
	"math"
	"regexp"
	"strconv"
	"strings"

	"dewcell/cmd/dewcell/internal/units"
)

// A Format says how people read the numbers of a column: with fixed
// decimals, the same in every cell, chosen for engineering reading (a
// pressure to 1 psi or 0.1 bar, a Z-factor to 4 decimals), and volumes in
// the trade's multiples (MMscf or Bscf, STB, MSTB or MMSTB).
type Format struct {
	// Decimals is the number of decimals of ordinary values.
	Decimals int
	// MinDigits, when above zero, adds decimals, up to MaxDecimals, until
	// the column's largest magnitude shows that many significant digits
	// (a stock tank's 14.696 psia is "14.7", not "15"; in a column that
	// also holds 1050 psia it is "15", the column's decimals being one).
	MinDigits   int
	MaxDecimals int
	// Scaled shows the column in the multiple of its unit (Multiples) that
	// suits its largest magnitude, with Digits significant digits there
	// (four when Digits is 0).
	Scaled bool
	Digits int
	// Scientific is for solver diagnostics (residuals), which are not
	// ordinary magnitudes: three significant digits in e-notation.
	Scientific bool
}

// Fixed is a format of d decimals.
func Fixed(d int) Format { return Format{Decimals: d} }

// Formats of dimensionless numbers that FormatOf cannot tell apart.
var (
	// ZFactor is a compressibility factor: 4 decimals.
	ZFactor = Format{Decimals: 4}
	// MoleFraction is a composition as a fraction: 5 decimals.
	MoleFraction = Format{Decimals: 5}
	// MolePercent is a composition in percent: 3 decimals.
	MolePercent = Format{Decimals: 3}
	// Saturation is a fraction of the pore volume: 4 decimals.
	Saturation = Format{Decimals: 4}
	// Gravity is a specific gravity: 4 decimals.
	Gravity = Format{Decimals: 4}
	// Coefficient is a model constant (acentric factor, volume shift,
	// interaction coefficient, exponent): 4 decimals, more for small ones.
	Coefficient = Format{Decimals: 4, MinDigits: 2, MaxDecimals: 6}
	// Statistic is a test statistic or p-value: 3 decimals.
	Statistic = Format{Decimals: 3}
	// Diagnostic is a solver residual.
	Diagnostic = Format{Scientific: true}
)

// FormatOf is the format of a quantity held in u.
func FormatOf(u units.Unit) Format {
	if f, ok := unitFormats[u.Key]; ok {
		return f
	}
	switch u.Kind {
	case units.GasVolume, units.LiquidVolume, units.Volume:
		return Format{Scaled: true}
	case units.Temperature:
		return Format{Decimals: 1}
	}
	return Format{Decimals: 4, MinDigits: 3, MaxDecimals: 6}
}

// unitFormats by unit key. Pressures to 1 psi or 0.1 bar, with more decimals
// for the small pressures of a stock tank (14.7 psia).
var unitFormats = map[string]Format{
	"psia": {Decimals: 0, MinDigits: 3, MaxDecimals: 3},
	"psig": {Decimals: 0, MinDigits: 3, MaxDecimals: 3},
	"bara": {Decimals: 1, MinDigits: 3, MaxDecimals: 4},
	"barg": {Decimals: 1, MinDigits: 3, MaxDecimals: 4},
	"MPa":  {Decimals: 3, MinDigits: 3, MaxDecimals: 6},
	"kPa":  {Decimals: 1, MinDigits: 3, MaxDecimals: 4},
	"Pa":   {Decimals: 0, MinDigits: 3, MaxDecimals: 3},
	"atm":  {Decimals: 3},
	"pct":  {Decimals: 2, MinDigits: 2, MaxDecimals: 4},

	"ft": {Decimals: 1}, "m": {Decimals: 2},
	"acre": {Decimals: 0}, "ha": {Decimals: 1},
	"acre_ft": {Decimals: 0}, "ha_m": {Decimals: 0},
	"per_psi": {Scaled: true}, "per_bar": {Scaled: true},

	"lb_ft3": {Decimals: 2}, "kg_m3": {Decimals: 1},
	"g_mol":     {Decimals: 2},
	"ft3_lbmol": {Decimals: 4, MinDigits: 3, MaxDecimals: 6},
	"m3_kmol":   {Decimals: 4, MinDigits: 3, MaxDecimals: 6},

	"scf_stb": {Decimals: 0}, "sm3_sm3": {Decimals: 1},
	"mmscf_d": {Decimals: 2, MinDigits: 3, MaxDecimals: 3}, "1e6sm3_d": {Decimals: 3, MinDigits: 3, MaxDecimals: 4},
	"stb_d": {Decimals: 0, MinDigits: 2, MaxDecimals: 1}, "sm3_d": {Decimals: 1, MinDigits: 2, MaxDecimals: 2},
	"stb_mmscf": {Decimals: 1}, "sm3_1e6sm3": {Decimals: 1},
	"scf_lbmol": {Decimals: 2, MinDigits: 3, MaxDecimals: 4},
	"stb_lbmol": {Decimals: 4, MinDigits: 3, MaxDecimals: 7},
	"sm3_kmol":  {Decimals: 3, MinDigits: 3, MaxDecimals: 6},
	"cP":        {Decimals: 4, MinDigits: 3, MaxDecimals: 6},

	"mscf_per_acre_ft": {Decimals: 1}, "stb_per_acre_ft": {Decimals: 1},
	"sm3_per_ha_m": {Decimals: 0},
}

// A Shown is how one column, or one summary field, is written for people:
// in Unit (the column's unit or a multiple of it), each value multiplied by
// Factor, with Decimals decimals.
type Shown struct {
	Unit     units.Unit
	Symbol   string // the unit as people read it ("10^6 sm3" for 1e6 sm3)
	Factor   float64
	Decimals int
	sci      bool
	group    bool // thousands separators: the column reaches five digits
}

// ShowColumn decides how the column c with the cells values is written.
func ShowColumn(c Column, values []any) Shown {
	f := c.NumberFormat()
	s := Shown{Unit: c.Unit, Factor: 1, Decimals: f.Decimals, sci: f.Scientific}
	hi := 0.0
	for _, v := range values {
		x, ok := v.(float64)
		if !ok || math.IsNaN(x) || math.IsInf(x, 0) {
			continue
		}
		hi = math.Max(hi, math.Abs(x))
	}
	if f.Scaled {
		m, factor := multiple(c.Unit, hi)
		s.Unit, s.Factor = m, factor
		hi *= factor
		digits := f.Digits
		if digits == 0 {
			digits = 4
		}
		s.Decimals = 0 // nothing but zeros
		if hi > 0 {
			s.Decimals = clamp(digits-1-int(math.Floor(math.Log10(hi))), 0, digits-1)
		}
	}
	if f.MinDigits > 0 && hi > 0 {
		need := f.MinDigits - 1 - int(math.Floor(math.Log10(hi)))
		s.Decimals = clamp(need, f.Decimals, f.MaxDecimals)
	}
	s.group = hi >= 9999.5 // hi is in the multiple shown
	s.Symbol = displaySymbol(s.Unit.Symbol)
	if c.Symbol != "" {
		s.Symbol = c.Symbol
	}
	return s
}

// ShowField decides how the field f is written.
func ShowField(f Field) Shown { return ShowColumn(f.Column, []any{f.Value}) }

// Text writes a cell for people: numbers in s, true as "yes", a missing
// value as "-".
func (s Shown) Text(v any) string {
	switch x := v.(type) {
	case nil:
		return "-"
	case bool:
		if x {
			return "yes"
		}
		return "no"
	case string:
		return x
	case int:
		if x <= -10000 || x >= 10000 {
			return group(strconv.Itoa(x))
		}
		return strconv.Itoa(x)
	case float64:
		if math.IsNaN(x) {
			return "-"
		}
		if math.IsInf(x, 0) {
			if x > 0 {
				return "infinite"
			}
			return "-infinite"
		}
		if s.sci {
			return strconv.FormatFloat(x, 'e', 2, 64)
		}
		f := s.Factor
		if f == 0 {
			f = 1
		}
		t := strconv.FormatFloat(x*f, 'f', s.Decimals, 64)
		if strings.Trim(t, "-0.") == "" {
			t = strings.TrimPrefix(t, "-") // no "-0.00"
		}
		if s.group {
			return group(t)
		}
		return t
	}
	return "?"
}

// Value is the number v shown in s, unrounded (for workbooks).
func (s Shown) Value(x float64) float64 {
	if s.Factor == 0 {
		return x
	}
	return x * s.Factor
}

// group puts thousands separators into a decimal number of four or more
// integer digits (12,345.6 and 4,579), for the columns that reach five
// digits; a column that does not writes 4579.
func group(t string) string {
	sign := ""
	if strings.HasPrefix(t, "-") {
		sign, t = "-", t[1:]
	}
	intPart, frac, hasFrac := strings.Cut(t, ".")
	if len(intPart) < 4 || strings.ContainsAny(intPart, "eE") {
		return sign + t
	}
	var b strings.Builder
	for i, c := range intPart {
		if i > 0 && (len(intPart)-i)%3 == 0 {
			b.WriteByte(',')
		}
		b.WriteRune(c)
	}
	if hasFrac {
		b.WriteByte('.')
		b.WriteString(frac)
	}
	return sign + b.String()
}

func clamp(x, lo, hi int) int {
	if hi < lo {
		hi = lo
	}
	return max(lo, min(x, hi))
}

// multiple is the multiple of u in which the magnitude hi (in u) reads
// best, from one up to a thousand, and the factor that converts a value in
// u to it. u outside a family of multiples stays as it is.
func multiple(u units.Unit, hi float64) (units.Unit, float64) {
	fam := units.Multiples(u)
	if len(fam) == 0 {
		return u, 1
	}
	base := u.ToSI(1)
	best, bestF := fam[0], base/fam[0].ToSI(1)
	for _, m := range fam[1:] {
		f := base / m.ToSI(1)
		if hi*f >= 1 {
			best, bestF = m, f
		}
	}
	if hi == 0 { // nothing to scale by: keep the unit the column is held in
		return u, 1
	}
	return best, bestF
}

// displaySymbol writes a power of ten as people read it: "10^6 sm3" for
// "1e6 sm3".
func displaySymbol(sym string) string { return powerOfTen.ReplaceAllString(sym, "${1}10^$2") }

// powerOfTen is a power of ten written 1eN at the start of a unit or after
// a slash.
var powerOfTen = regexp.MustCompile(`(^|/)1e(-?[0-9]+)`)

// Quantity writes one value in u as people read it in a sentence: the
// column's format, then the unit ("371 psia", "85.04 Bscf").
func Quantity(v float64, u units.Unit) string {
	s := ShowColumn(Column{Unit: u}, []any{v})
	if s.Symbol == "" {
		return s.Text(v)
	}
	return s.Text(v) + " " + s.Symbol
}

// Sig writes x with n significant digits in plain decimals, never in
// e-notation, for the numbers of a sentence (a slope, a share); zero is
// "0".
func Sig(x float64, n int) string {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return strconv.FormatFloat(x, 'f', 0, 64)
	}
	d := n - 1 - int(math.Floor(math.Log10(math.Abs(x))))
	return trimZeros(strconv.FormatFloat(x, 'f', max(0, d), 64))
}

// trimZeros drops the trailing zeros of a decimal fraction: "0.650" is
// "0.65", "4.0" is "4".
func trimZeros(t string) string {
	if !strings.Contains(t, ".") {
		return t
	}
	return strings.TrimSuffix(strings.TrimRight(t, "0"), ".")
}

// PValue writes a p-value for a sentence to three decimals: "p = 0.65", or
// "p < 0.001" below the smallest that they tell apart.
func PValue(p float64) string {
	if p < 0.001 {
		return "p < 0.001"
	}
	return "p = " + trimZeros(strconv.FormatFloat(p, 'f', 3, 64))
}
