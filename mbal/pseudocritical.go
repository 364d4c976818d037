package mbal

import (
	"fmt"
	"math"

	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/internal/phys"
)

// The gravity correlations below (and McCain's water formation volume
// factor) were published in field units; they convert at their own
// boundary, with the exact factors of package phys.
const (
	fieldPsi     = phys.PaPerPsi         // Pa per psi
	fieldRankine = phys.KelvinPerRankine // K per °R
)

// PseudoCritical is the pseudo-critical point of a gas mixture: the
// temperature and pressure that reduce its T and p for a corresponding-states
// Z-factor chart or equation.
type PseudoCritical struct {
	Tpc float64 // K
	Ppc float64 // Pa
}

// Reduced returns the pseudo-reduced temperature T/Tpc and pressure p/Ppc at
// t (K) and p (Pa).
func (pc PseudoCritical) Reduced(t, p float64) (tpr, ppr float64) {
	return t / pc.Tpc, p / pc.Ppc
}

// GasCorrelation chooses a correlation of pseudo-critical properties with
// gas specific gravity. The zero value is Sutton (1985).
type GasCorrelation int

const (
	// Sutton is Sutton (1985), fitted to gases rich in heptanes-plus,
	// including gas-condensate well streams:
	//
	//	Tpc = 169.2 + 349.5 γ − 74.0 γ²    (°R)
	//	Ppc = 756.8 − 131.07 γ − 3.6 γ²    (psia)
	Sutton GasCorrelation = iota
	// StandingNaturalGas is Standing (1977) for dry natural gas:
	//
	//	Tpc = 168 + 325 γ − 12.5 γ²,  Ppc = 677 + 15.0 γ − 37.5 γ²
	StandingNaturalGas
	// StandingCondensate is Standing (1977) for condensate well fluids:
	//
	//	Tpc = 187 + 330 γ − 71.5 γ²,  Ppc = 706 − 51.7 γ − 11.1 γ²
	StandingCondensate
)

// Gravity range of the correlations: the span of the data Sutton (1985)
// fitted. Standing (1977) states none in the form used here; the same span
// is applied so that all three answer over the same gravities.
const (
	MinGasGravity = 0.57
	MaxGasGravity = 1.68
)

func (c GasCorrelation) String() string {
	switch c {
	case Sutton:
		return "Sutton (1985)"
	case StandingNaturalGas:
		return "Standing (1977) natural gas"
	case StandingCondensate:
		return "Standing (1977) condensate"
	}
	return fmt.Sprintf("GasCorrelation(%d)", int(c))
}

// PseudoCritical returns the pseudo-critical temperature and pressure of a
// hydrocarbon gas of specific gravity gamma (air = 1) from correlation c.
// For a gas holding nitrogen, carbon dioxide or hydrogen sulphide use
// GasPseudoCritical, which applies the correlation to the hydrocarbon
// portion only.
//
// Special cases: gamma outside [MinGasGravity, MaxGasGravity] or not finite:
// an error wrapping ErrCorrelationRange; an unknown c: an error. On error the
// result is zero.
//
// References:
//   - Sutton, R.P. (1985). Compressibility factors for high-molecular-weight
//     reservoir gases. SPE Annual Technical Conference, Las Vegas, SPE-14265-MS.
//     doi:10.2118/14265-MS
//   - Standing, M.B. (1977). Volumetric and Phase Behavior of Oil Field
//     Hydrocarbon Systems. SPE, Dallas (9th printing, 1981).
func (c GasCorrelation) PseudoCritical(gamma float64) (PseudoCritical, error) {
	var tR, pPsi float64 // °R, psia
	switch c {
	case Sutton:
		tR = 169.2 + 349.5*gamma - 74.0*gamma*gamma
		pPsi = 756.8 - 131.07*gamma - 3.6*gamma*gamma
	case StandingNaturalGas:
		tR = 168 + 325*gamma - 12.5*gamma*gamma
		pPsi = 677 + 15.0*gamma - 37.5*gamma*gamma
	case StandingCondensate:
		tR = 187 + 330*gamma - 71.5*gamma*gamma
		pPsi = 706 - 51.7*gamma - 11.1*gamma*gamma
	default:
		return PseudoCritical{}, fmt.Errorf("unknown pseudo-critical correlation %d", int(c))
	}
	if !(gamma >= MinGasGravity && gamma <= MaxGasGravity) {
		return PseudoCritical{}, fmt.Errorf("%w: %v pseudo-criticals for gas gravity %g; fitted for %g to %g",
			ErrCorrelationRange, c, gamma, MinGasGravity, MaxGasGravity)
	}
	return PseudoCritical{Tpc: tR * fieldRankine, Ppc: pPsi * fieldPsi}, nil
}

// Impurities are the mole fractions of the non-hydrocarbons in a gas.
type Impurities struct {
	N2, CO2, H2S float64
}

// Sum is the total non-hydrocarbon mole fraction.
func (im Impurities) Sum() float64 { return im.N2 + im.CO2 + im.H2S }

// check reports a fraction outside [0, 1) or a total of 1 or more.
func (im Impurities) check() error {
	for _, f := range []struct {
		name string
		y    float64
	}{{"N2", im.N2}, {"CO2", im.CO2}, {"H2S", im.H2S}} {
		if !(f.y >= 0 && f.y < 1) {
			return fmt.Errorf("%s mole fraction %g, want at least 0 and below 1", f.name, f.y)
		}
	}
	if s := im.Sum(); !(s < 1) {
		return fmt.Errorf("N2 + CO2 + H2S mole fractions sum to %g, want below 1", s)
	}
	return nil
}

// impurity returns the library component (Poling, Prausnitz and O'Connell
// 2001, App. A) of a non-hydrocarbon; the names are in eos's table.
func impurity(name string) eos.Component {
	c, ok := eos.LibraryComponent(name)
	if !ok {
		panic("mbal: component " + name + " missing from the eos library")
	}
	return c
}

// Kay returns the pseudo-critical point of a mixture by Kay's rule, the
// mole-fraction averages Tpc = Σ yᵢ Tcᵢ and Ppc = Σ yᵢ Pcᵢ. The fractions y
// must be non-negative and sum to 1 within 1e-9.
//
// Special cases: a negative or non-finite fraction, or a sum away from 1: an
// error. len(y) != len(crit) is a programming error and panics.
//
// Reference: Kay, W.B. (1936). Density of hydrocarbon gases and vapors at
// high temperature and pressure. Ind. Eng. Chem. 28(9), 1014–1019.
func Kay(y []float64, crit []PseudoCritical) (PseudoCritical, error) {
	if len(y) != len(crit) {
		panic("mbal: Kay: len(y) != len(crit)")
	}
	var sum float64
	var pc PseudoCritical
	for i, yi := range y {
		if !(yi >= 0) || math.IsInf(yi, 0) {
			return PseudoCritical{}, fmt.Errorf("Kay's rule: mole fraction %d is %g, want at least 0", i+1, yi)
		}
		sum += yi
		pc.Tpc += yi * crit[i].Tpc
		pc.Ppc += yi * crit[i].Ppc
	}
	if math.Abs(sum-1) > 1e-9 {
		return PseudoCritical{}, fmt.Errorf("Kay's rule: mole fractions sum to %.12g, want 1", sum)
	}
	return pc, nil
}

// Range of the Wichert–Aziz correction: the CO2 and H2S contents of the
// sour gases it was fitted to (Wichert and Aziz 1972).
const (
	WichertAzizMaxCO2 = 0.544
	WichertAzizMaxH2S = 0.738
)

// WichertAziz corrects the pseudo-critical point of a sour gas, pc, found by
// Kay's rule or a gravity correlation, for its CO2 and H2S mole fractions:
//
//	ε = 120 (A^0.9 − A^1.6) + 15 (B^0.5 − B^4)   (°R),  A = yCO2 + yH2S,  B = yH2S
//	Tpc' = Tpc − ε
//	Ppc' = Ppc Tpc' / (Tpc + B (1 − B) ε)
//
// Special cases: yCO2 or yH2S negative, not finite, or above the fitted
// range (WichertAzizMaxCO2, WichertAzizMaxH2S): an error wrapping
// ErrCorrelationRange for the range, a plain error otherwise. Both zero:
// pc unchanged.
//
// Reference: Wichert, E. and Aziz, K. (1972). Calculate Z's for sour gases.
// Hydrocarbon Processing 51(5), 119–122.
func WichertAziz(pc PseudoCritical, yCO2, yH2S float64) (PseudoCritical, error) {
	if !(yCO2 >= 0) || !(yH2S >= 0) || math.IsInf(yCO2, 0) || math.IsInf(yH2S, 0) {
		return PseudoCritical{}, fmt.Errorf("Wichert–Aziz: CO2 %g and H2S %g mole fractions, want at least 0", yCO2, yH2S)
	}
	if yCO2 > WichertAzizMaxCO2 || yH2S > WichertAzizMaxH2S {
		return PseudoCritical{}, fmt.Errorf("%w: Wichert–Aziz with CO2 %g and H2S %g; fitted up to %g CO2 and %g H2S",
			ErrCorrelationRange, yCO2, yH2S, WichertAzizMaxCO2, WichertAzizMaxH2S)
	}
	a, b := yCO2+yH2S, yH2S
	if a == 0 {
		return pc, nil
	}
	eps := (120*(math.Pow(a, 0.9)-math.Pow(a, 1.6)) + 15*(math.Sqrt(b)-b*b*b*b)) * fieldRankine // K
	tpc := pc.Tpc - eps
	return PseudoCritical{Tpc: tpc, Ppc: pc.Ppc * tpc / (pc.Tpc + b*(1-b)*eps)}, nil
}

// HydrocarbonGravity returns the specific gravity of the hydrocarbon portion
// of a gas of gravity gamma holding the non-hydrocarbons im:
//
//	γ_HC = (γ − Σ yᵢ Mᵢ/M_air) / (1 − Σ yᵢ)
//
// with the molar masses of the eos library and cvd.MolarMassAir, whose
// ratios round to the 0.967 (N2), 1.52 (CO2) and 1.18 (H2S) of the textbook
// form (METHODS 4.4).
//
// Special cases: bad fractions, or a gamma that leaves the hydrocarbons a
// gravity of 0 or less: an error.
func HydrocarbonGravity(gamma float64, im Impurities) (float64, error) {
	if err := im.check(); err != nil {
		return 0, err
	}
	if !(gamma > 0) || math.IsInf(gamma, 0) {
		return 0, fmt.Errorf("gas gravity %g, want above 0", gamma)
	}
	non := (im.N2*impurity("N2").M + im.CO2*impurity("CO2").M + im.H2S*impurity("H2S").M) / cvd.MolarMassAir
	g := (gamma - non) / (1 - im.Sum())
	if !(g > 0) {
		return 0, fmt.Errorf("gas gravity %g is too low for its N2, CO2 and H2S (%g, %g, %g): the hydrocarbons would weigh %g",
			gamma, im.N2, im.CO2, im.H2S, g)
	}
	return g, nil
}

// GasPseudoCritical returns the pseudo-critical point of a gas of specific
// gravity gamma (air = 1) holding the non-hydrocarbons im, the standard
// route for gravity correlations (Whitson and Brulé 2000; METHODS 4.4):
// correlation c gives the hydrocarbon portion's point from its gravity
// (HydrocarbonGravity), Kay's rule mixes it with the critical points of N2,
// CO2 and H2S (Poling et al. 2001, App. A, through the eos library), and the
// Wichert–Aziz correction follows when CO2 or H2S is present.
//
// Special cases: as HydrocarbonGravity, c.PseudoCritical (for the
// hydrocarbon gravity) and WichertAziz.
//
// Reference: Whitson, C.H. and Brulé, M.R. (2000). Phase Behavior. SPE
// Monograph 20, Richardson, Texas.
func GasPseudoCritical(gamma float64, im Impurities, c GasCorrelation) (PseudoCritical, error) {
	g, err := HydrocarbonGravity(gamma, im)
	if err != nil {
		return PseudoCritical{}, err
	}
	hc, err := c.PseudoCritical(g)
	if err != nil {
		return PseudoCritical{}, fmt.Errorf("%w (the hydrocarbon portion of gravity %g)", err, gamma)
	}
	if im.Sum() == 0 {
		return hc, nil
	}
	crit := func(name string) PseudoCritical {
		cc := impurity(name)
		return PseudoCritical{Tpc: cc.Tc, Ppc: cc.Pc}
	}
	mix, err := Kay([]float64{1 - im.Sum(), im.N2, im.CO2, im.H2S},
		[]PseudoCritical{hc, crit("N2"), crit("CO2"), crit("H2S")})
	if err != nil {
		return PseudoCritical{}, err
	}
	return WichertAziz(mix, im.CO2, im.H2S)
}
