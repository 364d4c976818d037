package eos

import (
	"errors"
	"math"
	"testing"
)

// Fraction A of Ahmed, T., Equations of State and PVT Analysis (Gulf
// Professional), examples 2.1–2.3, as encoded in the doc-tests of the
// general process simulator pychemqt (lib/petro.py) and listed as check
// value C6 in METHODS.md: Tb = 198 °F, SG = 0.7365.
const (
	fracATb = 198 + 459.67 // °R
	fracASG = 0.7365
)

// correlationTests hold published results; tol is half a unit in the last
// printed digit.
var correlationTests = []struct {
	name      string
	got       func() float64
	want, tol float64
	src       string
}{
	{"Kesler–Lee Tc °R", func() float64 { tc, _ := keslerLeeTcPc(fracATb, fracASG); return tc }, 981, 0.5,
		"Ahmed ex. 2.1 via pychemqt doc-test (C6)"},
	{"Kesler–Lee Pc psia", func() float64 { _, pc := keslerLeeTcPc(fracATb, fracASG); return pc }, 470, 0.5,
		"Ahmed ex. 2.1 via pychemqt doc-test (C6)"},
	{"Kesler–Lee M", func() float64 { return keslerLeeM(fracATb, fracASG) }, 98.6, 0.05,
		"Ahmed ex. 2.1 via pychemqt doc-test (C6)"},
	{"Kesler–Lee omega", func() float64 {
		tc, pc := keslerLeeTcPc(fracATb, fracASG)
		return keslerLeeOmega(fracATb, tc, pc, fracASG)
	}, 0.306, 0.0005, "Ahmed ex. 2.1 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1980 M", func() float64 { m, _, _, _ := riaziDaubert1980(fracATb, fracASG); return m }, 96, 0.5,
		"Ahmed ex. 2.2 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1980 Tc °R", func() float64 { _, tc, _, _ := riaziDaubert1980(fracATb, fracASG); return tc }, 990, 0.5,
		"Ahmed ex. 2.2 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1980 Pc psia", func() float64 { _, _, pc, _ := riaziDaubert1980(fracATb, fracASG); return pc }, 467, 0.5,
		"Ahmed ex. 2.2 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1980 Vc ft³/lbm", func() float64 { _, _, _, vc := riaziDaubert1980(fracATb, fracASG); return vc }, 0.0623, 0.00005,
		"Ahmed ex. 2.2 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1987 M", func() float64 { m, _, _, _ := riaziDaubert1987(fracATb, fracASG); return m }, 97, 0.5,
		"Ahmed ex. 2.3 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1987 Tc °R", func() float64 { _, tc, _, _ := riaziDaubert1987(fracATb, fracASG); return tc }, 986, 0.5,
		"Ahmed ex. 2.3 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1987 Pc psia", func() float64 { _, _, pc, _ := riaziDaubert1987(fracATb, fracASG); return pc }, 466, 0.5,
		"Ahmed ex. 2.3 via pychemqt doc-test (C6)"},
	{"Riazi–Daubert 1987 Vc ft³/lbm", func() float64 { _, _, _, vc := riaziDaubert1987(fracATb, fracASG); return vc }, 0.0626, 0.00005,
		"Ahmed ex. 2.3 via pychemqt doc-test (C6)"},
	{"Edmister omega (RD87 Tc, Pc)", func() float64 {
		_, tc, pc, _ := riaziDaubert1987(fracATb, fracASG)
		return edmisterOmega(fracATb, tc, pc*paPerPsia/paPerAtm)
	}, 0.287, 0.0005, "Ahmed ex. 2.3 via pychemqt doc-test (C6)"},
	// Twu (1984): Tb = 510 K, SG = 1.097, a general-purpose library's doc-test (C6).
	{"Twu Tc °R", func() float64 { _, tc, _, _, _ := twu(510*1.8, 1.097); return tc }, 1380.3, 0.05,
		"library doc-test, METHODS.md C6"},
	{"Twu Pc psia", func() float64 { _, _, pc, _, _ := twu(510*1.8, 1.097); return pc }, 556.8, 0.05,
		"library doc-test, METHODS.md C6"},
	{"Twu M", func() float64 { m, _, _, _, _ := twu(510*1.8, 1.097); return m }, 130.4, 0.05,
		"library doc-test, METHODS.md C6"},
	// Twu's n-alkane reference must return n-decane's own molar mass:
	// C10H22 = 142.28 g/mol; Tb = 447.30 K, SG = 0.7342 (METHODS.md C6).
	{"Twu M of n-decane", func() float64 { m, _, _, _, _ := twu(447.30*1.8, 0.7342); return m }, 142.28, 0.05,
		"n-decane, METHODS.md C6"},
	// n-decane Tc = 617.7 K (Poling et al. 2001 App. A, from memory); Twu's
	// fit gives 619.1 K (METHODS.md C6), so 0.5 % covers the correlation's error.
	{"Twu Tc of n-decane K", func() float64 { _, tc, _, _, _ := twu(447.30*1.8, 0.7342); return tc / 1.8 }, 617.7, 617.7 * 0.005,
		"n-decane Tc, from memory"},
	// Lee–Kesler (1975) omega of isopropylbenzene, the worked example of Reid,
	// Prausnitz & Poling (1987), Properties of Gases and Liquids 4th ed.,
	// reproduced by a general-purpose library's doc-test (METHODS.md C6).
	{"Lee–Kesler omega isopropylbenzene", func() float64 { return leeKeslerOmega(425.6, 631.1, 32.1e5/paPerAtm) }, 0.32544, 0.000005,
		"Reid et al. (1987) example via library doc-test (C6)"},
	// Søreide (1989) Tb: METHODS.md C6 values computed by an independent
	// script from the published formula (consistency, not a published value).
	{"Søreide Tb (96, 0.727) °R", func() float64 { return soreideTb(96, 0.727) }, 665.7, 0.05, "METHODS.md C6 (script)"},
	{"Søreide Tb (134, 0.782) °R", func() float64 { return soreideTb(134, 0.782) }, 787.8, 0.05, "METHODS.md C6 (script)"},
	{"Søreide Tb (206, 0.836) °R", func() float64 { return soreideTb(206, 0.836) }, 971.4, 0.05, "METHODS.md C6 (script)"},
	{"Søreide Tb (300, 0.876) °R", func() float64 { return soreideTb(300, 0.876) }, 1145.1, 0.05, "METHODS.md C6 (script)"},
	// Whitson (1983) Kw from (M, SG): METHODS.md C6 script values.
	{"Whitson Kw C7 (96, 0.727)", func() float64 { return whitsonKw(96, 0.727) }, 11.93, 0.005, "METHODS.md C6 (script)"},
	{"Whitson Kw C10 (134, 0.782)", func() float64 { return whitsonKw(134, 0.782) }, 11.80, 0.005, "METHODS.md C6 (script)"},
}

func TestCorrelationCheckValues(t *testing.T) {
	t.Parallel()
	for _, tt := range correlationTests {
		if got := tt.got(); !(math.Abs(got-tt.want) <= tt.tol) {
			t.Errorf("%s = %.6g, want %.6g ± %g (%s)", tt.name, got, tt.want, tt.tol, tt.src)
		}
	}
}

// katzFiroozabadi is the generalized SCN table of Katz, D.L. and Firoozabadi,
// A. (1978), JPT 30(11), 1649–1655, as extended by Whitson (1983), SPEJ 23(4),
// from METHODS.md 2.2: carbon number, M g/mol, SG 60/60 °F, Tb °R. M and SG
// were matched element by element with a public copy; Tb is marked
// unverified there.
var katzFiroozabadi = []struct {
	n         int
	m, sg, tb float64
}{
	{6, 84, 0.690, 607}, {7, 96, 0.727, 658}, {8, 107, 0.749, 702}, {9, 121, 0.768, 748},
	{10, 134, 0.782, 791}, {11, 147, 0.793, 829}, {12, 161, 0.804, 867}, {13, 175, 0.815, 901},
	{14, 190, 0.826, 936}, {15, 206, 0.836, 971}, {16, 222, 0.843, 1002}, {17, 237, 0.851, 1032},
	{18, 251, 0.856, 1055}, {19, 263, 0.861, 1077}, {20, 275, 0.866, 1101}, {21, 291, 0.871, 1124},
	{22, 300, 0.876, 1146}, {23, 312, 0.881, 1167}, {24, 324, 0.885, 1187}, {25, 337, 0.888, 1207},
	{26, 349, 0.892, 1226}, {27, 360, 0.896, 1244}, {28, 372, 0.899, 1262}, {29, 382, 0.902, 1277},
	{30, 394, 0.905, 1294}, {31, 404, 0.909, 1310}, {32, 415, 0.912, 1326}, {33, 426, 0.915, 1341},
	{34, 437, 0.917, 1355}, {35, 445, 0.920, 1368}, {36, 456, 0.922, 1382}, {37, 464, 0.925, 1394},
	{38, 475, 0.927, 1407}, {39, 484, 0.929, 1419}, {40, 495, 0.931, 1432}, {41, 502, 0.933, 1442},
	{42, 512, 0.934, 1453}, {43, 521, 0.936, 1464}, {44, 531, 0.938, 1477}, {45, 539, 0.940, 1487},
}

// TestSoreideAgainstKatzFiroozabadi compares Søreide's Tb(M, SG) with the
// tabulated Tb of the generalized SCN groups. Søreide fitted C7+ fractions;
// for C7–C29 the two agree within 1.5 % (about 15 °R, the width of a
// quarter of an SCN cut); C6 is outside Søreide's C7+ data. Above C29 the
// table's Tb (unverified, and extrapolated by Whitson) runs above the
// correlation by up to 4.7 % at C45; the 5 % bound there records that
// difference rather than a claim of accuracy.
func TestSoreideAgainstKatzFiroozabadi(t *testing.T) {
	t.Parallel()
	for _, r := range katzFiroozabadi {
		if r.n < 7 {
			continue
		}
		tol := 0.015
		if r.n >= 30 {
			tol = 0.05
		}
		got := soreideTb(r.m, r.sg)
		if d := math.Abs(got-r.tb) / r.tb; d > tol {
			t.Errorf("C%d: Søreide Tb(%g, %g) = %.1f °R, Katz–Firoozabadi %g °R (rel. diff %.3f > %g)",
				r.n, r.m, r.sg, got, r.tb, d, tol)
		}
	}
}

// TestCriticalPropertiesOfSCNGroups applies the critical-property
// correlations to the Katz–Firoozabadi (Tb, SG) of C7–C45 and checks
// that they behave as SCN properties must: Tc, omega rise and Pc falls with
// carbon number, Tb/Tc stays in 0.6–0.9, and the independent correlations
// agree. Bounds (common practice, no published source): the three
// correlations' Tc agree within 2 %; Pc of Kesler–Lee and Twu agree within
// 5 % up to C20, the range all were fitted to (Riazi–Daubert 1980 is left out
// of the Pc check: its Pc falls up to 5 % below Kesler–Lee's from C9 to C13).
// The molar masses the correlations give from (Tb, SG) are not compared with
// the table's M: they differ by up to 9 % (Twu at C21), which no tolerance
// worth testing would cover, and the table's Tb is itself unverified.
func TestCriticalPropertiesOfSCNGroups(t *testing.T) {
	t.Parallel()
	var prevTc, prevPc, prevW float64
	for _, r := range katzFiroozabadi {
		if r.n < 7 {
			continue
		}
		tcKL, pcKL := keslerLeeTcPc(r.tb, r.sg)
		_, tcRD, _, _ := riaziDaubert1980(r.tb, r.sg)
		_, tcTwu, pcTwu, _, err := twu(r.tb, r.sg)
		if err != nil {
			t.Fatalf("C%d: Twu: %v", r.n, err)
		}
		w := keslerLeeOmega(r.tb, tcKL, pcKL, r.sg)
		if r.n > 7 && !(tcKL > prevTc && pcKL < prevPc && w > prevW) {
			t.Errorf("C%d: Kesler–Lee Tc %.1f °R, Pc %.1f psia, omega %.3f not monotone after C%d (%.1f, %.1f, %.3f)",
				r.n, tcKL, pcKL, w, r.n-1, prevTc, prevPc, prevW)
		}
		prevTc, prevPc, prevW = tcKL, pcKL, w
		if tbr := r.tb / tcKL; tbr < 0.6 || tbr > 0.9 {
			t.Errorf("C%d: Tb/Tc = %.3f outside 0.6–0.9", r.n, tbr)
		}
		lo, hi := math.Min(tcKL, math.Min(tcRD, tcTwu)), math.Max(tcKL, math.Max(tcRD, tcTwu))
		if (hi-lo)/lo > 0.02 {
			t.Errorf("C%d: Tc Kesler–Lee %.1f, Riazi–Daubert %.1f, Twu %.1f °R differ by more than 2 %%", r.n, tcKL, tcRD, tcTwu)
		}
		if r.n <= 20 && math.Abs(pcKL-pcTwu)/pcTwu > 0.05 {
			t.Errorf("C%d: Pc Kesler–Lee %.1f, Twu %.1f psia differ by more than 5 %%", r.n, pcKL, pcTwu)
		}
	}
}

// TestWatsonSGIdentity checks that whitsonSG and whitsonKw, both printed in
// Whitson (1983), are inverses to the rounding of their coefficients, and
// that constantWatsonSG reproduces the plus fraction's SG by volume additivity.
func TestWatsonSGIdentity(t *testing.T) {
	t.Parallel()
	for _, r := range katzFiroozabadi {
		kw := whitsonKw(r.m, r.sg)
		// 6.0108^(-0.84573) vs 4.5579 and 0.17947·0.84573 vs 0.15178 agree to 4–5 digits.
		if sg := whitsonSG(r.m, kw); math.Abs(sg-r.sg)/r.sg > 2e-4 {
			t.Errorf("C%d: whitsonSG(M, whitsonKw(M, SG)) = %.6f, want %g", r.n, sg, r.sg)
		}
	}
	groups := gammaSCN(7, 45, 92, 150, 1)
	constantWatsonSG(groups, 0.8)
	var mass, vol float64
	for _, g := range groups {
		mass += g.z * g.m
		vol += g.z * g.m / g.sg
	}
	if sg := mass / vol; math.Abs(sg-0.8) > 1e-12 {
		t.Errorf("constant-Kw SG: mixture SG = %.15g, want 0.8", sg)
	}
}

// TestPseudoComponentUnits checks the SI boundary of PseudoComponent against
// the field-unit correlations with independently written factors
// (1.8 °R/K, 6894.757 Pa/psia, 0.0624280 m³/kg per ft³/lbm).
func TestPseudoComponentUnits(t *testing.T) {
	t.Parallel()
	const m, sg = 0.134, 0.782 // Katz–Firoozabadi C10
	for _, corr := range []CritCorrelation{KeslerLee, RiaziDaubert, RiaziDaubert1987, Twu} {
		for _, ac := range []AcentricMethod{AcentricKeslerLee, AcentricEdmister} {
			c, err := PseudoComponent("C10", m, sg, Characterization{Correlation: corr, Acentric: ac})
			if err != nil {
				t.Fatalf("%v: %v", corr, err)
			}
			tb := soreideTb(134, sg)
			var tc, pc, vc float64
			switch corr {
			case KeslerLee:
				tc, pc = keslerLeeTcPc(tb, sg)
				_, _, _, v := riaziDaubert1980(tb, sg)
				vc = v * 0.0624280 * m
			case RiaziDaubert:
				var v float64
				_, tc, pc, v = riaziDaubert1980(tb, sg)
				vc = v * 0.0624280 * m
			case RiaziDaubert1987:
				var v float64
				_, tc, pc, v = riaziDaubert1987(tb, sg)
				vc = v * 0.0624280 * m
			case Twu:
				var v float64
				_, tc, pc, v, _ = twu(tb, sg)
				vc = v * 0.0624280e-3 // ft³/lbmol → m³/mol
			}
			w := keslerLeeOmega(tb, tc, pc, sg)
			if ac == AcentricEdmister {
				w = edmisterOmega(tb, tc, pc/14.69595)
			}
			for _, f := range []struct {
				name      string
				got, want float64
			}{
				{"Tb K", c.Tb, tb / 1.8}, {"Tc K", c.Tc, tc / 1.8}, {"Pc Pa", c.Pc, pc * 6894.757},
				{"Vc m³/mol", c.Vc, vc}, {"omega", c.Omega, w}, {"M", c.M, m}, {"SG", c.SG, sg},
				{"Shift", c.Shift, 1 - 2.258/math.Pow(134, 0.1823)}, // Jhaveri & Youngren (1988) paraffins
			} {
				if math.Abs(f.got-f.want) > 1e-5*math.Abs(f.want) {
					t.Errorf("%v/%v: %s = %.8g, want %.8g", corr, ac, f.name, f.got, f.want)
				}
			}
		}
	}
}

func TestPseudoComponentErrors(t *testing.T) {
	t.Parallel()
	for _, tt := range []struct {
		name  string
		m, sg float64
		c     Characterization
		want  error
	}{
		{"", 0.1, 0.75, Characterization{}, ErrBadPlus},
		{"X", 0, 0.75, Characterization{}, ErrBadPlus},
		{"X", 143, 0.75, Characterization{}, ErrBadPlus}, // g/mol by mistake
		{"X", 0.1, math.NaN(), Characterization{}, ErrBadPlus},
		{"X", 0.1, 0.75, Characterization{Correlation: 9}, ErrBadPlus},
		{"X", 0.1, 0.75, Characterization{Acentric: -1}, ErrBadPlus},
		// Beyond Kesler–Lee's range: Tc from the correlation falls below Søreide's Tb.
		{"X", 1.2, 0.79, Characterization{}, ErrCorrelationRange},
		// SG far below any hydrocarbon of this M: Twu's perturbation gives Pc ≈ 10 GPa.
		{"X", 0.119, 0.52, Characterization{Correlation: Twu}, ErrCorrelationRange},
	} {
		c, err := PseudoComponent(tt.name, tt.m, tt.sg, tt.c)
		if !errors.Is(err, tt.want) {
			t.Errorf("PseudoComponent(%q, %g, %g, %+v) = %+v, %v; want error %v", tt.name, tt.m, tt.sg, tt.c, c, err, tt.want)
		}
	}
}
