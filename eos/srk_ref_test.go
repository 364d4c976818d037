package eos_test

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"dewcell/eos"
)

// srkFluid returns fl's components and interaction coefficients on the
// Soave–Redlich–Kwong equation, volume shift as fl has it.
func srkFluid(t *testing.T, fl *eos.Fluid) *eos.Fluid {
	t.Helper()
	comps := fl.Components()
	n := len(comps)
	kij := make([]float64, n*n)
	for i := range n {
		for j := range n {
			kij[i*n+j] = fl.Kij(i, j)
		}
	}
	s, err := eos.NewFluid(comps, kij, eos.Options{Equation: eos.SRK, VolumeShift: fl.Options().VolumeShift})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestSRKFlashReference: the package's SRK flash against the independent
// reference of indep_test.go written for the SRK constants of Soave (1972)
// (its own Ω_a, Ω_b, κ and cubic; TestSRKLibraryValues checks the package's
// SRK fugacities against a general-purpose library): on two-phase states
// the flash's phases are in equilibrium by the reference (|Δ ln f| <= 1e-10)
// and have its Z (1e-10); the reference's own tangent-plane test and
// lowest-Gibbs-energy split, from its own starts, give the flash's vapour
// fraction (1e-7) and the number of phases.
func TestSRKFlashReference(t *testing.T) {
	o9, z9 := o9Fluid(t)
	type fz struct {
		name string
		fl   *eos.Fluid
		z    []float64
	}
	fluids := []fz{{"O9 on SRK", srkFluid(t, o9), z9}}
	for k := 0; k < 4; k++ {
		cf := drawFluid(k, rand.New(rand.NewPCG(77, uint64(k))))
		fluids = append(fluids, fz{fmt.Sprintf("random %s %d on SRK (%s)", cf.kind, k, cf.how), srkFluid(t, cf.fl), cf.z})
	}
	states := []struct{ t, p float64 }{{377.6, 20e6}, {377.6, 8e6}, {300, 2e6}, {330, 10e6}, {450, 30e6}, {280, 1e6}, {400, 15e6}}
	two := 0
	for _, f := range fluids {
		r := newPRRef(f.fl)
		comps := f.fl.Components()
		fla := eos.NewFlasher(f.fl, nil)
		var res eos.FlashResult
		for _, s := range states {
			if err := fla.Flash(&res, s.t, s.p, f.z); err != nil {
				t.Errorf("%s at %g K, %g Pa: %v", f.name, s.t, s.p, err)
				continue
			}
			zOf := func(x []float64) float64 { return r.zFactor(s.t, s.p, x) }
			st := r.stability(s.t, s.p, f.z, nil, rand.New(rand.NewPCG(1, 2)), 3, comps)
			unstable := st.min.tpd < campTPD
			if res.Phases == 1 {
				if unstable {
					t.Errorf("%s at %g K, %g Pa: one phase, but the reference finds tpd %.3g", f.name, s.t, s.p, st.min.tpd)
				}
				if got := zOf(f.z); relErr(res.L.Z, got) > 1e-10 {
					t.Errorf("%s at %g K, %g Pa: one phase, Z %.12g, reference %.12g", f.name, s.t, s.p, res.L.Z, got)
				}
				continue
			}
			two++
			if !unstable {
				t.Errorf("%s at %g K, %g Pa: two phases, but the reference finds the feed stable (tpd %.3g)", f.name, s.t, s.p, st.min.tpd)
			}
			if df := r.maxLnFDiff(s.t, s.p, res.X, res.Y); !(df <= 1e-10) {
				t.Errorf("%s at %g K, %g Pa: reference |Δ ln f| = %.3g on the flash's phases", f.name, s.t, s.p, df)
			}
			if zl, zv := zOf(res.X), zOf(res.Y); relErr(res.L.Z, zl) > 1e-10 || relErr(res.V.Z, zv) > 1e-10 {
				t.Errorf("%s at %g K, %g Pa: Z_L %.12g, Z_V %.12g; reference %.12g, %.12g", f.name, s.t, s.p, res.L.Z, res.V.Z, zl, zv)
			}
			best, _, ok := r.lowestSplit(s.t, s.p, f.z, comps, st)
			if !ok {
				t.Errorf("%s at %g K, %g Pa: the reference found no split", f.name, s.t, s.p)
				continue
			}
			vf := best.beta
			if r.density(s.t, s.p, best.a) > r.density(s.t, s.p, best.b) {
				vf = 1 - vf
			}
			if relErr(vf, res.Beta) > 1e-7 {
				t.Errorf("%s at %g K, %g Pa: vapour fraction %.10g, reference %.10g", f.name, s.t, s.p, res.Beta, vf)
			}
		}
	}
	if two < 8 {
		t.Errorf("only %d two-phase states: the check needs more", two)
	}
	t.Logf("%d two-phase states", two)
}
