package eos

// Property correlations for petroleum fractions. Each correlation is coded in
// the units it was published in (°R, psia, ft³, g/mol) and converted to SI at
// the boundary of this file (PseudoComponent).
//
// Fitting ranges, from memory unless stated: Kesler–Lee (1976) Tb about
// 100–850 °F, claimed usable to 1200 °F; Riazi–Daubert (1980) Tb 100–850 °F,
// M 70–300 g/mol; Riazi–Daubert (1987) (Tb, SG) form Tb about 80–650 °F (as
// tabulated with the coefficients); Twu (1984) n-alkanes through about C100
// and heavier petroleum and coal-tar fractions; Søreide (1989) C7+ TBP
// fractions of North Sea reservoir fluids. Outside them the correlations
// still return numbers: PseudoComponent rejects those that are unphysical
// (ErrCorrelationRange), not those that are merely extrapolated.
//
// References:
//
//   - Kesler, M.G. and Lee, B.I. (1976). Improve prediction of enthalpy of
//     fractions. Hydrocarbon Processing 55(3), 153–158.
//   - Lee, B.I. and Kesler, M.G. (1975). A generalized thermodynamic correlation
//     based on three-parameter corresponding states. AIChE J. 21(3), 510–527.
//     doi:10.1002/aic.690210313
//   - Edmister, W.C. (1958). Applied hydrocarbon thermodynamics, part 4:
//     compressibility factors and equations of state. Petroleum Refiner 37(4),
//     173–179.
//   - Riazi, M.R. and Daubert, T.E. (1980). Simplify property predictions.
//     Hydrocarbon Processing 59(3), 115–116.
//   - Riazi, M.R. and Daubert, T.E. (1987). Characterization parameters for
//     petroleum fractions. Ind. Eng. Chem. Res. 26(4), 755–759.
//     doi:10.1021/ie00064a023
//   - Twu, C.H. (1984). An internally consistent correlation for predicting the
//     critical properties and molecular weights of petroleum and coal-tar
//     liquids. Fluid Phase Equilib. 16, 137–150. doi:10.1016/0378-3812(84)85027-X
//   - Søreide, I. (1989). Improved Phase Behavior Predictions of Petroleum
//     Reservoir Fluids from a Cubic Equation of State. Dr.Ing. thesis, NTH,
//     Trondheim.
//   - Whitson, C.H. (1983). Characterizing hydrocarbon plus fractions. SPEJ
//     23(4), 683–694.
//   - Jhaveri, B.S. and Youngren, G.K. (1988). Three-parameter modification of
//     the Peng–Robinson equation of state to improve volumetric predictions.
//     SPE Reservoir Engineering 3(3), 1033–1040.

import (
	"errors"
	"fmt"
	"math"

	"dewcell/internal/phys"
)

// Unit factors for the field-unit correlations, exact (package phys).
const (
	rankinePerKelvin = phys.RankinePerKelvin // °R per K
	paPerPsia        = phys.PaPerPsi         // Pa per lbf/in²
	paPerAtm         = phys.PaPerAtm         // Pa per standard atmosphere
	m3PerFt3         = phys.M3PerFt3         // m³ per ft³
	kgPerLb          = phys.KgPerPound       // kg per lb
	m3kgPerFt3lb     = phys.M3KgPerFt3Lb     // ft³/lbm → m³/kg
)

// ErrCorrelationRange reports a correlation that gave unphysical properties
// (Tc not above Tb, Pc not positive, ...) for its input: the fraction lies
// outside the range the correlation was fitted to.
var ErrCorrelationRange = errors.New("correlation outside its range")

func (m SplitMethod) String() string {
	switch m {
	case SplitGamma:
		return "gamma"
	case SplitExponential:
		return "exponential"
	case SplitNone:
		return "none"
	case SplitGammaQuadrature:
		return "gamma-quadrature"
	}
	return fmt.Sprintf("SplitMethod(%d)", int(m))
}

func (c CritCorrelation) String() string {
	switch c {
	case KeslerLee:
		return "Kesler–Lee"
	case RiaziDaubert:
		return "Riazi–Daubert (1980)"
	case Twu:
		return "Twu"
	case RiaziDaubert1987:
		return "Riazi–Daubert (1987)"
	}
	return fmt.Sprintf("CritCorrelation(%d)", int(c))
}

func (a AcentricMethod) String() string {
	switch a {
	case AcentricKeslerLee:
		return "Kesler–Lee"
	case AcentricEdmister:
		return "Edmister"
	}
	return fmt.Sprintf("AcentricMethod(%d)", int(a))
}

// soreideTb returns the normal boiling point, °R, of a fraction of molar mass
// m (g/mol) and specific gravity sg, Søreide (1989):
//
//	Tb = 1928.3 − 1.695e5 M^−0.03522 SG^3.266 exp(−4.922e−3 M − 4.7685 SG + 3.462e−3 M SG)
func soreideTb(m, sg float64) float64 {
	return 1928.3 - 1.695e5*math.Pow(m, -0.03522)*math.Pow(sg, 3.266)*
		math.Exp(-4.922e-3*m-4.7685*sg+3.462e-3*m*sg)
}

// keslerLeeTcPc returns Tc (°R) and Pc (psia) from Tb (°R) and SG, Kesler and
// Lee (1976).
func keslerLeeTcPc(tb, sg float64) (tc, pc float64) {
	tc = 341.7 + 811*sg + (0.4244+0.1174*sg)*tb + (0.4669-3.2623*sg)*1e5/tb
	lnpc := 8.3634 - 0.0566/sg -
		(0.24244+2.2898/sg+0.11857/(sg*sg))*1e-3*tb +
		(1.4685+3.648/sg+0.47227/(sg*sg))*1e-7*tb*tb -
		(0.42019+1.6977/(sg*sg))*1e-10*tb*tb*tb
	return tc, math.Exp(lnpc)
}

// keslerLeeM returns the molar mass (g/mol) from Tb (°R) and SG, Kesler and
// Lee (1976).
func keslerLeeM(tb, sg float64) float64 {
	return -12272.6 + 9486.4*sg + (4.6523-3.3287*sg)*tb +
		(1-0.77084*sg-0.02058*sg*sg)*(1.3437-720.79/tb)*1e7/tb +
		(1-0.80882*sg+0.02226*sg*sg)*(1.8828-181.98/tb)*1e12/(tb*tb*tb)
}

// riaziDaubert1980 returns M (g/mol), Tc (°R), Pc (psia) and Vc (ft³/lbm) from
// Tb (°R) and SG, Riazi and Daubert (1980): θ = a Tb^b SG^c.
func riaziDaubert1980(tb, sg float64) (m, tc, pc, vc float64) {
	f := func(a, b, c float64) float64 { return a * math.Pow(tb, b) * math.Pow(sg, c) }
	return f(4.5673e-5, 2.1962, -1.0164),
		f(24.2787, 0.58848, 0.3596),
		f(3.12281e9, -2.3125, 2.3201),
		f(7.5214e-3, 0.2896, -0.7666)
}

// riaziDaubert1987 returns M (g/mol), Tc (°R), Pc (psia) and Vc (ft³/lbm) from
// Tb (°R) and SG, Riazi and Daubert (1987):
// θ = a Tb^b SG^c exp(d Tb + e SG + f Tb SG).
func riaziDaubert1987(tb, sg float64) (m, tc, pc, vc float64) {
	f := func(a, b, c, d, e, g float64) float64 {
		return a * math.Pow(tb, b) * math.Pow(sg, c) * math.Exp(d*tb+e*sg+g*tb*sg)
	}
	return f(581.96, 0.97476, 6.51274, 5.43076e-4, -9.53384, 1.11056e-3),
		f(10.6443, 0.81067, 0.53691, -5.1747e-4, -0.54444, 3.5995e-4),
		f(6.162e6, -0.4844, 4.0846, -4.725e-3, -4.8014, 3.1939e-3),
		f(6.233e-4, 0.7506, -1.2028, -1.4679e-3, -0.26404, 1.095e-3)
}

// twu returns M (g/mol), Tc (°R), Pc (psia) and Vc (ft³/lbmol) from Tb (°R)
// and SG, Twu (1984): n-alkane reference properties at the same Tb, then
// perturbation in specific gravity. The reference molar mass is found by
// safeguarded Newton iteration on Twu's Tb(M°) relation; the error says why
// that failed (Tb outside the relation's range, or a *SolveError wrapping
// ErrNoConvergence).
func twu(tb, sg float64) (m, tc, pc, vc float64, err error) {
	tc0 := tb / (0.533272 + 0.191017e-3*tb + 0.779681e-7*tb*tb - 0.284376e-10*tb*tb*tb +
		0.959468e28/math.Pow(tb, 13))
	a := 1 - tb/tc0
	pc0 := math.Pow(3.83354+1.19629*math.Sqrt(a)+34.8888*a+36.1952*a*a+104.193*math.Pow(a, 4), 2)
	vc0 := math.Pow(1-(0.419869-0.505839*a-1.56436*a*a*a-9481.70*math.Pow(a, 14)), -8)
	sg0 := 0.843593 - 0.128624*a - 3.36159*a*a*a - 13749.5*math.Pow(a, 12)
	theta, err := twuTheta(tb)
	if err != nil {
		return 0, 0, 0, 0, err
	}
	rtb := math.Sqrt(tb)
	ratio := func(f float64) float64 { r := (1 + 2*f) / (1 - 2*f); return r * r }

	dT := math.Exp(5*(sg0-sg)) - 1
	fT := dT * (-0.362456/rtb + (0.0398285-0.948125/rtb)*dT)
	tc = tc0 * ratio(fT)

	dV := math.Exp(4*(sg0*sg0-sg*sg)) - 1
	fV := dV * (0.466590/rtb + (-0.182421+3.01721/rtb)*dV)
	vc = vc0 * ratio(fV)

	dP := math.Exp(0.5*(sg0-sg)) - 1
	fP := dP * ((2.53262 - 46.1955/rtb - 0.00127885*tb) + (-11.4277+252.140/rtb+0.00230535*tb)*dP)
	pc = pc0 * (tc / tc0) * (vc0 / vc) * ratio(fP)

	dM := math.Exp(5*(sg0-sg)) - 1
	x := math.Abs(0.0123420 - 0.328086/rtb)
	fM := dM * (x + (-0.0175691+0.193168/rtb)*dM)
	m = math.Exp(theta * ratio(fM))
	return m, tc, pc, vc, nil
}

// twuTb is Twu's n-alkane boiling point (°R) as a function of θ = ln M°, and
// its derivative dTb/dθ.
func twuTb(theta float64) (tb, dtb float64) {
	e := math.Exp(5.71419 + 2.71579*theta - 0.286590*theta*theta - 39.8544/theta - 0.122488/(theta*theta))
	tb = e - 24.7522*theta + 35.3155*theta*theta
	dtb = e*(2.71579-2*0.286590*theta+39.8544/(theta*theta)+2*0.122488/(theta*theta*theta)) -
		24.7522 + 2*35.3155*theta
	return tb, dtb
}

// twuTheta solves twuTb(θ) = tb for θ = ln M° on M° in [20, 10⁴] g/mol, where
// twuTb increases monotonically.
func twuTheta(tb float64) (float64, error) {
	lo, hi := math.Log(20), math.Log(1e4)
	tlo, _ := twuTb(lo)
	thi, _ := twuTb(hi)
	if !(tb > tlo && tb < thi) {
		return 0, fmt.Errorf("Twu (1984) n-alkane reference needs %.0f °R < Tb < %.0f °R, got %.6g °R",
			tlo, thi, tb)
	}
	theta := math.Log(100) // n-heptane region; Newton converges in a few steps
	if d := 10.44 - 0.0052*tb; d > 1 {
		theta = math.Log(tb / d) // Twu's suggested start
	}
	theta = min(max(theta, lo), hi)
	const maxIter = 100
	for it := 0; it < maxIter; it++ {
		f, df := twuTb(theta)
		f -= tb
		if f > 0 {
			hi = theta
		} else {
			lo = theta
		}
		step := f / df
		next := theta - step
		if !(next > lo && next < hi) || df <= 0 {
			next = 0.5 * (lo + hi) // bisection keeps the bracket
		}
		if math.Abs(next-theta) < 1e-13*math.Abs(theta) {
			return next, nil
		}
		theta = next
	}
	return 0, &SolveError{Op: "Twu", Iter: maxIter, Residual: hi - lo, Err: ErrNoConvergence}
}

// leeKeslerOmega returns the acentric factor from the Lee and Kesler (1975)
// vapour-pressure relation evaluated at the normal boiling point; tb and tc in
// the same temperature unit, pcAtm the critical pressure in atmospheres.
//
//	ω = [−ln Pc − 5.92714 + 6.09648/Tbr + 1.28862 ln Tbr − 0.169347 Tbr⁶]
//	    / [15.2518 − 15.6875/Tbr − 13.4721 ln Tbr + 0.43577 Tbr⁶]
func leeKeslerOmega(tb, tc, pcAtm float64) float64 {
	tbr := tb / tc
	t6 := math.Pow(tbr, 6)
	return (-math.Log(pcAtm) - 5.92714 + 6.09648/tbr + 1.28862*math.Log(tbr) - 0.169347*t6) /
		(15.2518 - 15.6875/tbr - 13.4721*math.Log(tbr) + 0.43577*t6)
}

// keslerLeeOmega returns the Kesler and Lee (1976) acentric factor: the Lee–
// Kesler (1975) relation for Tbr < 0.8, and their Watson-factor relation for
// heavier fractions,
//
//	ω = −7.904 + 0.1352 Kw − 0.007465 Kw² + 8.359 Tbr + (1.408 − 0.01063 Kw)/Tbr,
//
// with Kw = Tb^(1/3)/SG (Tb in °R). tb, tc in °R, pc in psia.
func keslerLeeOmega(tb, tc, pc, sg float64) float64 {
	tbr := tb / tc
	if tbr < 0.8 {
		return leeKeslerOmega(tb, tc, pc*paPerPsia/paPerAtm)
	}
	kw := math.Cbrt(tb) / sg
	return -7.904 + 0.1352*kw - 0.007465*kw*kw + 8.359*tbr + (1.408-0.01063*kw)/tbr
}

// edmisterOmega returns the Edmister (1958) acentric factor,
//
//	ω = (3/7) log10(Pc / 1 atm) / (Tc/Tb − 1) − 1,
//
// tb and tc in the same unit, pcAtm in atmospheres.
func edmisterOmega(tb, tc, pcAtm float64) float64 {
	return 3.0/7.0*math.Log10(pcAtm)/(tc/tb-1) - 1
}

// whitsonSG returns the specific gravity of a fraction of molar mass m (g/mol)
// with Watson characterization factor kw, Whitson (1983):
//
//	SG = 6.0108 M^0.17947 Kw^−1.18241
func whitsonSG(m, kw float64) float64 {
	return 6.0108 * math.Pow(m, 0.17947) * math.Pow(kw, -1.18241)
}

// whitsonKw is the inverse of whitsonSG: Kw = 4.5579 M^0.15178 SG^−0.84573.
func whitsonKw(m, sg float64) float64 {
	return 4.5579 * math.Pow(m, 0.15178) * math.Pow(sg, -0.84573)
}

// jhaveriYoungrenShift returns the Peneloux shift s = c/b of a paraffinic
// pseudo-component of molar mass m (g/mol) for Peng–Robinson, Jhaveri and
// Youngren (1988): s = 1 − 2.258/M^0.1823.
func jhaveriYoungrenShift(m float64) float64 {
	return 1 - 2.258/math.Pow(m, 0.1823)
}

// PenelouxSRKShift returns the dimensionless volume shift s = c/b of the
// Soave–Redlich–Kwong equation for a component of acentric factor omega, by
// Peneloux, Rauzy and Fréze (1982):
//
//	c = 0.40768 (R Tc/Pc) (0.29441 − Z_RA),  Z_RA = 0.29056 − 0.08775 ω,
//
// the Rackett compressibility Z_RA estimated from ω (Yamada and Gunn 1973),
// so that s = 0.40768 (0.29441 − Z_RA)/Ω_b with the SRK Ω_b. The shifts of
// the component library and of PseudoComponent are Peng–Robinson's: an SRK
// fluid takes these instead.
//
// References: Péneloux, A., Rauzy, E. and Fréze, R. (1982). A consistent
// correction for Redlich–Kwong–Soave volumes. Fluid Phase Equilib. 8, 7–23.
// Yamada, T. and Gunn, R.D. (1973). Saturated liquid molar volumes. The
// Rackett equation. J. Chem. Eng. Data 18(2), 234–236.
func PenelouxSRKShift(omega float64) float64 {
	zra := 0.29056 - 0.08775*omega
	return 0.40768 * (0.29441 - zra) / srkOmegaB
}

// PseudoComponent returns a petroleum pseudo-component of molar mass m
// (kg/mol) and specific gravity sg (60/60 °F) with the correlations chosen in
// c (only c.Correlation and c.Acentric are used):
//
//   - Tb from Søreide (1989);
//   - Tc and Pc from c.Correlation, from (Tb, SG);
//   - ω from c.Acentric, with those Tc and Pc;
//   - Vc from Riazi–Daubert (1980) for KeslerLee and RiaziDaubert, from
//     Riazi–Daubert (1987) for RiaziDaubert1987 and from Twu (1984) for Twu;
//   - Shift from the Jhaveri–Youngren (1988) paraffin constants.
//
// The error wraps ErrBadPlus for bad input (m not in (0, 2] kg/mol, sg not
// positive) and ErrCorrelationRange when the correlations give unphysical
// properties (Tb not in (0.4 Tc, Tc), Pc not in (0, 10 MPa), ω not in
// (−1, 3), Vc ≤ 0); the component is then zero.
func PseudoComponent(name string, m, sg float64, c Characterization) (Component, error) {
	switch {
	case name == "":
		return Component{}, &PlusError{Field: "name", Msg: "is empty"}
	case !(m > 0 && m <= maxPlusM):
		return Component{}, &PlusError{Field: "M", Msg: fmt.Sprintf("= %g kg/mol, want 0 < M <= %g kg/mol", m, maxPlusM)}
	case !(sg > 0 && sg < math.Inf(1)):
		return Component{}, &PlusError{Field: "SG", Msg: fmt.Sprintf("= %g, want a finite value > 0", sg)}
	case !c.Correlation.valid():
		return Component{}, &PlusError{Field: "Characterization.Correlation", Msg: fmt.Sprintf("= %d, unknown", int(c.Correlation))}
	case !c.Acentric.valid():
		return Component{}, &PlusError{Field: "Characterization.Acentric", Msg: fmt.Sprintf("= %d, unknown", int(c.Acentric))}
	}
	return pseudoComponent(name, m, sg, c.Correlation, c.Acentric)
}

func (c CritCorrelation) valid() bool { return c >= KeslerLee && c <= RiaziDaubert1987 }
func (a AcentricMethod) valid() bool  { return a == AcentricKeslerLee || a == AcentricEdmister }

// pseudoComponent is PseudoComponent without the input checks; m in kg/mol.
func pseudoComponent(name string, m, sg float64, corr CritCorrelation, ac AcentricMethod) (Component, error) {
	mg := m * 1e3
	tb := soreideTb(mg, sg) // °R
	var tc, pc, vc float64  // °R, psia, m³/mol
	switch corr {
	case KeslerLee:
		tc, pc = keslerLeeTcPc(tb, sg)
		_, _, _, v := riaziDaubert1980(tb, sg)
		vc = v * m3kgPerFt3lb * m
	case RiaziDaubert:
		var v float64
		_, tc, pc, v = riaziDaubert1980(tb, sg)
		vc = v * m3kgPerFt3lb * m
	case RiaziDaubert1987:
		var v float64
		_, tc, pc, v = riaziDaubert1987(tb, sg)
		vc = v * m3kgPerFt3lb * m
	case Twu:
		var v float64
		var err error
		if _, tc, pc, v, err = twu(tb, sg); err != nil {
			if errors.Is(err, ErrNoConvergence) {
				return Component{}, fmt.Errorf("pseudo-component %s (M = %.4g kg/mol, SG = %.4g): %w", name, m, sg, err)
			}
			return Component{}, fmt.Errorf("%w: pseudo-component %s (M = %.4g kg/mol, SG = %.4g): %v",
				ErrCorrelationRange, name, m, sg, err)
		}
		vc = v * m3PerFt3 / (1e3 * kgPerLb) // ft³/lbmol → m³/mol
	}
	var w float64
	switch ac {
	case AcentricKeslerLee:
		w = keslerLeeOmega(tb, tc, pc, sg)
	case AcentricEdmister:
		w = edmisterOmega(tb, tc, pc*paPerPsia/paPerAtm)
	}
	comp := Component{
		Name:  name,
		M:     m,
		Tc:    tc / rankinePerKelvin,
		Pc:    pc * paPerPsia,
		Omega: w,
		Vc:    vc,
		Tb:    tb / rankinePerKelvin,
		SG:    sg,
		Shift: jhaveriYoungrenShift(mg),
	}
	if msg := unphysical(comp); msg != "" {
		return Component{}, fmt.Errorf("%w: pseudo-component %s (M = %.4g kg/mol, SG = %.4g) with %v critical properties and %v acentric factor: %s",
			ErrCorrelationRange, name, m, sg, corr, ac, msg)
	}
	return comp, nil
}

// Plausibility bounds on correlated pseudo-component properties: no
// hydrocarbon heavier than ethane has Pc above 5 MPa or Tb/Tc below 0.5
// (common practice, no published source); the bounds are wider still.
const (
	maxPseudoPc  = 10e6 // Pa
	minPseudoTbr = 0.4
)

// unphysical says what is wrong with correlated properties, or "" if nothing.
func unphysical(c Component) string {
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case !finite(c.Tb) || !finite(c.Tc) || !(c.Tb > 0 && c.Tc > c.Tb && c.Tb > minPseudoTbr*c.Tc):
		return fmt.Sprintf("Tb = %.6g K, Tc = %.6g K, want %g Tc < Tb < Tc", c.Tb, c.Tc, minPseudoTbr)
	case !finite(c.Pc) || !(c.Pc > 0 && c.Pc < maxPseudoPc):
		return fmt.Sprintf("Pc = %.6g Pa, want 0 < Pc < %g Pa", c.Pc, maxPseudoPc)
	case !finite(c.Omega) || c.Omega <= -1 || c.Omega >= 3:
		return fmt.Sprintf("omega = %.6g, want -1 < omega < 3", c.Omega)
	case !finite(c.Vc) || !(c.Vc > 0):
		return fmt.Sprintf("Vc = %.6g m³/mol, want > 0", c.Vc)
	case !finite(c.Shift) || math.Abs(c.Shift) >= 1:
		return fmt.Sprintf("volume shift = %.6g, want -1 < s < 1", c.Shift)
	}
	return ""
}
