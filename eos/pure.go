package eos

import (
	"fmt"
	"math"
)

// PureSaturationPressure returns the vapour pressure (Pa) of component c at
// t (K) on the cubic equation eq: the pressure where the liquid and
// vapour roots have equal fugacity. Newton's method on ln P uses
//
//	d(ln φ_L − ln φ_V)/d ln P = Z_L − Z_V,
//
// started from the Lee–Kesler-type estimate log10(P/Pc) = 7/3 (1 + ω)(1 − Tc/T)
// and kept inside a bracket where the cubic has three roots.
//
// Special cases: t ≥ Tc or t ≤ 0: an error wrapping ErrBadState; an invalid
// component: ErrBadComponent.
func PureSaturationPressure(c Component, eq Equation, t float64) (float64, error) {
	if err := c.validate(); err != nil {
		return 0, err
	}
	if !(t > 0 && t < c.Tc) {
		return 0, &SolveError{Op: "PureSaturationPressure", Err: fmt.Errorf("%w: T = %g K is not below Tc = %g K", ErrBadState, t, c.Tc)}
	}
	fl, err := NewFluid([]Component{c}, nil, Options{Equation: eq})
	if err != nil {
		return 0, err
	}
	ts := newTState(1)
	fl.setT(&ts, t)
	a, b := ts.a[0], fl.b[0]
	cb := &fl.cubic
	rt := R * t
	// gap returns ln φ_L − ln φ_V and Z_L − Z_V, or ok = false when the cubic
	// has one root; vapourLike then says which side of the loop p is on.
	gap := func(p float64) (d, dz float64, ok, vapourLike bool) {
		A, B := a*p/(rt*rt), b*p/rt
		r, nr := cubicRoots(cb.coefficients(A, B))
		lo, hi := math.Inf(1), math.Inf(-1)
		for k := 0; k < nr; k++ {
			if r[k] > B {
				lo, hi = min(lo, r[k]), max(hi, r[k])
			}
		}
		if lo == hi {
			// a lone root with more volume than the EOS critical volume is vapour-like
			return 0, 0, false, lo*rt/p > cb.zc*R*c.Tc/c.Pc
		}
		lnphi := func(z float64) float64 {
			return z - 1 - math.Log(z-B) - A/(cb.dd*B)*math.Log((z+cb.d1*B)/(z+cb.d2*B))
		}
		return lnphi(lo) - lnphi(hi), lo - hi, true, false
	}
	pLo, pHi := 0.0, c.Pc
	lnP := math.Log(c.Pc) + math.Ln10*7.0/3.0*(1+c.Omega)*(1-c.Tc/t)
	for it := 0; it < 200; it++ {
		p := math.Exp(lnP)
		d, dz, ok, vapourLike := gap(p)
		if !ok {
			if vapourLike {
				pLo = max(pLo, p)
			} else {
				pHi = min(pHi, p)
			}
			lnP = math.Log(0.5 * (pLo + pHi))
			if pLo == 0 {
				lnP = math.Log(0.5 * pHi)
			}
			continue
		}
		// d > 0: the liquid is less stable, the pressure is below Psat.
		if d > 0 {
			pLo = max(pLo, p)
		} else {
			pHi = min(pHi, p)
		}
		step := -d / dz
		if math.Abs(d) < 1e-14 || math.Abs(step) < 1e-15 {
			return p, nil
		}
		next := lnP + step
		if pn := math.Exp(next); pn <= pLo || pn >= pHi {
			if pLo > 0 {
				next = math.Log(0.5 * (pLo + pHi))
			} else {
				next = math.Log(0.5 * pHi)
			}
		}
		lnP = next
	}
	return 0, &SolveError{Op: "PureSaturationPressure", Iter: 200, Err: ErrNoConvergence}
}
