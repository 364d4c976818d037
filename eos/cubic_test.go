package eos

import (
	"math"
	"testing"
)

// TestCubicConstants: Ω_a, Ω_b and Z_c of a cubic follow from δ1, δ2 by the
// critical-point conditions (a triple root of the cubic in Z). NewCubic must
// recover the Peng–Robinson constants (Peng and Robinson 1976, who print
// 0.45724, 0.07780 and 0.307) and the Soave–Redlich–Kwong ones in closed
// form, Ω_b = (2^(1/3) − 1)/3, Ω_a = 1/(9 (2^(1/3) − 1)), Z_c = 1/3 (Soave
// 1972 prints 0.42747 and 0.08664; CalebBell/thermo 0.2.25, thermo/eos.py,
// class SRK, carries these digits: c1 = 0.42748023354034140439,
// c2 = 0.08664034996495772159).
func TestCubicConstants(t *testing.T) {
	pr, err := NewCubic("PR", 1+math.Sqrt2, 1-math.Sqrt2, PR78Cubic().Alpha())
	if err != nil {
		t.Fatal(err)
	}
	srk, err := NewCubic("SRK", 1, 0, SRKCubic().Alpha())
	if err != nil {
		t.Fatal(err)
	}
	cb := math.Cbrt(2) - 1
	for _, c := range []struct {
		name            string
		got             Cubic
		oa, ob, zc, tol float64
	}{
		{"PR", pr, OmegaA, OmegaB, 0.3074013087, 1e-10},
		{"SRK", srk, 1 / (9 * cb), cb / 3, 1.0 / 3, 1e-13},
	} {
		oa, ob := c.got.Omegas()
		if math.Abs(oa-c.oa) > 1e-13 || math.Abs(ob-c.ob) > 1e-13 || math.Abs(c.got.Zc()-c.zc) > c.tol {
			t.Errorf("%s: Ω_a %.15g, Ω_b %.15g, Z_c %.12g; want %.15g, %.15g, %.12g", c.name, oa, ob, c.got.Zc(), c.oa, c.ob, c.zc)
		}
	}
	oa, ob := SRKCubic().Omegas()
	if oa != 0.42748023354034140439 || ob != 0.08664034996495772159 || math.Abs(oa-1/(9*cb)) > 1e-15 || math.Abs(ob-cb/3) > 1e-15 {
		t.Errorf("SRKCubic Ω_a %.17g, Ω_b %.17g", oa, ob)
	}
	if _, err := NewCubic("bad", 0, 1, Alpha{}); err == nil {
		t.Error("δ1 < δ2 accepted")
	}
	// A fluid on a cubic built by NewCubic equals the fluid of the
	// equation's own constructor (to round-off in Ω_a, Ω_b).
	c := Component{Name: "C3", M: 0.044097, Tc: 369.83, Pc: 4.248e6, Omega: 0.1523}
	a, _ := NewFluid([]Component{c}, nil, Options{Equation: SRK})
	b, _ := NewFluid([]Component{c}, nil, Options{Cubic: &srk})
	pa, _ := a.Props(300, 1e6, []float64{1})
	pb, _ := b.Props(300, 1e6, []float64{1})
	if math.Abs(pa.Z/pb.Z-1) > 1e-12 {
		t.Errorf("Z with SRK %.15g, with NewCubic(1, 0) %.15g", pa.Z, pb.Z)
	}
}

// srkLibrary evaluates an SRK mixture on the chosen root with every
// derivative.
func srkLibrary(t *testing.T, tc, pc, om, kij []float64, tk, p float64, x []float64, rc rootChoice) (*Fluid, phase) {
	t.Helper()
	var cs []Component
	for i := range tc {
		cs = append(cs, Component{Name: string(rune('A' + i)), M: 0.03, Tc: tc[i], Pc: pc[i], Omega: om[i]})
	}
	fl, err := NewFluid(cs, kij, Options{Equation: SRK})
	if err != nil {
		t.Fatal(err)
	}
	ts := newTState(fl.n)
	fl.setT(&ts, tk)
	ph := newPhase(fl.n)
	fl.evalPhase(&ph, &ts, p, x, rc, dN|dP|dT)
	return fl, ph
}

// TestSRKLibraryValues: the SRK mixture against the general-purpose
// CalebBell/thermo library, version 0.2.25 (commit 3272a36e875a7c082f90e210e80f9436adb784a7),
// with the same constants (exact Ω_a, Ω_b; κ = 0.480 + 1.574 ω − 0.176 ω²;
// R = 8.31446261815324 J/(mol K)):
//   - tests/test_eos_mix.py, test_SRKMIX_quick: N2 + CH4 at 115 K and 1 MPa,
//     both roots' molar volumes and fugacity coefficients; the gas at 300 K
//     and 10 MPa;
//   - tests/test_eos_mix.py, test_SRK_dlnphis_dT and test_SRK_dlnphis_dP: a
//     ternary with interaction coefficients, d ln φ/dT and d ln φ/dP of the
//     gas root (the library checks them to 1e-11);
//   - thermo/eos_mix.py, SRKMIXTranslated docstring: Peneloux-translated
//     volumes (printed to 9 digits);
//   - tests/test_eos.py, test_SRK_quick: a pure fluid's liquid volume and
//     fugacity coefficient.
func TestSRKLibraryValues(t *testing.T) {
	tc, pc, om := []float64{126.1, 190.6}, []float64{33.94e5, 46.04e5}, []float64{0.04, 0.011}
	x := []float64{0.5, 0.5}
	_, l := srkLibrary(t, tc, pc, om, nil, 115, 1e6, x, rootLiquid)
	_, g := srkLibrary(t, tc, pc, om, nil, 115, 1e6, x, rootVapour)
	check := func(what string, got, want, tol float64) {
		t.Helper()
		if !(math.Abs(got/want-1) <= tol) {
			t.Errorf("%s = %.15g, library %.15g (relative %.2g, want <= %.0g)", what, got, want, got/want-1, tol)
		}
	}
	check("N2-CH4 115 K 1 MPa V_L", l.v, 4.104756961475809e-05, 1e-12)
	check("N2-CH4 115 K 1 MPa V_V", g.v, 0.0007110158049778294, 1e-12)
	for i, want := range []float64{1.6356832861093693, 0.14476563850405255} {
		check("φ_L", math.Exp(l.lnphi[i]), want, 1e-12)
	}
	for i, want := range []float64{0.8842742560249208, 0.7236415842381881} {
		check("φ_V", math.Exp(g.lnphi[i]), want, 1e-12)
	}
	_, g300 := srkLibrary(t, tc, pc, om, nil, 300, 1e7, x, rootMinG)
	for i, want := range []float64{1.0200087028463556, 0.8717783536379076} {
		check("φ at 300 K, 10 MPa", math.Exp(g300.lnphi[i]), want, 1e-12)
	}

	kij := []float64{0, 0.038, 0.08, 0.038, 0, 0.021, 0.08, 0.021, 0}
	_, g3 := srkLibrary(t, []float64{126.2, 190.6, 305.4}, []float64{33.9e5, 46.0e5, 48.8e5}, []float64{0.04, 0.008, 0.098}, kij,
		270, 76e5, []float64{0.3, 0.1, 0.6}, rootVapour)
	for i, want := range []float64{-0.013492637405729917, -0.002035560753468637, 0.019072382634936852} {
		check("d ln φ/dT", g3.dt[i], want, 1e-9)
	}
	for i, want := range []float64{9.40786516520732e-8, 3.03133250647420e-9, -1.51771425140191e-7} {
		check("d ln φ/dP", g3.dp[i], want, 1e-9)
	}

	// Translated: c_i = −4.4e-6 and −4.35e-6 m³/mol, given to the package
	// as s_i = c_i/b_i.
	var cs []Component
	for i, c := range []float64{-4.4e-6, -4.35e-6} {
		b := srkOmegaB * R * tc[i] / pc[i]
		cs = append(cs, Component{Name: string(rune('A' + i)), M: 0.03, Tc: tc[i], Pc: pc[i], Omega: om[i], Shift: c / b})
	}
	fl, err := NewFluid(cs, []float64{0, 0.03, 0.03, 0}, Options{Equation: SRK, VolumeShift: true})
	if err != nil {
		t.Fatal(err)
	}
	ts := newTState(2)
	fl.setT(&ts, 115)
	ph := newPhase(2)
	fl.evalPhase(&ph, &ts, 1e6, []float64{0.2, 0.8}, rootLiquid, 0)
	check("translated V_L", ph.v, 4.35928920e-05, 1e-8)
	fl.evalPhase(&ph, &ts, 1e6, []float64{0.2, 0.8}, rootVapour, 0)
	check("translated V_V", ph.v, 0.00060927202, 1e-8)

	_, hx := srkLibrary(t, []float64{507.6}, []float64{3025000}, []float64{0.2975}, nil, 299, 1e6, []float64{1}, rootLiquid)
	check("pure liquid V", hx.v, 0.0001468210773547258, 1e-12)
	check("pure liquid φ", math.Exp(hx.lnphi[0]), 0.02174822767621325, 1e-12)
}

// TestSecondVirial: at low density every cubic of the family tends to the
// virial form Z = 1 + B2/v + …, with B2 = b − a/(RT) (expand
// P v/(RT) = v/(v − b) − a/(RT (v + δ1 b)(v + δ2 b)) in 1/v), and in pressure
// Z = 1 + B2 P/(RT) + O(P²). The slope (Z − 1) RT/P is extrapolated to zero
// pressure from 100 Pa and 200 Pa (Richardson; below the vapour pressure of
// n-hexane at 250 K, about 1.5 kPa, so that the root is the gas), for a pure fluid and a
// mixture (b = Σ x_i b_i, a = Σ Σ x_i x_j a_ij), on both cubics.
func TestSecondVirial(t *testing.T) {
	cs := []Component{
		{Name: "C1", M: 0.016043, Tc: 190.56, Pc: 4.599e6, Omega: 0.011},
		{Name: "C3", M: 0.044097, Tc: 369.83, Pc: 4.248e6, Omega: 0.152},
		{Name: "nC6", M: 0.086177, Tc: 507.6, Pc: 3.025e6, Omega: 0.300},
	}
	kij := []float64{0, 0.01, 0.02, 0.01, 0, 0.005, 0.02, 0.005, 0}
	for _, eq := range []Equation{PR78, SRK} {
		fl, err := NewFluid(cs, kij, Options{Equation: eq})
		if err != nil {
			t.Fatal(err)
		}
		for _, x := range [][]float64{{1, 0, 0}, {0, 0, 1}, {0.7, 0.2, 0.1}} {
			for _, tk := range []float64{250, 400, 600} {
				ts := newTState(3)
				fl.setT(&ts, tk)
				am, bm := 0.0, 0.0
				for i := range 3 {
					bm += x[i] * fl.b[i]
					for j := range 3 {
						am += x[i] * x[j] * ts.aij[i*3+j]
					}
				}
				want := bm - am/(R*tk)
				slope := func(p float64) float64 {
					pp, _ := fl.Props(tk, p, x)
					return (pp.Z - 1) * R * tk / p
				}
				got := 2*slope(100) - slope(200)
				if math.Abs(got-want) > 1e-6*math.Abs(want) {
					t.Errorf("%v x=%v T=%g K: B2 %.9g m³/mol, want b − a/RT = %.9g", eq, x, tk, got, want)
				}
			}
		}
	}
}

// TestPenelouxSRKShift: Peneloux, Rauzy and Fréze (1982) give
// c = 0.40768 (R Tc/Pc)(0.29441 − Z_RA); with the Yamada–Gunn (1973)
// Z_RA = 0.29056 − 0.08775 ω, c/b at ω = 0 is 0.40768 × 0.00385/Ω_b.
func TestPenelouxSRKShift(t *testing.T) {
	for _, w := range []float64{0, 0.2, 0.6} {
		want := 0.40768 * (0.29441 - (0.29056 - 0.08775*w)) / ((math.Cbrt(2) - 1) / 3)
		if got := PenelouxSRKShift(w); math.Abs(got-want) > 1e-14 {
			t.Errorf("ω %g: s %.15g, want %.15g", w, got, want)
		}
	}
}
