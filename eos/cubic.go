package eos

import (
	"fmt"
	"math"
)

// A Cubic is a two-constant cubic equation of state of the van der Waals
// family, written with the two constants δ1, δ2 of its attractive term:
//
//	P = R T/(v − b) − a(T)/((v + δ1 b)(v + δ2 b))
//
// (Michelsen and Mollerup 2007, ch. 3; in the u, w notation of Reid,
// Prausnitz and Poling 1987, u = δ1 + δ2 and w = δ1 δ2). The pure-component
// constants are a_c = Ω_a R² Tc²/Pc and b = Ω_b R Tc/Pc, and the temperature
// dependence is Soave's α = [1 + κ(ω)(1 − √(T/Tc))]², κ a polynomial of the
// acentric factor (see Alpha). PR76Cubic, PR78Cubic and SRKCubic give the
// published equations; NewCubic any other of the family.
//
// References:
//   - Soave, G. (1972). Equilibrium constants from a modified Redlich–Kwong
//     equation of state. Chem. Eng. Sci. 27, 1197–1203.
//   - Peng, D.-Y. and Robinson, D.B. (1976). A new two-constant equation of
//     state. Ind. Eng. Chem. Fundam. 15(1), 59–64.
//   - Robinson, D.B. and Peng, D.-Y. (1978). The characterization of the
//     heptanes and heavier fractions for the GPA Peng–Robinson programs. GPA
//     Research Report RR-28.
//   - Reid, R.C., Prausnitz, J.M. and Poling, B.E. (1987). The Properties of
//     Gases and Liquids, 4th ed. McGraw-Hill, Table 3-5.
type Cubic struct {
	name           string
	d1, d2         float64 // δ1, δ2
	u, w, dd       float64 // δ1 + δ2, δ1 δ2, δ1 − δ2
	omegaA, omegaB float64
	zc             float64 // critical compressibility factor of a pure fluid
	alpha          Alpha
	// Ω_a R² and Ω_b R; for the published cubics constant expressions,
	// rounded once, as a_c and b always were.
	omegaAR2, omegaBR float64
}

// Alpha is the temperature function of a cubic's attraction,
// α = [1 + κ(1 − √(T/Tc))]², with κ a cubic polynomial of the acentric factor
// ω: κ = k0 + k1 ω + k2 ω² + k3 ω³, and a second polynomial Heavy for
// ω > HeavyAbove when HeavyAbove is finite.
type Alpha struct {
	Kappa      [4]float64
	Heavy      [4]float64
	HeavyAbove float64 // +Inf: Kappa for every ω
}

// KappaOf returns κ(ω).
func (a Alpha) KappaOf(w float64) float64 {
	k := a.Kappa
	if w > a.HeavyAbove {
		k = a.Heavy
	}
	return k[0] + w*(k[1]+w*(k[2]+w*k[3]))
}

// Constants of the published cubics from their critical-point conditions
// (a triple root of the cubic in Z), unrounded.
const (
	// SRK: Ω_b = (2^(1/3) − 1)/3, Ω_a = 1/(9 (2^(1/3) − 1)), Z_c = 1/3
	// (Soave 1972 prints 0.42747 and 0.08664).
	srkOmegaA = 0.42748023354034140439
	srkOmegaB = 0.08664034996495772159
	// PR: Z_c from the same conditions (Peng and Robinson 1976 print
	// 0.307); METHODS C1.
	prZc = 0.3074013087
)

// PR76Cubic is the Peng–Robinson (1976) equation: δ1,2 = 1 ± √2 and
// κ = 0.37464 + 1.54226 ω − 0.26992 ω² for every component.
func PR76Cubic() Cubic {
	return Cubic{
		name: "PR76",
		d1:   1 + math.Sqrt2, d2: 1 - math.Sqrt2,
		u: 2, w: -1, dd: 2 * math.Sqrt2,
		omegaA: OmegaA, omegaB: OmegaB, zc: prZc,
		omegaAR2: OmegaA * R * R, omegaBR: OmegaB * R,
		alpha: Alpha{Kappa: [4]float64{0.37464, 1.54226, -0.26992, 0}, HeavyAbove: math.Inf(1)},
	}
}

// PR78Cubic is PR76Cubic with the Robinson–Peng (1978) κ = 0.379642 +
// 1.48503 ω − 0.164423 ω² + 0.016666 ω³ for ω > 0.491 (Robinson and Peng
// write "ω > 0.49"; 0.491 follows the general-purpose implementations used
// for the reference data in testdata/).
func PR78Cubic() Cubic {
	c := PR76Cubic()
	c.name = "PR78"
	c.alpha.Heavy = [4]float64{0.379642, 1.48503, -0.164423, 0.016666}
	c.alpha.HeavyAbove = 0.491
	return c
}

// SRKCubic is the Soave–Redlich–Kwong equation (Soave 1972): δ1 = 1, δ2 = 0
// and κ = 0.480 + 1.574 ω − 0.176 ω².
func SRKCubic() Cubic {
	return Cubic{
		name: "SRK",
		d1:   1, d2: 0,
		u: 1, w: 0, dd: 1,
		omegaA: srkOmegaA, omegaB: srkOmegaB, zc: 1.0 / 3,
		omegaAR2: srkOmegaA * R * R, omegaBR: srkOmegaB * R,
		alpha: Alpha{Kappa: [4]float64{0.480, 1.574, -0.176, 0}, HeavyAbove: math.Inf(1)},
	}
}

// NewCubic returns the cubic of constants δ1 > δ2 ≥ −1 (so that v + δ b stays
// positive for v > b), with Ω_a and Ω_b found from the critical-point
// conditions: the cubic in Z has a triple root Z_c at the critical point of a
// pure fluid.
func NewCubic(name string, delta1, delta2 float64, alpha Alpha) (Cubic, error) {
	if !(delta1 > delta2) || !(delta2 >= -1) || math.IsInf(delta1, 0) {
		return Cubic{}, fmt.Errorf("cubic %q: δ1 = %g, δ2 = %g, want finite δ1 > δ2 >= -1", name, delta1, delta2)
	}
	c := Cubic{name: name, d1: delta1, d2: delta2, u: delta1 + delta2, w: delta1 * delta2, dd: delta1 - delta2, alpha: alpha}
	c.omegaA, c.omegaB, c.zc = criticalConstants(c.u, c.w)
	c.omegaAR2, c.omegaBR = c.omegaA*R*R, c.omegaB*R
	return c, nil
}

// criticalConstants solves the triple-root conditions of
// Z³ + ((u−1)B − 1) Z² + (A + (w−u)B² − uB) Z − (AB + wB²(B+1)) = 0:
// 3 Z_c = 1 − (u−1)B, 3 Z_c² = A + (w−u)B² − uB, Z_c³ = AB + wB²(B+1),
// for B = Ω_b by bisection, then A = Ω_a and Z_c.
func criticalConstants(u, w float64) (omegaA, omegaB, zc float64) {
	at := func(b float64) (a, z, resid float64) {
		z = (1 - (u-1)*b) / 3
		a = 3*z*z - (w-u)*b*b + u*b
		return a, z, z*z*z - (a*b + w*b*b*(b+1))
	}
	lo, hi := 1e-6, 0.3
	_, _, rlo := at(lo)
	for range 200 {
		mid := 0.5 * (lo + hi)
		_, _, r := at(mid)
		if (r > 0) == (rlo > 0) {
			lo, rlo = mid, r
		} else {
			hi = mid
		}
	}
	b := 0.5 * (lo + hi)
	a, z, _ := at(b)
	return a, b, z
}

// Name returns the cubic's name ("PR78", "PR76", "SRK", or NewCubic's).
func (c Cubic) Name() string { return c.name }

// Deltas returns δ1 and δ2.
func (c Cubic) Deltas() (delta1, delta2 float64) { return c.d1, c.d2 }

// Omegas returns Ω_a and Ω_b.
func (c Cubic) Omegas() (omegaA, omegaB float64) { return c.omegaA, c.omegaB }

// Zc returns the critical compressibility factor of a pure fluid.
func (c Cubic) Zc() float64 { return c.zc }

// Alpha returns the temperature function.
func (c Cubic) Alpha() Alpha { return c.alpha }

// coefficients returns c2, c1, c0 of the cubic in Z, Z³ + c2 Z² + c1 Z + c0,
// at reduced parameters A = a P/(RT)² and B = b P/(RT). For δ1,2 = 1 ± √2
// they are, operation for operation, −(1 − B), A − 3B² − 2B and
// −(AB − B² − B³).
func (c *Cubic) coefficients(A, B float64) (c2, c1, c0 float64) {
	return (c.u-1)*B - 1, A + (c.w-c.u)*B*B - c.u*B, -(A*B + c.w*B*B + c.w*B*B*B)
}
