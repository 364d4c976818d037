package mbal

import (
	"errors"
	"fmt"
	"math"

	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/internal/phys"
)

// ErrBadSurfaceData reports invalid separator data for the quick-look route.
var ErrBadSurfaceData = errors.New("invalid separator data")

// API gravity range of Cragoe's molar-mass correlation as usually applied
// (METHODS 5.2).
const (
	CragoeMinAPI = 20.0
	CragoeMaxAPI = 80.0
)

// CragoeMolarMass returns the molar mass, kg/mol, of a stock-tank oil or
// condensate of API gravity api from Cragoe's correlation for petroleum
// liquids,
//
//	M = 6084 / (API − 5.9)   (g/mol).
//
// Special cases: api outside [CragoeMinAPI, CragoeMaxAPI] or not finite: an
// error wrapping ErrCorrelationRange, and 0.
//
// Reference: Cragoe, C.S. (1929). Thermodynamic Properties of Petroleum
// Products. U.S. Bureau of Standards Miscellaneous Publication 97,
// Washington.
func CragoeMolarMass(api float64) (float64, error) {
	if !(api >= CragoeMinAPI && api <= CragoeMaxAPI) {
		return 0, fmt.Errorf("%w: Cragoe molar mass for %g °API; applied from %g to %g °API",
			ErrCorrelationRange, api, CragoeMinAPI, CragoeMaxAPI)
	}
	return 6.084 / (api - 5.9), nil // 6084 g/mol = 6.084 kg/mol
}

// SurfaceGas is the gas of one separator stage, the stock tank included.
type SurfaceGas struct {
	GOR     float64 // standard m³ of this stage's gas per m³ of stock-tank oil
	Gravity float64 // specific gravity, air = 1
}

// SurfaceData are the producing separator data of a gas-condensate well: all
// a quick look needs when no fluid sample has been analysed. Volumes are at
// the standard conditions Standard.
type SurfaceData struct {
	// Gas lists every stage's gas (separators, then the stock tank). At
	// least one stage must make gas.
	Gas []SurfaceGas
	// OilSG is the stock-tank oil's 60/60 °F specific gravity; OilAPI its
	// API gravity. Give exactly one; the other is 0.
	OilSG, OilAPI float64
	// OilM is the stock-tank oil's measured molar mass, kg/mol; 0 means
	// Cragoe (1929) from the API gravity (CragoeMolarMass).
	OilM float64
	// Impurities are the N2, CO2 and H2S mole fractions of the well stream
	// (zero for a sweet hydrocarbon gas).
	Impurities Impurities
	// Correlation gives the pseudo-critical point from the gravity; the
	// zero value is Sutton (1985).
	Correlation GasCorrelation
	// Standard are the standard conditions of the gas and oil volumes; zero
	// means cvd.StandardField (60 °F, 14.696 psia).
	Standard cvd.Conditions
}

// WellStream is the reservoir gas recombined from separator data.
type WellStream struct {
	Standard cvd.Conditions // of every standard volume below

	GOR        float64 // total surface gas, standard m³ per m³ of stock-tank oil
	GasGravity float64 // mean gravity of the surface gas, Σ GORₖ γₖ / GOR
	OilSG      float64 // stock-tank oil specific gravity, 60/60 °F
	OilAPI     float64 // its API gravity
	OilM       float64 // its molar mass, kg/mol
	Cragoe     bool    // OilM came from CragoeMolarMass

	// GasEquivalent is the standard volume the stock-tank oil would fill
	// as an ideal gas, standard m³ per m³ of oil: ρ_o v_sc / M_o.
	GasEquivalent float64
	// Gravity is the well-stream (wet-gas) specific gravity.
	Gravity float64
	// GasFraction is the surface gas's mole fraction of the well stream,
	// GOR/(GOR + GasEquivalent); at standard conditions it is also the
	// sales gas's share of the wet-gas volume.
	GasFraction float64

	Impurities  Impurities
	Correlation GasCorrelation
	Critical    PseudoCritical // of the well stream, from Gravity and Impurities
}

// wellStreamGravity is METHODS 5.4 with its constants as arguments:
//
//	γ_w = (Σ Rₖ γₖ + c1 γ_o) / (R + c2 γ_o / M_o)
//
// in any consistent units; c1 = ρ_w v_sc / M_air and c2 = ρ_w v_sc, with
// ρ_w the density of water, v_sc the ideal-gas molar volume at standard
// conditions and M_air the molar mass of air.
func wellStreamGravity(sumRGamma, r, sg, m, c1, c2 float64) float64 {
	return (sumRGamma + c1*sg) / (r + c2*sg/m)
}

// Recombine recombines separator gas and stock-tank oil into the well stream
// by mass and moles per unit volume of stock-tank oil (Whitson and Brulé
// 2000; METHODS 5.3, 5.4). Per m³ of oil the gas brings Rₖ/v_sc mol and
// Rₖ γₖ M_air/v_sc kg from each stage, the oil γ_o ρ_w/M_o mol and γ_o ρ_w kg,
// so that
//
//	γ_w = (Σ Rₖ γₖ + γ_o ρ_w v_sc/M_air) / (R + GE),   GE = γ_o ρ_w v_sc / M_o,
//	f_g = R / (R + GE),
//
// with v_sc = R_gas T_sc/p_sc at the chosen standard conditions, ρ_w =
// cvd.WaterDensity60F and M_air = cvd.MolarMassAir. In field units at 60 °F
// and 14.696 psia the constants are 4,587.6 and 132,880 scf/STB; the rounded
// 4,584 and 132,800 printed in the literature come from other water densities
// and molar volumes. The pseudo-critical point follows from γ_w by
// GasPseudoCritical with the well stream's non-hydrocarbons.
//
// Special cases: invalid data (no gas, a negative ratio, a gravity that is
// not positive, both or neither oil gravity, bad standard conditions): an
// error wrapping ErrBadSurfaceData naming the field; a molar mass to be found
// outside Cragoe's range, or a well-stream gravity outside the
// correlation's: an error wrapping ErrCorrelationRange.
func Recombine(d SurfaceData) (*WellStream, error) {
	bad := func(field string, v float64, want string) error {
		return fmt.Errorf("%w: %s = %g, want %s", ErrBadSurfaceData, field, v, want)
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

	std := d.Standard
	if std == (cvd.Conditions{}) {
		std = cvd.StandardField
	}
	if !(std.T > 0) || !finite(std.T) {
		return nil, bad("standard temperature", std.T, "> 0 K")
	}
	if !(std.P > 0) || !finite(std.P) {
		return nil, bad("standard pressure", std.P, "> 0 Pa")
	}
	if len(d.Gas) == 0 {
		return nil, fmt.Errorf("%w: no separator gas given", ErrBadSurfaceData)
	}
	var r, rg float64
	for k, g := range d.Gas {
		if !(g.GOR >= 0) || !finite(g.GOR) {
			return nil, bad(fmt.Sprintf("stage %d gas-oil ratio", k+1), g.GOR, ">= 0 standard m³/m³")
		}
		if g.GOR > 0 && (!(g.Gravity > 0) || !finite(g.Gravity)) {
			return nil, bad(fmt.Sprintf("stage %d gas gravity", k+1), g.Gravity, "> 0")
		}
		r += g.GOR
		rg += g.GOR * g.Gravity
	}
	if !(r > 0) {
		return nil, bad("total gas-oil ratio", r, "> 0 standard m³/m³")
	}

	w := &WellStream{Standard: std, GOR: r, GasGravity: rg / r, Impurities: d.Impurities, Correlation: d.Correlation}
	switch {
	case d.OilSG != 0 && d.OilAPI != 0:
		return nil, fmt.Errorf("%w: both oil specific gravity (%g) and API gravity (%g) given, want one", ErrBadSurfaceData, d.OilSG, d.OilAPI)
	case d.OilSG != 0:
		if !(d.OilSG > 0) || !finite(d.OilSG) {
			return nil, bad("oil specific gravity", d.OilSG, "> 0")
		}
		w.OilSG, w.OilAPI = d.OilSG, phys.APIGravity(d.OilSG)
	case d.OilAPI != 0:
		if !(d.OilAPI > -phys.APIOffset) || !finite(d.OilAPI) {
			return nil, bad("oil API gravity", d.OilAPI, "> −131.5")
		}
		w.OilSG, w.OilAPI = phys.SpecificGravity(d.OilAPI), d.OilAPI
	default:
		return nil, fmt.Errorf("%w: no stock-tank oil gravity given (specific or API)", ErrBadSurfaceData)
	}
	switch {
	case d.OilM == 0:
		m, err := CragoeMolarMass(w.OilAPI)
		if err != nil {
			return nil, fmt.Errorf("stock-tank oil molar mass not given: %w", err)
		}
		w.OilM, w.Cragoe = m, true
	case !(d.OilM > 0) || !finite(d.OilM):
		return nil, bad("oil molar mass", d.OilM, "> 0 kg/mol")
	default:
		w.OilM = d.OilM
	}
	if err := d.Impurities.check(); err != nil {
		return nil, fmt.Errorf("%w: well stream: %w", ErrBadSurfaceData, err)
	}

	vsc := std.IdealGasVolume() // ideal-gas molar volume at standard conditions, m³/mol
	c1 := cvd.WaterDensity60F * vsc / cvd.MolarMassAir
	c2 := cvd.WaterDensity60F * vsc
	w.GasEquivalent = c2 * w.OilSG / w.OilM
	w.Gravity = wellStreamGravity(rg, r, w.OilSG, w.OilM, c1, c2)
	w.GasFraction = r / (r + w.GasEquivalent)

	pc, err := GasPseudoCritical(w.Gravity, d.Impurities, d.Correlation)
	if err != nil {
		return nil, fmt.Errorf("well stream of gravity %.4g: %w", w.Gravity, err)
	}
	w.Critical = pc
	return w, nil
}

// QuickLook is the gas and condensate initially in place by the quick-look
// route: a volumetric estimate from separator data alone.
type QuickLook struct {
	HCPV float64 // hydrocarbon pore volume, m³
	T    float64 // reservoir temperature, K
	P    float64 // reservoir pressure, Pa

	Tpr, Ppr float64 // pseudo-reduced temperature and pressure of the well stream
	Z        float64 // its Z-factor, Dranchuk–Abou-Kassem
	Bg       float64 // wet-gas formation volume factor, reservoir m³ per standard m³
	Moles    float64 // mol of well stream in place

	WetGas     float64 // the well stream as ideal gas at standard conditions, m³
	SalesGas   float64 // surface (dry) gas, standard m³: GasFraction × WetGas
	Condensate float64 // stock-tank condensate, m³ at standard conditions: SalesGas / GOR
}

// InPlaceQuickLook estimates the gas and condensate in a hydrocarbon pore
// volume hcpv (m³) at reservoir temperature t (K) and pressure p (Pa) from
// the recombined well stream w, for a reservoir above its dew point (METHODS
// 5.4, 9.1). The well stream's Z comes from ZFactorDAK at its
// pseudo-critical point; then
//
//	n = p hcpv / (Z R T),   G_wet = n v_sc = hcpv / B_g,   B_g = Z T p_sc / (p T_sc)
//	G_sales = f_g G_wet,    N = G_sales / R_total,
//
// the last because at standard conditions the volume fraction of the ideal
// gas is its mole fraction, and each m³ of stock-tank oil came with R_total of
// surface gas.
//
// Special cases: hcpv, t or p not positive or not finite, or a nil
// WellStream or one not made by Recombine that fails its checks: an error
// wrapping ErrBadSurfaceData; reduced conditions outside the range of
// ZFactorDAK: its error.
func InPlaceQuickLook(w *WellStream, hcpv, t, p float64) (*QuickLook, error) {
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case w == nil:
		return nil, fmt.Errorf("%w: no well stream (use Recombine)", ErrBadSurfaceData)
	case !(hcpv > 0) || !finite(hcpv):
		return nil, fmt.Errorf("%w: hydrocarbon pore volume = %g, want > 0 m³", ErrBadSurfaceData, hcpv)
	case !(t > 0) || !finite(t):
		return nil, fmt.Errorf("%w: reservoir temperature = %g, want > 0 K", ErrBadSurfaceData, t)
	case !(p > 0) || !finite(p):
		return nil, fmt.Errorf("%w: reservoir pressure = %g, want > 0 Pa", ErrBadSurfaceData, p)
	case !(w.Critical.Tpc > 0 && w.Critical.Ppc > 0):
		return nil, fmt.Errorf("%w: well stream without a pseudo-critical point (use Recombine)", ErrBadSurfaceData)
	case !(w.GasFraction > 0 && w.GasFraction <= 1) || !(w.GOR > 0) || !(w.Standard.T > 0 && w.Standard.P > 0):
		return nil, fmt.Errorf("%w: well stream without surface ratios or standard conditions (use Recombine)", ErrBadSurfaceData)
	}
	q := &QuickLook{HCPV: hcpv, T: t, P: p}
	q.Tpr, q.Ppr = w.Critical.Reduced(t, p)
	z, err := ZFactorDAK(q.Tpr, q.Ppr)
	if err != nil {
		return nil, &eos.StateError{What: "the well stream", T: t, P: p, Err: err}
	}
	q.Z = z
	std := w.Standard
	q.Bg = z * t * std.P / (p * std.T)
	q.Moles = p * hcpv / (z * eos.R * t)
	q.WetGas = q.Moles * eos.R * std.T / std.P
	q.SalesGas = w.GasFraction * q.WetGas
	q.Condensate = q.SalesGas / w.GOR
	return q, nil
}

// RouteComparison sets the quick look beside the equation-of-state figures
// of the same reservoir: each difference is the quick look's figure minus
// the equation of state's (standard volumes in standard m³), each relative
// difference that over the equation of state's figure, NaN where that is
// zero (a fluid that makes no condensate, say).
type RouteComparison struct {
	Z, WetGas, SalesGas, Condensate float64
	// DryGasFraction is the difference of the surface gas's mole fraction
	// of the well stream: WellStream.GasFraction against the separator
	// train's InPlace.Surface.GasMoles.
	DryGasFraction                              float64
	RelZ, RelWetGas, RelSalesGas, RelCondensate float64
}

// CompareRoutes compares the quick look q from the recombined well stream w
// with the equation-of-state figures ip.
func CompareRoutes(ip *InPlace, w *WellStream, q *QuickLook) RouteComparison {
	rel := func(a, b float64) float64 {
		if b == 0 {
			return math.NaN()
		}
		return (a - b) / b
	}
	return RouteComparison{
		Z:              q.Z - ip.Z,
		WetGas:         q.WetGas - ip.WetGas,
		SalesGas:       q.SalesGas - ip.SalesGas,
		Condensate:     q.Condensate - ip.Condensate,
		DryGasFraction: w.GasFraction - ip.Surface.GasMoles,
		RelZ:           rel(q.Z, ip.Z),
		RelWetGas:      rel(q.WetGas, ip.WetGas),
		RelSalesGas:    rel(q.SalesGas, ip.SalesGas),
		RelCondensate:  rel(q.Condensate, ip.Condensate),
	}
}
