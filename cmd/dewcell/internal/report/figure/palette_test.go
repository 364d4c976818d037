package figure

import (
	"image/color"
	"math"
	"testing"
)

// Simulation matrices of Machado, G.M., Oliveira, M.M. and Fernandes,
// L.A.F. (2009), A physiologically-based model for simulation of color
// vision deficiency, IEEE Transactions on Visualization and Computer
// Graphics 15(6), 1291–1298: the matrices of severity 1.0 (dichromacy) of
// the authors' table, applied to linear sRGB. The same values are in the
// colour-science package's table of them.
var dichromacy = map[string][3][3]float64{
	"normal": {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}},
	"protanopia": {
		{0.152286, 1.052583, -0.204868},
		{0.114503, 0.786281, 0.099216},
		{-0.003882, -0.048116, 1.051998}},
	"deuteranopia": {
		{0.367322, 0.860646, -0.227968},
		{0.280085, 0.672501, 0.047413},
		{-0.011820, 0.042940, 0.968881}},
	"tritanopia": {
		{1.255528, -0.076749, -0.178779},
		{-0.078411, 0.930809, 0.147602},
		{0.004733, 0.691367, 0.303900}},
}

// linear is the sRGB transfer function undone (IEC 61966-2-1).
func linear(v uint8) float64 {
	c := float64(v) / 255
	if c <= 0.04045 {
		return c / 12.92
	}
	return math.Pow((c+0.055)/1.055, 2.4)
}

// lab is c seen through m, in CIELAB (CIE 15:2004) under D65, from the
// sRGB primaries' XYZ (IEC 61966-2-1).
func lab(c color.NRGBA, m [3][3]float64) [3]float64 {
	v := [3]float64{linear(c.R), linear(c.G), linear(c.B)}
	var s [3]float64
	for i := range 3 {
		for j := range 3 {
			s[i] += m[i][j] * v[j]
		}
		s[i] = math.Max(0, math.Min(1, s[i]))
	}
	x := (0.4124*s[0] + 0.3576*s[1] + 0.1805*s[2]) / 0.95047
	y := 0.2126*s[0] + 0.7152*s[1] + 0.0722*s[2]
	z := (0.0193*s[0] + 0.1192*s[1] + 0.9505*s[2]) / 1.08883
	f := func(t float64) float64 {
		if t > 216.0/24389 {
			return math.Cbrt(t)
		}
		return (24389.0/27*t + 16) / 116
	}
	return [3]float64{116*f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))}
}

// TestPaletteDistinct checks that the palette has twelve colours, every
// pair at least 10 CIELAB units apart (ΔE*ab, CIE 1976) under normal vision
// and under each simulated dichromacy, and the first eight at least 15.
// These are our design targets, a few times the just-noticeable difference
// of about 2.3 (from memory): common practice, no published source for
// lines on a chart.
func TestPaletteDistinct(t *testing.T) {
	if len(palette) < 12 {
		t.Fatalf("%d colours, want 12", len(palette))
	}
	for vision, m := range dichromacy {
		for i := range palette {
			for j := range i {
				a, b := lab(palette[i], m), lab(palette[j], m)
				d := math.Sqrt((a[0]-b[0])*(a[0]-b[0]) + (a[1]-b[1])*(a[1]-b[1]) + (a[2]-b[2])*(a[2]-b[2]))
				want := 10.0
				if i < 8 {
					want = 15
				}
				if d < want {
					t.Errorf("%s: colours %d %v and %d %v are %.1f apart, want at least %g", vision, i, palette[i], j, palette[j], d, want)
				}
			}
		}
	}
}

// TestPaletteOnWhite checks each colour's contrast with the white
// background by WCAG 2.1's relative luminance and contrast ratio (W3C,
// 2018): at least 2:1. WCAG asks 3:1 of graphics that carry meaning; the
// Okabe–Ito orange (2.2) and sky blue (2.3) fall short of it, the others
// meet it.
func TestPaletteOnWhite(t *testing.T) {
	for i, c := range palette {
		l := 0.2126*linear(c.R) + 0.7152*linear(c.G) + 0.0722*linear(c.B)
		if ratio := 1.05 / (l + 0.05); ratio < 2 {
			t.Errorf("colour %d %v: contrast %.2f with white, want at least 2", i, c, ratio)
		}
	}
}
