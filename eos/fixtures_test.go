package eos

import "testing"

// Test fluids. o9Fluid is the open reference condensate O9 of
// testdata/pr-open.md (constants and kij as printed there); its numbers come
// from an independent general-purpose Peng–Robinson library.

const psi = 6894.757293168361 // Pa per psi, from the lb, g_n and inch definitions

func degF(f float64) float64 { return (f + 459.67) / 1.8 }

func o9Fluid(vshift bool) (*Fluid, []float64) {
	names := []string{"N2", "CO2", "C1", "C2", "C3", "nC4", "nC5", "P1", "P2"}
	tc := []float64{126.2, 304.12, 190.56, 305.32, 369.83, 425.12, 469.7, 555, 700}
	pc := []float64{3.398e6, 7.374e6, 4.599e6, 4.872e6, 4.248e6, 3.796e6, 3.37e6, 3e6, 1.85e6}
	om := []float64{0.037, 0.225, 0.0115, 0.0995, 0.1523, 0.2002, 0.2515, 0.33, 0.58}
	mw := []float64{28.014, 44.01, 16.043, 30.07, 44.097, 58.123, 72.15, 105, 195}
	// shifts only to exercise the translated code paths (not in the reference data)
	sh := []float64{-0.19, -0.08, -0.15, -0.10, -0.085, -0.064, -0.042, 0.02, 0.1}
	z := []float64{0.008, 0.035, 0.74, 0.075, 0.04, 0.027, 0.015, 0.045, 0.015}
	var cs []Component
	for i := range names {
		cs = append(cs, Component{Name: names[i], Tc: tc[i], Pc: pc[i], Omega: om[i], M: mw[i] / 1000, Shift: sh[i]})
	}
	n := len(cs)
	k := make([]float64, n*n)
	set := func(i, j int, v float64) { k[i*n+j], k[j*n+i] = v, v }
	set(0, 2, 0.025)
	set(1, 2, 0.105)
	for j := 3; j < n; j++ {
		set(0, j, 0.08)
		set(1, j, 0.12)
	}
	set(2, 7, 0.025)
	set(2, 8, 0.045)
	fl, err := NewFluid(cs, k, Options{Equation: PR78, VolumeShift: vshift})
	if err != nil {
		panic(err)
	}
	return fl, z
}

// characterized builds a condensate from library components in amounts
// (any scale) and a plus fraction of amount plusAmount split by ch, with the
// default interaction coefficients; the feed is normalised to sum to 1.
func characterized(tb testing.TB, names []string, amounts []float64, plusAmount float64, plus PlusFraction, ch Characterization, opt Options) (*Fluid, []float64) {
	tb.Helper()
	var comps []Component
	var z []float64
	for i, nm := range names {
		c, ok := LibraryComponent(nm)
		if !ok {
			tb.Fatalf("library has no %s", nm)
		}
		comps = append(comps, c)
		z = append(z, amounts[i])
	}
	plus.Z = 1
	pcs, pz, err := SplitPlus(plus, ch)
	if err != nil {
		tb.Fatal(err)
	}
	comps = append(comps, pcs...)
	for _, v := range pz {
		z = append(z, v*plusAmount)
	}
	normalise(z)
	fl, err := NewFluid(comps, DefaultKij(comps, ChuehPrausnitz{}), opt)
	if err != nil {
		tb.Fatal(err)
	}
	return fl, z
}
