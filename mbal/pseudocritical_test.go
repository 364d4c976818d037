package mbal

import (
	"errors"
	"math"
	"testing"

	"dewcell/cvd"
	"dewcell/eos"
)

// Field units for the checks against sources printed in them.
const (
	qlPsi     = 6894.757293168361 // Pa per psi, from the lb, g_n and inch definitions
	qlRankine = 1.8               // °R per K, exact
)

func qlDegF(f float64) float64 { return (f + 459.67) / qlRankine } // K

// METHODS C5 recomputes the three gravity correlations at γ = 0.70 from their
// published equations (Sutton 1985; Standing 1977) and prints two decimals.
// The correlations are polynomials, so these check the coefficients and the
// unit conversion; the Wichert–Aziz test below checks Sutton against a
// library's doc-test as well.
func TestGravityCorrelationsC5(t *testing.T) {
	// Half a unit in the second decimal; 1e-9 more because Standing's
	// natural-gas Ppc (669.125) and condensate Tpc (382.965) fall exactly on
	// a rounding tie.
	const tol = 0.005 + 1e-9
	for _, c := range []struct {
		corr     GasCorrelation
		tR, pPsi float64
	}{
		{Sutton, 377.59, 663.29},
		{StandingNaturalGas, 389.38, 669.12},
		{StandingCondensate, 382.97, 664.37},
	} {
		pc, err := c.corr.PseudoCritical(0.70)
		if err != nil {
			t.Fatalf("%v: %v", c.corr, err)
		}
		if tR := pc.Tpc * qlRankine; math.Abs(tR-c.tR) > tol {
			t.Errorf("%v: Tpc(0.70) = %.4f °R, want %.2f (METHODS C5)", c.corr, tR, c.tR)
		}
		if p := pc.Ppc / qlPsi; math.Abs(p-c.pPsi) > tol {
			t.Errorf("%v: Ppc(0.70) = %.4f psia, want %.2f (METHODS C5)", c.corr, p, c.pPsi)
		}
	}
}

// GasCompressibility-py (aegis4048) doc-test, reproduced in METHODS C5: Sutton
// at γ = 0.7, Wichert–Aziz for 10 % CO2 and 7 % H2S, 75 °F →
// Tpr = 1.5005661019949397; the intermediate ε = 21.2778 °R, Tpc' = 356.312 °R
// and Ppc' = 623.622 psia are printed in METHODS C5.
func TestWichertAzizLibraryExample(t *testing.T) {
	sut, err := Sutton.PseudoCritical(0.7)
	if err != nil {
		t.Fatal(err)
	}
	pc, err := WichertAziz(sut, 0.10, 0.07)
	if err != nil {
		t.Fatal(err)
	}
	tpr, _ := pc.Reduced(qlDegF(75), 1)
	if want := 1.5005661019949397; math.Abs(tpr-want) > 1e-12*want { // float round-off of the °R/K conversion
		t.Errorf("Tpr = %.16g, want %.16g (GasCompressibility-py doc-test)", tpr, want)
	}
	if eps := (sut.Tpc - pc.Tpc) * qlRankine; math.Abs(eps-21.2778) > 5e-5 {
		t.Errorf("ε = %.6f °R, want 21.2778 (METHODS C5)", eps)
	}
	if tR := pc.Tpc * qlRankine; math.Abs(tR-356.312) > 5e-4 {
		t.Errorf("Tpc' = %.5f °R, want 356.312 (METHODS C5)", tR)
	}
	if p := pc.Ppc / qlPsi; math.Abs(p-623.622) > 5e-4 {
		t.Errorf("Ppc' = %.5f psia, want 623.622 (METHODS C5)", p)
	}
	// The same library's README example ends the chain: Z at 2010 psi and
	// 75 °F, printed as 0.77. Whether its 2010 is absolute or gauge, DAK
	// lands within the rounding (Ppr 3.2231 or 3.2467).
	for _, p := range []float64{2010, 2010 + 14.696} {
		tpr, ppr := pc.Reduced(qlDegF(75), p*qlPsi)
		z, err := ZFactorDAK(tpr, ppr)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(z-0.77) > 0.005 {
			t.Errorf("Z at %g psia = %.4f, want 0.77 (GasCompressibility-py README, two decimals)", p, z)
		}
	}
}

// METHODS 4.4 prints the non-hydrocarbon gravities of the hydrocarbon-portion
// formula as 0.967 (N2), 1.52 (CO2) and 1.18 (H2S); HydrocarbonGravity uses
// the ratios of the library molar masses to cvd.MolarMassAir instead.
func TestNonHydrocarbonGravities(t *testing.T) {
	for _, c := range []struct {
		name string
		im   Impurities
		want float64
		tol  float64 // half a unit in the last printed digit
	}{
		{"N2", Impurities{N2: 1e-6}, 0.967, 5e-4},
		{"CO2", Impurities{CO2: 1e-6}, 1.52, 5e-3},
		{"H2S", Impurities{H2S: 1e-6}, 1.18, 5e-3},
	} {
		comp, _ := eos.LibraryComponent(c.name)
		if g := comp.M / cvd.MolarMassAir; math.Abs(g-c.want) > c.tol {
			t.Errorf("%s gravity %.5f, want %g (METHODS 4.4)", c.name, g, c.want)
		}
		// Through HydrocarbonGravity: removing a trace y of gravity g from a
		// gas of gravity γ gives (γ − y g)/(1 − y).
		const gamma = 0.8
		y := c.im.Sum()
		got, err := HydrocarbonGravity(gamma, c.im)
		if err != nil {
			t.Fatal(err)
		}
		if g := (gamma - got*(1-y)) / y; math.Abs(g-c.want) > c.tol+1e-6 {
			t.Errorf("%s: gravity implied by HydrocarbonGravity %.5f, want %g", c.name, g, c.want)
		}
	}
}

// A sour gas worked by hand (our numbers; constants from Poling et al. 2001,
// App. A, as in the eos library, and M_air = 28.9647 g/mol):
//
//	γ = 0.75, y_N2 = 0.02, y_CO2 = 0.05, y_H2S = 0.03
//	non-hydrocarbon gravity: 0.02·0.967177 + 0.05·1.519436 + 0.03·1.176674 = 0.1306155
//	γ_HC = (0.75 − 0.1306155)/0.90 = 0.6882050
//	Sutton: Tpc = 169.2 + 349.5·0.6882050 − 74.0·0.6882050² = 374.6793 °R = 208.15517 K
//	        Ppc = 756.8 − 131.07·0.6882050 − 3.6·0.6882050² = 664.8919 psia = 4.5842684 MPa
//	Kay:    Tpc = 0.90·208.15517 + 0.02·126.20 + 0.05·304.12 + 0.03·373.40 = 216.27165 K
//	        Ppc = 0.90·4.5842684 + 0.02·3.398 + 0.05·7.374 + 0.03·8.963 = 4.8313916 MPa
//	W–A:    A = 0.08, B = 0.03: ε = 120(0.08^0.9 − 0.08^1.6) + 15(0.03^0.5 − 0.03^4)
//	          = 12.847227 °R = 7.1373486 K
//	        Tpc' = 216.27165 − 7.1373486 = 209.13430 K
//	        Ppc' = 4.8313916 · 209.13430 / (216.27165 + 0.03·0.97·7.1373486) = 4.6674647 MPa
func TestGasPseudoCriticalHandWorked(t *testing.T) {
	pc, err := GasPseudoCritical(0.75, Impurities{N2: 0.02, CO2: 0.05, H2S: 0.03}, Sutton)
	if err != nil {
		t.Fatal(err)
	}
	const tol = 2e-7 // relative: the hand figures carry 7–8 significant digits
	if want := 209.13430; math.Abs(pc.Tpc-want) > tol*want {
		t.Errorf("Tpc = %.8g K, want %.8g (worked in the comment)", pc.Tpc, want)
	}
	if want := 4.6674647e6; math.Abs(pc.Ppc-want) > tol*want {
		t.Errorf("Ppc = %.8g Pa, want %.8g (worked in the comment)", pc.Ppc, want)
	}
	// Sweet gas: the correlation alone.
	sweet, err := GasPseudoCritical(0.75, Impurities{}, StandingCondensate)
	if err != nil {
		t.Fatal(err)
	}
	direct, _ := StandingCondensate.PseudoCritical(0.75)
	if sweet != direct {
		t.Errorf("sweet gas: %+v, want the correlation's %+v", sweet, direct)
	}
}

func TestKay(t *testing.T) {
	c1 := PseudoCritical{Tpc: 190.56, Ppc: 45.99e5} // methane, Poling et al. (2001) App. A
	c3 := PseudoCritical{Tpc: 369.83, Ppc: 42.48e5} // propane, same source
	if got, err := Kay([]float64{1}, []PseudoCritical{c1}); err != nil || got != c1 {
		t.Errorf("Kay of a pure gas = %+v, %v; want its own critical point", got, err)
	}
	got, err := Kay([]float64{0.75, 0.25}, []PseudoCritical{c1, c3})
	// 0.75·190.56 + 0.25·369.83 = 235.3775 K; 0.75·45.99 + 0.25·42.48 = 45.1125 bar
	if err != nil || math.Abs(got.Tpc-235.3775) > 1e-9 || math.Abs(got.Ppc-45.1125e5) > 1e-6 {
		t.Errorf("Kay = %+v, %v; want 235.3775 K, 45.1125 bar (by hand)", got, err)
	}
	for _, y := range [][]float64{{0.5, 0.4}, {1.2, -0.2}, {math.NaN(), 1}} {
		if _, err := Kay(y, []PseudoCritical{c1, c3}); err == nil {
			t.Errorf("Kay(%v) accepted", y)
		}
	}
}

func TestPseudoCriticalErrors(t *testing.T) {
	for _, g := range []float64{0.5, 0.569, 1.69, math.NaN(), math.Inf(1), -0.7} {
		for _, c := range []GasCorrelation{Sutton, StandingNaturalGas, StandingCondensate} {
			if pc, err := c.PseudoCritical(g); !errors.Is(err, ErrCorrelationRange) || pc != (PseudoCritical{}) {
				t.Errorf("%v.PseudoCritical(%g) = %+v, %v; want ErrCorrelationRange", c, g, pc, err)
			}
		}
	}
	if _, err := GasCorrelation(7).PseudoCritical(0.7); err == nil {
		t.Error("unknown correlation accepted")
	}
	sut, _ := Sutton.PseudoCritical(0.7)
	if got, err := WichertAziz(sut, 0, 0); err != nil || got != sut {
		t.Errorf("WichertAziz with no acid gas = %+v, %v; want unchanged", got, err)
	}
	for _, c := range []struct{ co2, h2s float64 }{{0.6, 0}, {0, 0.75}} {
		if _, err := WichertAziz(sut, c.co2, c.h2s); !errors.Is(err, ErrCorrelationRange) {
			t.Errorf("WichertAziz(CO2 %g, H2S %g): %v, want ErrCorrelationRange", c.co2, c.h2s, err)
		}
	}
	for _, c := range []struct{ co2, h2s float64 }{{-0.1, 0}, {0, math.NaN()}} {
		if _, err := WichertAziz(sut, c.co2, c.h2s); err == nil || errors.Is(err, ErrCorrelationRange) {
			t.Errorf("WichertAziz(CO2 %g, H2S %g): %v, want a bad-input error", c.co2, c.h2s, err)
		}
	}
	for _, im := range []Impurities{{N2: -0.1}, {CO2: 1}, {N2: 0.5, CO2: 0.3, H2S: 0.3}, {H2S: math.NaN()}} {
		if _, err := HydrocarbonGravity(0.8, im); err == nil {
			t.Errorf("HydrocarbonGravity accepted impurities %+v", im)
		}
	}
	// Half CO2 in a gas as light as methane leaves the hydrocarbons nothing.
	if _, err := HydrocarbonGravity(0.6, Impurities{CO2: 0.5}); err == nil {
		t.Error("HydrocarbonGravity accepted a negative hydrocarbon gravity")
	}
	// A sound gravity whose hydrocarbon part falls below Sutton's range.
	if _, err := GasPseudoCritical(0.62, Impurities{CO2: 0.10}, Sutton); !errors.Is(err, ErrCorrelationRange) {
		t.Errorf("GasPseudoCritical(0.62, 10 %% CO2): %v, want ErrCorrelationRange", err)
	}
}
