package eos

import (
	"math"
	"testing"
)

// lbcC8Fluid is the methane/ethane/propane gas of the `chemicals` library's
// Lorentz_Bray_Clarke doc-test (C. Bell, chemicals.viscosity), constants as
// printed there: M g/mol, Tc K, Pc Pa, Vc m³/mol. ω is not used by the
// viscosity and is set from Poling et al. (2001) App. A.
func lbcC8Fluid(t *testing.T) (*Fluid, []float64) {
	t.Helper()
	cs := []Component{
		{Name: "C1", M: 16.04246e-3, Tc: 190.564, Pc: 4599000, Omega: 0.011, Vc: 9.86e-05},
		{Name: "C2", M: 30.06904e-3, Tc: 305.32, Pc: 4872000, Omega: 0.099, Vc: 0.0001455},
		{Name: "C3", M: 44.09562e-3, Tc: 369.83, Pc: 4248000, Omega: 0.152, Vc: 0.0002},
	}
	fl, err := NewFluid(cs, nil, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return fl, []float64{0.4, 0.3, 0.3}
}

// TestViscosityLBCLibrary checks METHODS C8: the doc-test of the general-purpose
// `chemicals` library, Lorentz_Bray_Clarke(T=300, P=1e6, Vm=0.0023025,
// zs=[.4,.3,.3], ...) = 9.925488160761484e-06 Pa·s, reproduced by an
// independent script that also gave the dilute part 0.0094780 cP.
func TestViscosityLBCLibrary(t *testing.T) {
	t.Parallel()
	fl, x := lbcC8Fluid(t)
	const temp, v = 300.0, 2302.5e-6 // K, m³/mol (ρr = 0.06215)

	// The library uses a5 = 0.0093724 where LBC (1964) print 0.0093324; at
	// ρr = 0.062 that changes μ by 7e-9 relative, below the tolerance.
	if got, want, tol := fl.ViscosityLBC(temp, x, v), 9.925488e-6, 0.5e-12/9.925488e-6; viscRelErr(got, want) > tol {
		t.Errorf("ViscosityLBC(C1/C2/C3, T=300 K, v=2302.5 cm³/mol) = %.10g Pa·s, want %.7g (chemicals doc-test, METHODS C8)", got, want)
	}
	// 0.0094780 cP: five significant figures printed in METHODS C8.
	if got, want, tol := fl.lbcDilute(temp, x)/paSPerCP, 0.0094780, 0.5e-7/0.0094780; viscRelErr(got, want) > tol {
		t.Errorf("dilute part (Stiel–Thodos + Herning–Zipperer) = %.8g cP, want %.5g (METHODS C8)", got, want)
	}
}

// viscRelErr returns |got − want| / |want|.
func viscRelErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

var stielThodosTests = []struct {
	name         string
	t, tc, pc, m float64 // K, K, Pa, kg/mol
	want         float64 // Pa·s
	tol          float64 // relative
	src          string
}{{
	name: "CCl4, Tr = 0.54 (Tr ≤ 1.5 branch)",
	t:    300, tc: 556.35, pc: 4.5596e6, m: 153.8e-3,
	want: 1.040892622e-5, tol: 0.5e-14 / 1.040892622e-5, // ten significant figures printed
	src: "chemicals Stiel_Thodos doc-test (METHODS C8)",
}, {
	// Handbook data against a correlation: the tolerance is the handbook's
	// stated uncertainty (< 3 %), not the printed digits. Stiel–Thodos gives
	// 11.01 μPa·s here.
	name: "methane at 300 K, Tr = 1.57 (Tr > 1.5 branch)",
	t:    300, tc: 190.56, pc: 45.99e5, m: 16.043e-3,
	want: 11.1e-6, tol: 0.03,
	src: "CRC Handbook of Chemistry and Physics, table Viscosity of Gases (Huber & Harvey), CH4 (P = 0) at 300 K: 11.1 μPa·s (11.2 in earlier editions); constants Poling App. A",
}, {
	// Stiel–Thodos gives 18.54 μPa·s (−4.4 %); the Tr ≤ 1.5 formula applied
	// here would give 21.23 μPa·s (+9.4 %), so a 6 % band (twice the stated
	// handbook uncertainty) tells the branches apart.
	name: "methane at 600 K, Tr = 3.15 (Tr > 1.5 branch)",
	t:    600, tc: 190.56, pc: 45.99e5, m: 16.043e-3,
	want: 19.4e-6, tol: 0.06,
	src: "CRC Handbook of Chemistry and Physics, table Viscosity of Gases (edition before the Huber & Harvey revision), CH4 at 600 K: 19.4 μPa·s; constants Poling App. A",
}, {
	name: "methane at 600 K, Tr > 1.5 formula",
	t:    600, tc: 190.56, pc: 45.99e5, m: 16.043e-3,
	want: 1.854207200731e-5, tol: 1e-12,
	src: "17.78e-5 (4.58 Tr − 1.67)^0.625 / ξ of Stiel & Thodos (1961) as in METHODS §6.1, evaluated by an independent script (self-consistency)",
}, {
	// 300 K is below 1.5 Tc for ethane: the Tr ≤ 1.5 branch. Stiel–Thodos
	// gives 9.37 μPa·s.
	name: "ethane at 300 K, Tr = 0.98",
	t:    300, tc: 305.32, pc: 48.72e5, m: 30.070e-3,
	want: 9.4e-6, tol: 0.03,
	src: "CRC Handbook of Chemistry and Physics, table Viscosity of Gases (Huber & Harvey), C2H6 at 300 K: 9.4 μPa·s; constants Poling App. A",
}, {
	// Tr ≤ 1.5 branch; Stiel–Thodos gives 8.35 μPa·s.
	name: "propane at 300 K, Tr = 0.81",
	t:    300, tc: 369.83, pc: 42.48e5, m: 44.097e-3,
	want: 8.2e-6, tol: 0.03,
	src: "CRC Handbook of Chemistry and Physics, table Viscosity of Gases (Huber & Harvey), C3H8 at 300 K: 8.2 μPa·s; constants Poling App. A",
}}

func TestStielThodos(t *testing.T) {
	t.Parallel()
	for _, tc := range stielThodosTests {
		got := stielThodos(tc.t, tc.tc, tc.pc, tc.m)
		if viscRelErr(got, tc.want) > tc.tol {
			t.Errorf("%s: μ*(T=%g K) = %.10g Pa·s, want %.10g ± %.2g rel (%s)", tc.name, tc.t, got, tc.want, tc.tol, tc.src)
		}
	}
}

// TestStielThodosBranches checks that the two published branches nearly meet
// at Tr = 1.5: 34.0e-5·1.5^0.94 and 17.78e-5·(4.58·1.5 − 1.67)^0.625 differ by
// 0.13 % (identity of the published formulas).
func TestStielThodosBranches(t *testing.T) {
	t.Parallel()
	const tc, pc, m = 190.56, 45.99e5, 16.043e-3
	lo := stielThodos(1.5*tc, tc, pc, m)
	hi := stielThodos(1.5*tc*(1+1e-12), tc, pc, m)
	if d := viscRelErr(hi, lo); d > 2e-3 {
		t.Errorf("Stiel–Thodos branches at Tr = 1.5: %.6g vs %.6g Pa·s, jump %.3g rel, want < 2e-3", lo, hi, d)
	}
}

// TestViscosityLBCDenseLiquid: an n-decane liquid at 300 K and its measured
// density must come out in the range of light liquid hydrocarbons.
func TestViscosityLBCDenseLiquid(t *testing.T) {
	t.Parallel()
	// n-decane, Poling et al. (2001) App. A: M 142.285 g/mol, Tc 617.70 K,
	// Pc 21.10 bar, ω 0.490, Vc 624 cm³/mol // from memory (our METHODS table
	// stops at nC6).
	c10 := Component{Name: "nC10", M: 142.285e-3, Tc: 617.70, Pc: 21.10e5, Omega: 0.490, Vc: 624e-6}
	fl, err := NewFluid([]Component{c10}, nil, Options{})
	if err != nil {
		t.Fatal(err)
	}
	v := c10.M / 726.0 // liquid density about 726 kg/m³ at 25 °C // from memory
	mu := fl.ViscosityLBC(300, []float64{1}, v)
	// Liquid hydrocarbons at reservoir-like conditions: 0.1–1 cP
	// // common practice, no published source. Measured n-decane is about
	// 0.85 mPa·s at 25 °C // from memory; LBC gives about 0.91 cP here.
	if mu < 0.1*paSPerCP || mu > 1*paSPerCP {
		t.Errorf("ViscosityLBC(n-decane, 300 K, ρ = 726 kg/m³) = %.4g cP, want 0.1–1 cP (common practice)", mu/paSPerCP)
	}
}

// TestViscosityLBCRisesWithDensity: the LBC polynomial increases on
// 0 ≤ ρr ≤ 3.5 (its derivative a2 + 2a3ρr + 3a4ρr² + 4a5ρr³ stays above
// 0.049 there), so μ must rise as the molar volume falls at fixed T and x.
func TestViscosityLBCRisesWithDensity(t *testing.T) {
	t.Parallel()
	fl, x := lbcC8Fluid(t)
	vpc := 0.4*9.86e-05 + 0.3*0.0001455 + 0.3*0.0002
	prev := fl.ViscosityLBC(300, x, math.Inf(1))
	for rr := 0.05; rr <= 3.5; rr += 0.05 {
		mu := fl.ViscosityLBC(300, x, vpc/rr)
		if !(mu > prev) {
			t.Fatalf("ViscosityLBC at ρr = %.2f is %.6g Pa·s, not above %.6g at lower density", rr, mu, prev)
		}
		prev = mu
	}
}

// TestViscosityLBCZeroDensity checks the documented limit v → ∞:
// μ = μ* + (a1⁴ − 1e−4)/ξm (identity of the LBC formula).
func TestViscosityLBCZeroDensity(t *testing.T) {
	t.Parallel()
	fl, x := lbcC8Fluid(t)
	tpc := 0.4*190.564 + 0.3*305.32 + 0.3*369.83
	ppc := 0.4*4599000 + 0.3*4872000 + 0.3*4248000.0
	mm := 0.4*16.04246e-3 + 0.3*30.06904e-3 + 0.3*44.09562e-3
	want := fl.lbcDilute(300, x) + (math.Pow(0.10230, 4)-1e-4)/lbcXi(tpc, ppc, mm)*paSPerCP
	if got := fl.ViscosityLBC(300, x, math.Inf(1)); viscRelErr(got, want) > 1e-13 {
		t.Errorf("ViscosityLBC(v = +Inf) = %.15g, want %.15g", got, want)
	}
}

// TestViscosityEstimateVc checks the Vc fallback of NewFluid, Zc = 0.2918 − 0.0928 ω
// (Reid, Prausnitz & Sherwood 1977), against the Vc tabulated in Poling et
// al. (2001) App. A (the library components). The 3 % band is the largest
// deviation seen (C1, +1.6 %) with margin: the relation is an estimate, not
// a fit to these data.
func TestViscosityEstimateVc(t *testing.T) {
	t.Parallel()
	for _, name := range LibraryNames() {
		c, _ := LibraryComponent(name)
		if got := estimateVc(c.Tc, c.Pc, c.Omega); viscRelErr(got, c.Vc) > 0.03 {
			t.Errorf("estimateVc(%s) = %.4g cm³/mol, want %.4g ± 3 %% (Poling App. A)", name, got*1e6, c.Vc*1e6)
		}
		noVc := c
		noVc.Vc = 0
		fl, err := NewFluid([]Component{c, {Name: "x", M: c.M, Tc: c.Tc, Pc: c.Pc, Omega: c.Omega}}, nil, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if fl.vc[0] != c.Vc || fl.vc[1] != estimateVc(c.Tc, c.Pc, c.Omega) {
			t.Errorf("%s: NewFluid vc = %g, %g; want the given Vc %g, then the estimate", name, fl.vc[0], fl.vc[1], c.Vc)
		}
		v0, est0 := fl.CriticalVolume(0)
		v1, est1 := fl.CriticalVolume(1)
		if v0 != c.Vc || est0 || v1 != fl.vc[1] || !est1 {
			t.Errorf("%s: CriticalVolume = (%g, %v), (%g, %v); want the given Vc %g, then the estimate %g marked as such", name, v0, est0, v1, est1, c.Vc, fl.vc[1])
		}
	}
}

func TestViscosityLBCAllocs(t *testing.T) {
	fl, x := lbcC8Fluid(t)
	if n := testing.AllocsPerRun(100, func() { _ = fl.ViscosityLBC(300, x, 2302.5e-6) }); n != 0 {
		t.Errorf("ViscosityLBC allocates %g times per call, want 0", n)
	}
}

func TestViscosityLBCPanicsOnLength(t *testing.T) {
	fl, _ := lbcC8Fluid(t)
	defer func() {
		if recover() == nil {
			t.Error("ViscosityLBC with 2 mole fractions for 3 components did not panic")
		}
	}()
	fl.ViscosityLBC(300, []float64{0.5, 0.5}, 1e-3)
}

func BenchmarkViscosityLBC(b *testing.B) {
	cs := []Component{
		{Name: "C1", M: 16.04246e-3, Tc: 190.564, Pc: 4599000, Omega: 0.011, Vc: 9.86e-05},
		{Name: "C2", M: 30.06904e-3, Tc: 305.32, Pc: 4872000, Omega: 0.099, Vc: 0.0001455},
		{Name: "C3", M: 44.09562e-3, Tc: 369.83, Pc: 4248000, Omega: 0.152, Vc: 0.0002},
	}
	fl, err := NewFluid(cs, nil, Options{})
	if err != nil {
		b.Fatal(err)
	}
	x := []float64{0.4, 0.3, 0.3}
	var sink float64
	b.ReportAllocs()
	for b.Loop() {
		sink += fl.ViscosityLBC(300, x, 2302.5e-6)
	}
	_ = sink
}
