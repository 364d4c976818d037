package mbal

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"dewcell/cvd"
	"dewcell/eos"
)

// Length, volume and mass units of the trade, by definition.
const (
	qlFt     = 0.3048             // m, international foot (exact)
	qlFt3    = qlFt * qlFt * qlFt // m³
	qlAcre   = 4046.8564224       // m², international acre (NIST SP 811, App. B)
	qlBbl    = 0.158987294928     // m³, 42 US gallons of 231 in³ (NIST SP 811, App. B)
	qlLb     = 0.45359237         // kg, avoirdupois pound (exact)
	qlLbmol  = 1000 * qlLb        // mol per lbmol
	qlScfSTB = qlFt3 / qlBbl      // m³/m³ per scf/STB
)

// The conversion constants of the trade, derived from the SI definitions,
// eos.R and cvd.StandardField, each against the value printed in the
// handbooks (METHODS 5.1, C9).
func TestTradeConstants(t *testing.T) {
	std := cvd.StandardField
	vsc := eos.R * std.T / std.P // m³/mol
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
		src       string
	}{
		{"ft² per acre", qlAcre / (qlFt * qlFt), 43560, 1e-9, "the acre is 43,560 ft² (660 ft × 66 ft)"},
		{"ft³ per bbl", qlBbl / qlFt3, 5.614583, 5e-7, "42 gal × 231 in³ / 1728 in³/ft³; printed to 7 digits"},
		{"R, psia ft³/(lbmol °R)", eos.R / qlPsi / qlFt3 * qlLbmol / qlRankine, 10.7316, 5e-5,
			"METHODS 5.1; from R = 8.31446261815324 J/(mol K), printed to 6 digits"},
		// R T/p at 60 °F and 14.696 psia is 379.483 scf/lbmol. METHODS
		// 5.1 and C9 print 379.49 (their own arithmetic with a rounded R);
		// the 0.007 difference is 2 parts in 10⁵, so the tolerance here is
		// 0.01 rather than half a unit in the last printed digit.
		{"scf per lbmol at 60 °F, 14.696 psia", vsc / qlFt3 * qlLbmol, 379.49, 0.01, "METHODS 5.1, C9"},
		// The issue's round 379.4 does not come from 14.696 psia (that
		// rounds to 379.5); it is the molar volume on the older 14.7 psia
		// basis, 379.38 → 379.4.
		{"scf per lbmol at 60 °F, 14.7 psia", eos.R * std.T / (14.7 * qlPsi) / qlFt3 * qlLbmol, 379.4, 0.05,
			"trade figure 379.4 scf/lbmol, printed to 4 digits"},
		{"lbm per STB per unit γo", cvd.WaterDensity60F * qlBbl / qlLb, 350.16, 0.005,
			"METHODS 5.1, C9: 62.366 lb/ft³ × 5.614583 ft³"},
		{"gas-equivalent constant, scf/STB per (γo/Mo)", 1000 * cvd.WaterDensity60F * vsc / qlScfSTB, 132880, 5,
			"METHODS 5.3, C9, printed to 5 digits"},
	} {
		if math.Abs(c.got-c.want) > c.tol {
			t.Errorf("%s = %.8g, want %g ± %g (%s)", c.name, c.got, c.want, c.tol, c.src)
		}
	}
}

// Cragoe (1929) as recomputed in METHODS C6, printed to 0.01 g/mol.
func TestCragoeC6(t *testing.T) {
	for _, c := range []struct{ api, m float64 }{{45, 155.60}, {55, 123.91}, {60, 112.46}} {
		m, err := CragoeMolarMass(c.api)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(m*1000-c.m) > 0.005 {
			t.Errorf("CragoeMolarMass(%g) = %.4f g/mol, want %.2f (METHODS C6)", c.api, m*1000, c.m)
		}
	}
	for _, api := range []float64{19.9, 80.1, 5.9, math.NaN(), math.Inf(1)} {
		if m, err := CragoeMolarMass(api); !errors.Is(err, ErrCorrelationRange) || m != 0 {
			t.Errorf("CragoeMolarMass(%g) = %g, %v; want 0 and ErrCorrelationRange", api, m, err)
		}
	}
}

// METHODS C9: R = 50,000 scf/STB of 0.70 gas, 55 °API condensate (γo =
// 0.75871, Cragoe M_o = 123.91) → γ_w = 0.75724, f_g = 0.983988,
// GE = 813.6 scf/STB.
func TestRecombineC9(t *testing.T) {
	w, err := Recombine(SurfaceData{
		Gas:    []SurfaceGas{{GOR: 50000 * qlScfSTB, Gravity: 0.70}},
		OilAPI: 55,
	})
	if err != nil {
		t.Fatal(err)
	}
	if !w.Cragoe || math.Abs(w.OilM*1000-123.91) > 0.005 {
		t.Errorf("oil molar mass %.4f g/mol (Cragoe %v), want 123.91 from Cragoe (METHODS C9)", w.OilM*1000, w.Cragoe)
	}
	if math.Abs(w.OilSG-0.75871) > 5e-6 {
		t.Errorf("oil SG %.6f, want 0.75871 (METHODS C9)", w.OilSG)
	}
	if ge := w.GasEquivalent / qlScfSTB; math.Abs(ge-813.6) > 0.05 {
		t.Errorf("gas equivalent %.3f scf/STB, want 813.6 (METHODS C9)", ge)
	}
	if math.Abs(w.GasFraction-0.983988) > 5e-7 {
		t.Errorf("f_g = %.7f, want 0.983988 (METHODS C9)", w.GasFraction)
	}
	// C9's γ_w comes from the rounded constants of METHODS 5.4, 4584 and
	// 132,800 (field units, M_o in lb/lbmol): the formula reproduces it.
	mo := w.OilM * 1000
	if g := wellStreamGravity(50000*0.70, 50000, w.OilSG, mo, 4584, 132800); math.Abs(g-0.75724) > 5e-6 {
		t.Errorf("γ_w with the published constants = %.6f, want 0.75724 (METHODS C9)", g)
	}
	// Recombine uses the constants of its standard conditions,
	// c1 = 4,587.670 and c2 = 132,880.48 scf/STB (TestTradeConstants), so
	// by hand: (35,000 + 4,587.670 × 0.7587131)/(50,000 + 813.6377) = 0.7572913,
	// 5 × 10⁻⁵ above the rounded-constant figure.
	if math.Abs(w.Gravity-0.7572913) > 5e-8 {
		t.Errorf("γ_w = %.8f, want 0.7572913 (worked in the comment)", w.Gravity)
	}
	// The same oil given by its specific gravity instead of API.
	w2, err := Recombine(SurfaceData{Gas: []SurfaceGas{{GOR: 50000 * qlScfSTB, Gravity: 0.70}}, OilSG: 141.5 / 186.5})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(w2.Gravity-w.Gravity) > 1e-12 || math.Abs(w2.OilAPI-55) > 1e-12 {
		t.Errorf("by SG: γ_w %.10f, API %.10f; by API: γ_w %.10f, API 55", w2.Gravity, w2.OilAPI, w.Gravity)
	}
}

// Splitting the gas between stages with the same Σ Rₖ γₖ and the same total
// R cannot change the well stream; the mean gas gravity is the GOR-weighted
// one.
func TestRecombineStages(t *testing.T) {
	one, err := Recombine(SurfaceData{Gas: []SurfaceGas{{GOR: 5000, Gravity: 0.70}}, OilAPI: 50})
	if err != nil {
		t.Fatal(err)
	}
	// 4000·0.65 + 1000·0.90 = 3500 = 5000·0.70
	two, err := Recombine(SurfaceData{Gas: []SurfaceGas{{GOR: 4000, Gravity: 0.65}, {GOR: 1000, Gravity: 0.90}, {GOR: 0}}, OilAPI: 50})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(one.Gravity-two.Gravity) > 1e-14 || math.Abs(two.GasGravity-0.70) > 1e-14 || one.GasFraction != two.GasFraction {
		t.Errorf("one stage γ_w %.15g, f_g %.15g; two stages γ_w %.15g (mean gas %.15g), f_g %.15g",
			one.Gravity, one.GasFraction, two.Gravity, two.GasGravity, two.GasFraction)
	}
	// Another standard: the molar volume, and with it the gas equivalent,
	// scale with T_sc/p_sc.
	metric, err := Recombine(SurfaceData{Gas: []SurfaceGas{{GOR: 5000, Gravity: 0.70}}, OilAPI: 50, Standard: cvd.StandardMetric})
	if err != nil {
		t.Fatal(err)
	}
	f, m := cvd.StandardField, cvd.StandardMetric
	if want := one.GasEquivalent * (m.T / m.P) / (f.T / f.P); math.Abs(metric.GasEquivalent-want) > 1e-12*want {
		t.Errorf("metric gas equivalent %.12g, want %.12g", metric.GasEquivalent, want)
	}
}

// A volumetric case worked by hand (invented data; field units, converted to
// SI at the test's edge with the constants of TestTradeConstants):
//
//	Separator gas 30,000 scf/STB of γ 0.65; stock-tank gas 1,500 scf/STB of
//	γ 1.20; 50 °API condensate, molar mass not measured.
//	R = 31,500 scf/STB; Σ Rγ = 19,500 + 1,800 = 21,300
//	γo = 141.5/181.5 = 0.7796143; M_o = 6084/44.1 = 137.95918 (Cragoe)
//	At 60 °F and 14.696 psia: c2 = 350.16209 × 379.48276 = 132,880.48;
//	c1 = c2/28.9647 = 4,587.6697
//	GE  = 132,880.48 × 0.7796143/137.95918 = 750.91429 scf/STB
//	γ_w = (21,300 + 4,587.6697 × 0.7796143)/(31,500 + 750.91429) = 0.77134598
//	f_g = 31,500/32,250.914 = 0.97671650
//	Sutton: Tpc = 169.2 + 349.5 γ_w − 74.0 γ_w² = 394.75730 °R
//	        Ppc = 756.8 − 131.07 γ_w − 3.6 γ_w² = 653.55777 psia
//	The reservoir is put at the doc-test point of METHODS C4: T = 1.5006 Tpc
//	= 592.37280 °R (132.70 °F), p = 3.1995 Ppc = 2,091.0581 psia, so that
//	Z = 0.7730934971 (GasCompressibility-py doc-test).
//	HCPV = 640 acre × 43,560 ft²/acre × 50 ft × 0.20 × (1 − 0.25) = 209,088,000 ft³
//	Bg = Z T p_sc/(p T_sc) = 0.7730935 × 592.37280 × 14.696/(2,091.0581 × 519.67)
//	   = 0.0061934484 ft³/scf
//	G_wet   = 209,088,000/0.0061934484 = 33.759545 × 10⁹ scf
//	G_sales = 0.97671650 × G_wet       = 32.973504 × 10⁹ scf
//	N       = G_sales/31,500           = 1.0467779 × 10⁶ STB
func TestInPlaceQuickLookHandWorked(t *testing.T) {
	w, err := Recombine(SurfaceData{
		Gas:    []SurfaceGas{{GOR: 30000 * qlScfSTB, Gravity: 0.65}, {GOR: 1500 * qlScfSTB, Gravity: 1.20}},
		OilAPI: 50,
	})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 2e-7 // relative: the hand figures carry 8 significant digits
	check := func(name string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > tol*math.Abs(want) {
			t.Errorf("%s = %.9g, want %.8g (worked in the comment)", name, got, want)
		}
	}
	check("gas equivalent, scf/STB", w.GasEquivalent/qlScfSTB, 750.91429)
	check("γ_w", w.Gravity, 0.77134598)
	check("f_g", w.GasFraction, 0.97671650)
	check("Tpc, °R", w.Critical.Tpc*qlRankine, 394.75730)
	check("Ppc, psia", w.Critical.Ppc/qlPsi, 653.55777)

	hcpv := 640 * qlAcre * 50 * qlFt * 0.20 * (1 - 0.25)
	q, err := InPlaceQuickLook(w, hcpv, 1.5006*w.Critical.Tpc, 3.1995*w.Critical.Ppc)
	if err != nil {
		t.Fatal(err)
	}
	check("HCPV, ft³", q.HCPV/qlFt3, 209088000)
	check("Z", q.Z, 0.7730934971)
	check("Bg, ft³/scf", q.Bg, 0.0061934484) // ft³/scf = m³/m³
	check("wet gas, scf", q.WetGas/qlFt3, 33.759545e9)
	check("sales gas, scf", q.SalesGas/qlFt3, 32.973504e9)
	check("condensate, STB", q.Condensate/qlBbl, 1.0467779e6)

	// Balances: the wet gas is the sales gas plus the gas equivalent of the
	// condensate, and the condensate holds the well stream's other moles.
	if d := q.SalesGas + w.GasEquivalent*q.Condensate - q.WetGas; math.Abs(d) > 1e-12*q.WetGas {
		t.Errorf("sales gas + GE × condensate − wet gas = %g m³", d)
	}
	oilMoles := q.Condensate * w.OilSG * cvd.WaterDensity60F / w.OilM
	if d := oilMoles - (1-w.GasFraction)*q.Moles; math.Abs(d) > 1e-12*q.Moles {
		t.Errorf("condensate moles %g, want (1 − f_g) n = %g", oilMoles, (1-w.GasFraction)*q.Moles)
	}
}

func TestQuickLookBadInput(t *testing.T) {
	gas := []SurfaceGas{{GOR: 5000, Gravity: 0.7}}
	for _, c := range []struct {
		name string
		d    SurfaceData
	}{
		{"no gas", SurfaceData{OilAPI: 50}},
		{"no gas made", SurfaceData{Gas: []SurfaceGas{{GOR: 0, Gravity: 0.7}}, OilAPI: 50}},
		{"negative GOR", SurfaceData{Gas: []SurfaceGas{{GOR: 5000, Gravity: 0.7}, {GOR: -1, Gravity: 1}}, OilAPI: 50}},
		{"NaN GOR", SurfaceData{Gas: []SurfaceGas{{GOR: math.NaN(), Gravity: 0.7}}, OilAPI: 50}},
		{"zero gravity", SurfaceData{Gas: []SurfaceGas{{GOR: 5000}}, OilAPI: 50}},
		{"no oil gravity", SurfaceData{Gas: gas}},
		{"both oil gravities", SurfaceData{Gas: gas, OilAPI: 50, OilSG: 0.78}},
		{"negative SG", SurfaceData{Gas: gas, OilSG: -0.78}},
		{"API below −131.5", SurfaceData{Gas: gas, OilAPI: -140}},
		{"negative molar mass", SurfaceData{Gas: gas, OilAPI: 50, OilM: -0.1}},
		{"bad impurities", SurfaceData{Gas: gas, OilAPI: 50, Impurities: Impurities{CO2: -0.01}}},
		{"bad standard", SurfaceData{Gas: gas, OilAPI: 50, Standard: cvd.Conditions{T: 288, P: -1}}},
	} {
		if w, err := Recombine(c.d); !errors.Is(err, ErrBadSurfaceData) || w != nil {
			t.Errorf("%s: Recombine = %v, %v; want nil and ErrBadSurfaceData", c.name, w, err)
		}
	}
	// Outside the correlations' ranges: a heavy oil for Cragoe, a well
	// stream lighter than Sutton's data.
	for _, c := range []struct {
		name string
		d    SurfaceData
	}{
		{"Cragoe range", SurfaceData{Gas: gas, OilAPI: 15}},
		{"Sutton range", SurfaceData{Gas: []SurfaceGas{{GOR: 200000, Gravity: 0.56}}, OilAPI: 60}},
	} {
		if _, err := Recombine(c.d); !errors.Is(err, ErrCorrelationRange) {
			t.Errorf("%s: %v, want ErrCorrelationRange", c.name, err)
		}
	}
	// A measured molar mass lifts the Cragoe range.
	if _, err := Recombine(SurfaceData{Gas: gas, OilAPI: 15, OilM: 0.3}); err != nil {
		t.Errorf("measured molar mass with 15 °API: %v", err)
	}

	w, err := Recombine(SurfaceData{Gas: gas, OilAPI: 50})
	if err != nil {
		t.Fatal(err)
	}
	t0, p0 := 1.6*w.Critical.Tpc, 3*w.Critical.Ppc
	for _, c := range []struct {
		name       string
		w          *WellStream
		hcpv, t, p float64
	}{
		{"zero HCPV", w, 0, t0, p0},
		{"NaN temperature", w, 1e6, math.NaN(), p0},
		{"negative pressure", w, 1e6, t0, -p0},
		{"infinite pressure", w, 1e6, t0, math.Inf(1)},
		{"empty well stream", &WellStream{}, 1e6, t0, p0},
		{"nil well stream", nil, 1e6, t0, p0},
	} {
		if q, err := InPlaceQuickLook(c.w, c.hcpv, c.t, c.p); !errors.Is(err, ErrBadSurfaceData) || q != nil {
			t.Errorf("%s: InPlaceQuickLook = %v, %v; want nil and ErrBadSurfaceData", c.name, q, err)
		}
	}
	// Tpr above 3: outside DAK.
	if _, err := InPlaceQuickLook(w, 1e6, 3.2*w.Critical.Tpc, p0); !errors.Is(err, ErrCorrelationRange) {
		t.Errorf("Tpr 3.2: %v, want ErrCorrelationRange", err)
	}
}

func ExampleRecombine() {
	// 50,000 scf/STB of 0.70 gas over 55 °API condensate (METHODS C9), in SI:
	// 1 scf/STB = 0.1781076 m³/m³.
	w, err := Recombine(SurfaceData{
		Gas:    []SurfaceGas{{GOR: 50000 * 0.028316846592 / 0.158987294928, Gravity: 0.70}},
		OilAPI: 55,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("well-stream gravity %.4g, surface-gas mole fraction %.4g, oil %.4g g/mol\n",
		w.Gravity, w.GasFraction, w.OilM*1000)
	// Output: well-stream gravity 0.7573, surface-gas mole fraction 0.984, oil 123.9 g/mol
}

func ExampleZFactorDAK() {
	z, err := ZFactorDAK(1.5006, 3.1995)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.4g\n", z)
	// Output: 0.7731
}

// TestCompareRoutes: differences are quick look minus equation of state,
// relative ones over the equation of state's figure (hand-worked, our own
// numbers); NaN where that figure is zero (documented).
func TestCompareRoutes(t *testing.T) {
	ip := &InPlace{Z: 0.80, WetGas: 100, SalesGas: 90, Condensate: 0}
	ip.Surface.GasMoles = 0.9
	w := &WellStream{GasFraction: 0.92}
	q := &QuickLook{Z: 0.82, WetGas: 103, SalesGas: 94.5, Condensate: 2}
	d := CompareRoutes(ip, w, q)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"Z", d.Z, 0.02}, {"wet gas", d.WetGas, 3}, {"sales gas", d.SalesGas, 4.5}, {"condensate", d.Condensate, 2},
		{"dry gas fraction", d.DryGasFraction, 0.02},
		{"relative Z", d.RelZ, 0.025}, {"relative wet gas", d.RelWetGas, 0.03}, {"relative sales gas", d.RelSalesGas, 0.05},
	} {
		if math.Abs(c.got-c.want) > 1e-14 {
			t.Errorf("%s: %.15g, want %g", c.name, c.got, c.want)
		}
	}
	if !math.IsNaN(d.RelCondensate) {
		t.Errorf("relative condensate against none in place: %g, want NaN", d.RelCondensate)
	}
}
