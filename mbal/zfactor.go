package mbal

import (
	"errors"
	"fmt"
	"math"

	"dewcell/eos"
)

// ErrCorrelationRange reports an input outside the range over which an
// empirical correlation was fitted. The correlations here are not
// extrapolated: the caller sees the error and decides.
var ErrCorrelationRange = errors.New("outside the range of the correlation")

// Fitted ranges of the Z-factor equations.
const (
	// DAKMinTpr < Tpr ≤ DAKMaxTpr and DAKMinPpr ≤ Ppr < DAKMaxPpr is the
	// range Dranchuk and Abou-Kassem (1975) give for their equation.
	DAKMinTpr, DAKMaxTpr = 1.0, 3.0
	DAKMinPpr, DAKMaxPpr = 0.2, 30.0

	// HYMinTpr ≤ Tpr ≤ HYMaxTpr and 0 < Ppr ≤ HYMaxPpr is the range usually
	// quoted for the Hall–Yarborough (1973) equation (METHODS 4.3; the
	// paper's own statement not checked).
	HYMinTpr, HYMaxTpr = 1.15, 3.0
	HYMaxPpr           = 20.0
)

// The eleven constants of the Dranchuk and Abou-Kassem (1975) fit to the
// Standing–Katz chart (METHODS 4.2).
const (
	dakA1  = 0.3265
	dakA2  = -1.0700
	dakA3  = -0.5339
	dakA4  = 0.01569
	dakA5  = -0.05165
	dakA6  = 0.5475
	dakA7  = -0.7361
	dakA8  = 0.1844
	dakA9  = 0.1056
	dakA10 = 0.6134
	dakA11 = 0.7210
)

// dakLoopTpr bounds the region of more than one root: below it ρr·Z(ρr) is
// not monotone in ρr for every ρr (the equation has a van der Waals loop up
// to Tpr ≈ 1.021); at and above it there is exactly one root, which the tests
// check.
const dakLoopTpr = 1.05

// dak holds the temperature-dependent coefficients of
//
//	Z = 1 + B ρr + C ρr² − D ρr⁵ + E (1 + A11 ρr²) ρr² exp(−A11 ρr²)
type dak struct{ b, c, d, e float64 }

func newDAK(tpr float64) dak {
	t2 := tpr * tpr
	t3 := t2 * tpr
	return dak{
		b: dakA1 + dakA2/tpr + dakA3/t3 + dakA4/(t3*tpr) + dakA5/(t3*t2),
		c: dakA6 + dakA7/tpr + dakA8/t2,
		d: dakA9 * (dakA7/tpr + dakA8/t2),
		e: dakA10 / t3,
	}
}

// z returns Z at reduced density r.
func (k dak) z(r float64) float64 {
	r2 := r * r
	return 1 + k.b*r + k.c*r2 - k.d*r2*r2*r + k.e*(1+dakA11*r2)*r2*math.Exp(-dakA11*r2)
}

// f returns ρr·Z(ρr) − c, whose root is the solution for c = 0.27 Ppr/Tpr,
// and its derivative in ρr.
func (k dak) f(r, c float64) (float64, float64) {
	r2 := r * r
	ex := math.Exp(-dakA11 * r2)
	pz := r + k.b*r2 + k.c*r2*r - k.d*r2*r2*r2 + k.e*(r2*r+dakA11*r2*r2*r)*ex
	dpz := 1 + 2*k.b*r + 3*k.c*r2 - 6*k.d*r2*r2*r +
		k.e*ex*(3*r2+5*dakA11*r2*r2-2*dakA11*r*(r2*r+dakA11*r2*r2*r))
	return pz - c, dpz
}

// lnPhi is the log fugacity coefficient of the gas at reduced density r,
// (Z − 1) − ln Z + ∫₀^ρr (Z − 1)/ρ dρ, integrated in closed form. At a given
// Tpr and Ppr the root with the least ln φ has the least Gibbs energy.
func (k dak) lnPhi(r float64) float64 {
	r2 := r * r
	a := dakA11
	integral := k.b*r + k.c*r2/2 - k.d*r2*r2*r/5 + k.e/(2*a)*(2-(2+a*r2)*math.Exp(-a*r2))
	z := k.z(r)
	return integral + z - 1 - math.Log(z)
}

// solve finds a root of f(ρr) = ρr Z − c between a and b, where f(a) and
// f(b) differ in sign, by Newton steps from r kept inside the bracket,
// bisecting whenever a step would leave it.
func (k dak) solve(c, a, b, r float64) (root float64, iter int, residual float64, ok bool) {
	const maxIter = 200
	fa, _ := k.f(a, c)
	res := math.Inf(1)
	for it := 1; it <= maxIter; it++ {
		f, df := k.f(r, c)
		res = math.Abs(f)
		if f == 0 {
			return r, it, 0, true
		}
		if (f < 0) == (fa < 0) {
			a = r
		} else {
			b = r
		}
		lo, hi := math.Min(a, b), math.Max(a, b)
		next := r - f/df
		if !(next > lo && next < hi) { // also catches df = 0 and NaN
			next = (lo + hi) / 2
		}
		if math.Abs(next-r) <= 1e-14*r || hi-lo <= 1e-15*hi {
			// A collapsed bracket is a root only if f is small there:
			// this guards against a bracket without a sign change.
			fn, _ := k.f(next, c)
			return next, it, math.Abs(fn), math.Abs(fn) <= 1e-10*math.Max(c, 1)
		}
		r = next
	}
	return r, maxIter, res, false
}

// ZFactorDAK returns the gas compressibility factor at pseudo-reduced
// temperature tpr and pressure ppr from the Dranchuk–Abou-Kassem equation, a
// fit of the Benedict–Webb–Rubin form to the Standing–Katz (1942) chart:
//
//	Z = 1 + (A1 + A2/Tpr + A3/Tpr³ + A4/Tpr⁴ + A5/Tpr⁵) ρr + (A6 + A7/Tpr + A8/Tpr²) ρr²
//	      − A9 (A7/Tpr + A8/Tpr²) ρr⁵ + A10 (1 + A11 ρr²) (ρr²/Tpr³) exp(−A11 ρr²),
//	ρr = 0.27 Ppr/(Z Tpr).
//
// The reduced density is found by Newton's method from the ideal-gas value,
// each step kept inside a bracket of the root and replaced by bisection when
// it would leave it. Just above Tpr = 1 the equation has a van der Waals loop
// and, over a narrow band of Ppr near 1, three roots; there the root with the
// least Gibbs energy (least ln φ) is returned.
//
// Special cases: tpr outside (1, 3] or ppr outside [0.2, 30), the range of
// the fit, or either not finite: an error wrapping ErrCorrelationRange. An
// iteration that stops without converging: an error wrapping
// eos.ErrNoConvergence. On error Z is 0.
//
// Reference: Dranchuk, P.M. and Abou-Kassem, J.H. (1975). Calculation of Z
// factors for natural gases using equations of state. J. Can. Pet. Technol.
// 14(3), 34–36. doi:10.2118/75-03-03
func ZFactorDAK(tpr, ppr float64) (float64, error) {
	if !(tpr > DAKMinTpr && tpr <= DAKMaxTpr) || !(ppr >= DAKMinPpr && ppr < DAKMaxPpr) {
		return 0, fmt.Errorf("%w: Dranchuk–Abou-Kassem Z at Tpr = %g, Ppr = %g; fitted for %g < Tpr ≤ %g, %g ≤ Ppr < %g",
			ErrCorrelationRange, tpr, ppr, DAKMinTpr, DAKMaxTpr, DAKMinPpr, DAKMaxPpr)
	}
	k := newDAK(tpr)
	c := 0.27 * ppr / tpr
	// f(0) = −c < 0 and f grows as +ρr⁶ (−D > 0 for Tpr > 0.251), so a
	// doubling search finds the upper end of the bracket.
	hi := 1.0
	for n := 0; ; n++ {
		if f, _ := k.f(hi, c); f > 0 {
			break
		}
		if n == 60 {
			return 0, fmt.Errorf("Dranchuk–Abou-Kassem Z at Tpr = %g, Ppr = %g: %w", tpr, ppr,
				&eos.SolveError{Op: "ZFactorDAK", Iter: n, Residual: c, Err: eos.ErrNoConvergence})
		}
		hi *= 2
	}
	if tpr >= dakLoopTpr {
		return k.root(tpr, ppr, c, 0, hi, math.Min(c, hi/2))
	}
	// Possible loop: bracket every sign change on a fine grid and keep the
	// stable root. Two roots closer than a grid step are a metastable and an
	// unstable one by a spinodal; the root they leave is the stable one.
	const cells = 256
	var best, bestLnPhi float64
	found := false
	lo, flo := 0.0, -c
	for i := 1; i <= cells; i++ {
		r := hi * float64(i) / cells
		fr, _ := k.f(r, c)
		if (flo < 0) != (fr < 0) {
			z, err := k.root(tpr, ppr, c, lo, r, (lo+r)/2)
			if err != nil {
				return 0, err
			}
			if lp := k.lnPhi(c / z); !found || lp < bestLnPhi {
				best, bestLnPhi, found = z, lp, true
			}
		}
		lo, flo = r, fr
	}
	if !found { // cannot happen: f(0) < 0 < f(hi)
		return 0, fmt.Errorf("Dranchuk–Abou-Kassem Z at Tpr = %g, Ppr = %g: %w", tpr, ppr,
			&eos.SolveError{Op: "ZFactorDAK", Iter: cells, Residual: c, Err: eos.ErrNoConvergence})
	}
	return best, nil
}

// root solves between a and b, where f changes sign, from r0 and returns Z.
func (k dak) root(tpr, ppr, c, a, b, r0 float64) (float64, error) {
	r, it, res, ok := k.solve(c, a, b, r0)
	if !ok || !(r > 0) {
		return 0, fmt.Errorf("Dranchuk–Abou-Kassem Z at Tpr = %g, Ppr = %g: %w", tpr, ppr,
			&eos.SolveError{Op: "ZFactorDAK", Iter: it, Residual: res, Err: eos.ErrNoConvergence})
	}
	return c / r, nil // Z = 0.27 Ppr/(ρr Tpr)
}

// ZFactorHallYarborough returns the gas compressibility factor at
// pseudo-reduced temperature tpr and pressure ppr from the Hall–Yarborough
// equation, a Carnahan–Starling hard-sphere form fitted to the Standing–Katz
// chart. With t = 1/Tpr and y the reduced density it solves
//
//	−X1 Ppr + (y + y² + y³ − y⁴)/(1 − y)³ − X2 y² + X3 y^X4 = 0
//	X1 = 0.06125 t exp[−1.2 (1 − t)²],  X2 = 14.76 t − 9.76 t² + 4.58 t³,
//	X3 = 90.7 t − 242.2 t² + 42.4 t³,   X4 = 2.18 + 2.82 t,
//	Z = X1 Ppr / y
//
// by Newton's method kept inside a bracket of the root in (0, 1), with
// bisection when a step would leave it. Over the range below the left-hand
// side increases with y, so the root is unique.
//
// Special cases: tpr outside [1.15, 3] or ppr outside (0, 20], or either
// not finite: an error wrapping ErrCorrelationRange; no convergence: an error
// wrapping eos.ErrNoConvergence. On error Z is 0.
//
// Reference: Hall, K.R. and Yarborough, L. (1973). A new equation of state
// for Z-factor calculations. Oil Gas J. 71(25), 82–92.
func ZFactorHallYarborough(tpr, ppr float64) (float64, error) {
	if !(tpr >= HYMinTpr && tpr <= HYMaxTpr) || !(ppr > 0 && ppr <= HYMaxPpr) {
		return 0, fmt.Errorf("%w: Hall–Yarborough Z at Tpr = %g, Ppr = %g; quoted for %g ≤ Tpr ≤ %g, 0 < Ppr ≤ %g",
			ErrCorrelationRange, tpr, ppr, HYMinTpr, HYMaxTpr, HYMaxPpr)
	}
	t := 1 / tpr
	x1 := 0.06125 * t * math.Exp(-1.2*(1-t)*(1-t))
	x2 := 14.76*t - 9.76*t*t + 4.58*t*t*t
	x3 := 90.7*t - 242.2*t*t + 42.4*t*t*t
	x4 := 2.18 + 2.82*t
	f := func(y float64) (float64, float64) {
		y2, y3, y4 := y*y, y*y*y, y*y*y*y
		u := 1 - y
		v := -x1*ppr + (y+y2+y3-y4)/(u*u*u) - x2*y2 + x3*math.Pow(y, x4)
		d := (1+4*y+4*y2-4*y3+y4)/(u*u*u*u) - 2*x2*y + x3*x4*math.Pow(y, x4-1)
		return v, d
	}
	lo, hi := 0.0, 1.0 // F(0) = −X1 Ppr < 0 and F → +∞ as y → 1
	y := 0.0125 * ppr * t * math.Exp(-1.2*(1-t)*(1-t))
	if !(y > lo && y < hi) {
		y = 0.5
	}
	const maxIter = 200
	res := math.Inf(1)
	for it := 1; it <= maxIter; it++ {
		v, d := f(y)
		res = math.Abs(v)
		if v == 0 {
			return x1 * ppr / y, nil
		}
		if v < 0 {
			lo = y
		} else {
			hi = y
		}
		next := y - v/d
		if !(d > 0) || !(next > lo && next < hi) {
			next = (lo + hi) / 2
		}
		if math.Abs(next-y) <= 1e-14*y || hi-lo <= 1e-15 {
			return x1 * ppr / next, nil
		}
		y = next
	}
	return 0, fmt.Errorf("Hall–Yarborough Z at Tpr = %g, Ppr = %g: %w", tpr, ppr,
		&eos.SolveError{Op: "ZFactorHallYarborough", Iter: maxIter, Residual: res, Err: eos.ErrNoConvergence})
}
