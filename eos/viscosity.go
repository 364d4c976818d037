package eos

import "math"

// Lohrenz–Bray–Clark viscosity.
//
// References:
//
//   - Lohrenz, J., Bray, B.G. and Clark, C.R. (1964). Calculating viscosities
//     of reservoir fluids from their compositions. J. Pet. Technol. 16(10),
//     1171–1176. SPE-915-PA. doi:10.2118/915-PA
//   - Jossi, J.A., Stiel, L.I. and Thodos, G. (1962). The viscosity of pure
//     substances in the dense gaseous and liquid phases. AIChE J. 8(1), 59–63.
//     (Volume and pages from memory.)
//   - Stiel, L.I. and Thodos, G. (1961). The viscosity of nonpolar gases at
//     normal pressures. AIChE J. 7(4), 611–615. doi:10.1002/aic.690070416
//   - Herning, F. and Zipperer, L. (1936). Beitrag zur Berechnung der
//     Zähigkeit technischer Gasgemische aus den Zähigkeitswerten der
//     Einzelbestandteile. Gas- und Wasserfach 79, 49–54. (Title, volume and
//     pages from memory.)
//   - Reid, R.C., Prausnitz, J.M. and Sherwood, T.K. (1977). The Properties of
//     Gases and Liquids, 3rd ed., McGraw-Hill, p. 21 (Zc from ω).

// The correlations are written in the units they were published in: ξ in
// K^(1/6) (g/mol)^(-1/2) atm^(-2/3), which is 1/cP, and μ in cP. They are
// converted at the boundary of ViscosityLBC and stielThodos (paPerAtm is
// declared with the other unit factors in correlations.go).
const paSPerCP = 1e-3 // Pa·s per centipoise, exact

// lbcA holds a1…a5 of the Jossi–Stiel–Thodos (1962) dense-fluid polynomial
// as printed by Lohrenz, Bray and Clark (1964). Some codes use a5 = 0.0093724 instead; the difference is
// below 1e-8 relative for gases and grows with ρr⁴ in liquids.
var lbcA = [5]float64{0.10230, 0.023364, 0.058533, -0.040758, 0.0093324}

// lbcXi returns the viscosity-reducing parameter
//
//	ξ = Tc^(1/6) / (M^(1/2) Pc^(2/3)),  Tc in K, M in g/mol, Pc in atm,
//
// in 1/cP, from tc (K), pc (Pa) and m (kg/mol).
func lbcXi(tc, pc, m float64) float64 {
	cb := math.Cbrt(pc / paPerAtm)
	return math.Pow(tc, 1.0/6) / (math.Sqrt(m*1000) * cb * cb)
}

// stielThodos returns the dilute-gas (low-pressure) viscosity, Pa·s, of a
// nonpolar gas at t (K) with critical temperature tc (K), critical pressure
// pc (Pa) and molar mass m (kg/mol), by Stiel and Thodos (1961):
//
//	μ* ξ = 34.0e−5 Tr^0.94                 Tr ≤ 1.5
//	μ* ξ = 17.78e−5 (4.58 Tr − 1.67)^(5/8)  Tr > 1.5
//
// with μ* in cP and ξ from lbcXi. The two branches differ by 0.13 % at
// Tr = 1.5.
func stielThodos(t, tc, pc, m float64) float64 {
	tr := t / tc
	var muXi float64
	if tr > 1.5 {
		muXi = 17.78e-5 * math.Pow(4.58*tr-1.67, 0.625)
	} else {
		muXi = 34.0e-5 * math.Pow(tr, 0.94)
	}
	return muXi / lbcXi(tc, pc, m) * paSPerCP
}

// estimateVc returns a critical volume, m³/mol, for a component whose Vc is
// not given, from the Pitzer-type relation
//
//	Zc = 0.2918 − 0.0928 ω,  Vc = Zc R Tc / Pc
//
// as given by Reid, Prausnitz and Sherwood (1977), p. 21 (citation as quoted
// in a general-purpose property library; the page was not checked against the
// book). For the ω range NewFluid accepts (−1, 3], Zc ≥ 0.0134 > 0. Against
// the tabulated Vc of Poling et al. (2001) for N2…nC6 it is within 3 %.
func estimateVc(tc, pc, omega float64) float64 {
	return (0.2918 - 0.0928*omega) * R * tc / pc
}

// ViscosityLBC returns the Lohrenz–Bray–Clark viscosity (Pa·s) of a phase of
// composition x at temperature t (K) with molar volume v (m³/mol; pass the
// volume-translated molar volume that the phase's PhaseProps.V gives).
//
// The steps are those of Lohrenz, Bray and Clark (1964):
//
//  1. the dilute-gas viscosity μᵢ* of each component by Stiel and Thodos
//     (1961), see stielThodos;
//  2. the dilute-gas mixture viscosity by Herning and Zipperer (1936),
//     μ* = Σ xᵢ μᵢ* √Mᵢ / Σ xᵢ √Mᵢ;
//  3. the dense-fluid residual by the reduced-density polynomial of Jossi,
//     Stiel and Thodos (1962) with the LBC coefficients a1…a5 (lbcA).
//
// Step 3, with μ and μ* in cP:
//
//	[(μ − μ*) ξm + 1e−4]^(1/4) = a1 + a2 ρr + a3 ρr² + a4 ρr³ + a5 ρr⁴
//
// where ξm is the ξ of stielThodos for the molar averages Σ xᵢ Tcᵢ,
// Σ xᵢ Pcᵢ (atm) and Σ xᵢ Mᵢ (g/mol), and ρr = Vpc / v with Vpc = Σ xᵢ Vcᵢ.
//
// Vcᵢ is the component's Vc, or estimateVc's value when Vc is zero; Vc of
// the heavy pseudo-components is the usual tuning parameter of the method.
// x should be a composition (non-negative, summing to 1), as Flash returns.
//
// Special cases are:
//
//	ViscosityLBC(t, x, +Inf) = μ* + (a1⁴ − 1e−4)/ξm  (a1⁴ = 1.095e−4, not 1e−4)
//	ViscosityLBC(t, x, v) = NaN  if x is all zeros
//
// It panics if len(x) != N(). It does not allocate and is safe for
// concurrent use.
func (f *Fluid) ViscosityLBC(t float64, x []float64, v float64) float64 {
	f.checkLen(x)
	var tpc, ppc, mm, vpc float64
	for i, xi := range x {
		tpc += xi * f.tc[i]
		ppc += xi * f.pc[i]
		mm += xi * f.m[i]
		vpc += xi * f.vc[i]
	}
	xim := lbcXi(tpc, ppc, mm)
	rr := vpc / v
	a := &lbcA
	poly := a[0] + rr*(a[1]+rr*(a[2]+rr*(a[3]+rr*a[4])))
	p2 := poly * poly
	return f.lbcDilute(t, x) + (p2*p2-1e-4)/xim*paSPerCP
}

// lbcDilute returns the Herning–Zipperer mixture of the Stiel–Thodos
// dilute-gas viscosities, Pa·s (steps 1 and 2 of ViscosityLBC).
func (f *Fluid) lbcDilute(t float64, x []float64) float64 {
	var num, den float64
	for i, xi := range x {
		w := xi * math.Sqrt(f.m[i])
		num += w * stielThodos(t, f.tc[i], f.pc[i], f.m[i])
		den += w
	}
	return num / den
}
