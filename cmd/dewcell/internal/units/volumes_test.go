package units

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// Surface volumes against their definitions: 1 ft3 = 0.028316846592 m3 and
// 1 bbl = 42 US gal = 9702 in3 = 0.158987294928 m3 (NIST SP 811 (2008), B.9,
// both exact), and the trade prefixes M = 1e3, MM = 1e6, B = 1e9 of field
// units.
var volumeTests = []struct {
	in   string
	kind Kind
	want float64 // SI
	tol  float64 // relative
	src  string
}{
	{"1 scf", GasVolume, 2.831685e-2, 1e-6, "NIST SP 811 B.9: cubic foot 2.831 685 E-02 m3 (7 digits)"},
	{"1 Mscf", GasVolume, 28.316846592, 1e-15, "1e3 ft3 (trade prefix M)"},
	{"12.4 Bscf", GasVolume, 12.4e9 * 0.028316846592, 1e-15, "1e9 ft3 (trade prefix B)"},
	{"850 MMscf", GasVolume, 850e6 * 0.028316846592, 1e-15, "1e6 ft3 (trade prefix MM)"},
	{"350 1e6 sm3", GasVolume, 350e6, 1e-15, "power of ten"},
	{"350  1e6   sm3", GasVolume, 350e6, 1e-15, "spaces are not significant"},
	{"350 1e6sm3", GasVolume, 350e6, 1e-15, "power of ten, no space"},
	{"7.4e7 sm3", GasVolume, 7.4e7, 1e-15, "SI"},
	{"1 STB", LiquidVolume, 1.589873e-1, 1e-6, "NIST SP 811 B.9: barrel (42 US gal) 1.589 873 E-01 m3 (7 digits)"},
	{"1.85 MMSTB", LiquidVolume, 1.85e6 * 0.158987294928, 1e-15, "1e6 bbl (trade prefix MM)"},
	{"420 MSTB", LiquidVolume, 420e3 * 0.158987294928, 1e-15, "1e3 bbl (trade prefix M)"},
	{"1200 bbl", LiquidVolume, 1200 * 0.158987294928, 1e-15, "a liquid volume in barrels"},
	{"2 MMbbl", LiquidVolume, 2e6 * 0.158987294928, 1e-15, "a liquid volume in barrels"},
	{"4.6e4 sm3", LiquidVolume, 4.6e4, 1e-15, "stock-tank m3"},
	{"46 1e3 sm3", LiquidVolume, 4.6e4, 1e-15, "power of ten"},
	{"30 m3", LiquidVolume, 30, 0, "SI"},
	{"1 scf/STB", GasOilRatio, 0.1781076, 1e-6, "SPE metric standard (1984): 1 ft3/bbl = 0.178 107 6 m3/m3 (7 digits), from memory; equals ft3/bbl by definition"},
	{"5.614583 scf/STB", GasOilRatio, 1, 1e-7, "1 bbl = 9702/1728 ft3 = 5.6145833 ft3 (definitions)"},
	{"6.5 Mscf/STB", GasOilRatio, 6500 * 0.028316846592 / 0.158987294928, 1e-15, "1e3 ft3/bbl"},
	{"1160 sm3/sm3", GasOilRatio, 1160, 0, "SI"},
	{"1 ha-m", Volume, 1e4, 0, "hectare-metre = 1e4 m2 x 1 m"},
	// Condensate-gas ratios: 1 bbl = 9702/1728 ft3 (definitions), so 1 STB/MMscf = 9702/1728 x 1e-6 m3/m3.
	{"1 STB/MMscf", LiquidGasRatio, 9702.0 / 1728 * 1e-6, 1e-15, "1 bbl = 9702 in3, 1 ft3 = 1728 in3 (definitions)"},
	{"95 bbl/MMscf", LiquidGasRatio, 95 * 9702.0 / 1728 * 1e-6, 1e-15, "1 bbl = 9702 in3, 1 ft3 = 1728 in3 (definitions)"},
	{"0.095 STB/Mscf", LiquidGasRatio, 95 * 9702.0 / 1728 * 1e-6, 1e-15, "1e3 ft3 (trade prefix M)"},
	{"534 sm3/1e6sm3", LiquidGasRatio, 534e-6, 1e-15, "power of ten"},
	{"1 acre-ft", Volume, 1233.48183754752, 1e-15, "43560 ft3 (definition)"},
}

func TestVolumes(t *testing.T) {
	t.Parallel()
	for _, tt := range volumeTests {
		got, err := Parse(tt.in, tt.kind, 0)
		if err != nil {
			t.Errorf("Parse(%q, %v): %v", tt.in, tt.kind, err)
			continue
		}
		if d := rel(got, tt.want); d > tt.tol {
			t.Errorf("Parse(%q, %v) = %.15g, want %.15g, rel. diff %.2g > %g (%s)", tt.in, tt.kind, got, tt.want, d, tt.tol, tt.src)
		}
	}
}

var volumeErrors = []struct {
	in   string
	kind Kind
	want error
	msg  string
}{
	{"12 scf", LiquidVolume, ErrWrongKind, "standard gas volume"},
	{"12 STB", GasVolume, ErrWrongKind, "stock-tank liquid volume"},
	{"12 STB", Volume, ErrWrongKind, "stock-tank liquid volume"},
	{"12 bbl", GasVolume, ErrWrongKind, "volume"},
	{"12 MMSCF", GasVolume, ErrUnknownUnit, `did you mean "MMscf"`},
	{"12 1e6 psia", Pressure, ErrUnknownUnit, `unknown unit "1e6 psia"`},
	{"12 1e6", GasVolume, ErrUnknownUnit, `unknown unit "1e6"`},
	{"12 1e6 sm3 x", GasVolume, ErrSyntax, "number and a unit"},
	{"6500", GasOilRatio, ErrNoUnit, "scf/STB"},
	{"-3 Bscf", GasVolume, ErrNegative, "negative"},
}

func TestVolumeErrors(t *testing.T) {
	t.Parallel()
	for _, tt := range volumeErrors {
		got, err := Parse(tt.in, tt.kind, 0)
		if !errors.Is(err, tt.want) || got != 0 {
			t.Errorf("Parse(%q, %v) = %g, %v; want 0 and error %v", tt.in, tt.kind, got, err, tt.want)
			continue
		}
		if msg := err.Error(); !strings.Contains(msg, tt.msg) {
			t.Errorf("Parse(%q, %v) error %q does not mention %q", tt.in, tt.kind, msg, tt.msg)
		}
	}
}

// The output units of surface volumes: keys as README.md documents them, and
// values that read back through Parse.
func TestVolumeOutputUnits(t *testing.T) {
	t.Parallel()
	want := []struct {
		sys  System
		kind Kind
		key  string
	}{
		{Field, GasVolume, "mmscf"}, {Field, LiquidVolume, "stb"}, {Field, GasOilRatio, "scf_stb"},
		{Field, GasPerBulk, "mscf_per_acre_ft"}, {Field, LiquidPerBulk, "stb_per_acre_ft"},
		{Metric, GasVolume, "1e6sm3"}, {Metric, LiquidVolume, "sm3"}, {Metric, GasOilRatio, "sm3_sm3"},
		{Metric, GasPerBulk, "sm3_per_ha_m"}, {Metric, LiquidPerBulk, "sm3_per_ha_m"},
	}
	for _, w := range want {
		u := w.sys.Unit(w.kind)
		if u.Key != w.key || u.Kind != w.kind {
			t.Errorf("%v.Unit(%v) = %q of kind %v, want key %q", w.sys, w.kind, u.Key, u.Kind, w.key)
		}
		if w.kind == GasPerBulk || w.kind == LiquidPerBulk {
			continue // output only
		}
		for _, v := range []float64{0.5, 7, 6200, 2.6e5} {
			si, err := Parse(fmt.Sprintf("%.17g %s", v, u.Symbol), w.kind, 0)
			if err != nil {
				t.Errorf("%v: %g %s does not read back: %v", w.sys, v, u.Symbol, err)
				continue
			}
			if back := u.FromSI(si); rel(back, v) > 4e-16 {
				t.Errorf("%v: %g %s -> SI -> %.17g", w.sys, v, u.Symbol, back)
			}
		}
	}
	if Field.Bulk().Key != "acre_ft" || Metric.Bulk().Key != "ha_m" {
		t.Errorf("bulk volume keys %q and %q, want acre_ft and ha_m", Field.Bulk().Key, Metric.Bulk().Key)
	}
}

// Per bulk volume: 1 Mscf of gas in an acre-foot of rock, and 1 sm3 in a
// hectare-metre, by the definitions of the units.
func TestPerBulk(t *testing.T) {
	t.Parallel()
	const acreFt = 43560.0 // ft3 in an acre-foot (definition)
	if got := MscfPerAcreFt.FromSI(1000 / acreFt); math.Abs(got-1) > 1e-15 {
		t.Errorf("1000 scf per 43560 ft3 = %.17g Mscf/acre-ft, want 1", got)
	}
	if got := STBPerAcreFt.FromSI(0.158987294928 / 1233.48183754752); math.Abs(got-1) > 1e-15 {
		t.Errorf("1 bbl per acre-ft = %.17g STB/acre-ft, want 1", got)
	}
	// 7758.37 bbl per acre-ft: trade fact (43560/5.614583 = 7758.367)
	if got := STBPerAcreFt.FromSI(1); math.Abs(got-7758.367) > 1e-3 {
		t.Errorf("an acre-ft holds %.7g bbl, want 7758.367", got)
	}
	if got := GasSm3PerHaM.FromSI(1e-4); math.Abs(got-1) > 1e-15 {
		t.Errorf("1 sm3 per 1e4 m3 = %.17g sm3/ha-m, want 1", got)
	}
}
