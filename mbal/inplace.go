package mbal

import (
	"errors"
	"fmt"
	"math"

	"dewcell/cvd"
	"dewcell/eos"
)

// Reservoir is the rock and its initial state. Volumes in m³, pressures in
// Pa, compressibilities in 1/Pa, saturations as fractions of the pore volume.
type Reservoir struct {
	T           float64 // temperature, K
	Pi          float64 // initial pressure
	Abandonment float64 // abandonment pressure
	// Either PoreVolume, or BulkVolume (area × net thickness) with Porosity.
	PoreVolume float64
	BulkVolume float64
	Porosity   float64
	Sw         float64 // connate water saturation
	// Sc is the critical condensate saturation, above which the liquid
	// flows; 0 means 0.15 (typical values lie between 0.10 and 0.20: common
	// practice, no published source).
	Sc float64
	Cf float64 // rock (pore) compressibility
	Cw float64 // water compressibility
	// RelPerm gives the gas and condensate relative permeabilities for the
	// fractional flow of a mobile condensate; the zero value means the
	// defaults.
	RelPerm RelativePermeability
}

// DefaultSc is the critical condensate saturation used when none is given.
const DefaultSc = 0.15

// ErrBadReservoir reports an invalid Reservoir; ErrInitiallyTwoPhase a
// reservoir whose initial pressure lies below the fluid's saturation
// pressure.
var (
	ErrBadReservoir      = errors.New("invalid reservoir description")
	ErrInitiallyTwoPhase = errors.New("the initial pressure is below the saturation pressure")
	// ErrNotCondensate: the fluid has a bubble point at reservoir
	// temperature. It is an oil, whose liquid is the mobile phase; the
	// depletion model of a gas-condensate reservoir does not apply.
	ErrNotCondensate = errors.New("the fluid is an oil (bubble point at reservoir temperature), not a gas condensate")
)

// An OilError is ErrNotCondensate with the state: the reservoir temperature,
// the bubble point there and the fluid's critical temperature (zero when it
// has none), below which the fluid is an oil. A fluid just below its
// critical temperature is a near-critical oil; the condensate model holds
// above it.
type OilError struct {
	T, Pb, Tc float64 // K, Pa, K
}

func (e *OilError) Error() string {
	msg := fmt.Sprintf("the fluid is an oil at %.6g K, with a bubble point at %.6g Pa", e.T, e.Pb)
	if e.Tc > 0 {
		msg += fmt.Sprintf(", below its critical temperature %.6g K", e.Tc)
	}
	return msg + "; the depletion model of a gas condensate does not apply"
}

// Unwrap makes errors.Is(err, ErrNotCondensate) hold.
func (e *OilError) Unwrap() error { return ErrNotCondensate }

func (r Reservoir) sc() float64 {
	if r.Sc == 0 {
		return DefaultSc
	}
	return r.Sc
}

// Check reports the first invalid field of r.
func (r Reservoir) Check() error {
	bad := func(field string, v float64, want string) error {
		return fmt.Errorf("%w: %s = %g, want %s", ErrBadReservoir, field, v, want)
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case !(r.T > 0) || !finite(r.T):
		return bad("temperature", r.T, "> 0 K")
	case !(r.Pi > 0) || !finite(r.Pi):
		return bad("initial pressure", r.Pi, "> 0 Pa")
	case r.Abandonment < 0 || !finite(r.Abandonment) || r.Abandonment >= r.Pi:
		return bad("abandonment pressure", r.Abandonment, "at least 0 and below the initial pressure")
	case r.PoreVolume < 0 || !finite(r.PoreVolume):
		return bad("pore volume", r.PoreVolume, ">= 0 m³")
	case r.PoreVolume == 0 && (!(r.BulkVolume > 0) || !finite(r.BulkVolume)):
		return bad("bulk volume", r.BulkVolume, "> 0 m³ when no pore volume is given")
	case r.PoreVolume == 0 && !(r.Porosity > 0 && r.Porosity < 1):
		return bad("porosity", r.Porosity, "between 0 and 1")
	case !(r.Sw >= 0 && r.Sw < 1):
		return bad("water saturation", r.Sw, "at least 0 and below 1")
	case !(r.Sc >= 0 && r.Sc < 1-r.Sw):
		return bad("critical condensate saturation", r.Sc, "at least 0 and below 1 − Sw")
	case r.Cf < 0 || !finite(r.Cf):
		return bad("rock compressibility", r.Cf, ">= 0 1/Pa")
	case r.Cw < 0 || !finite(r.Cw):
		return bad("water compressibility", r.Cw, ">= 0 1/Pa")
	}
	return r.RelPerm.Check()
}

// PV is the pore volume, m³.
func (r Reservoir) PV() float64 {
	if r.PoreVolume > 0 {
		return r.PoreVolume
	}
	return r.BulkVolume * r.Porosity
}

// HCPV is the hydrocarbon pore volume PV (1 − Sw), m³.
func (r Reservoir) HCPV() float64 { return r.PV() * (1 - r.Sw) }

// EffectiveCompressibility of the hydrocarbon pore volume,
// (c_f + c_w S_w)/(1 − S_w) (Havlena and Odeh 1963; METHODS 9.2), 1/Pa.
func (r Reservoir) EffectiveCompressibility() float64 {
	return (r.Cf + r.Cw*r.Sw) / (1 - r.Sw)
}

// InPlace is the fluid initially in place, by the equation of state.
// Standard volumes are at the train's standard conditions.
type InPlace struct {
	HCPV  float64 // m³
	Bulk  float64 // bulk rock volume, m³ (0 when only a pore volume was given)
	Moles float64 // mol of reservoir fluid
	Z     float64 // Z of the reservoir fluid at the initial pressure
	V     float64 // its molar volume, m³/mol (volume-translated when the fluid is)

	WetGas     float64 // the whole well stream as ideal gas at standard conditions, m³
	SalesGas   float64 // surface gas from the separator train, standard m³
	Condensate float64 // stock-tank condensate, m³ at standard conditions
	// Surface is the separator split of one mole of reservoir fluid.
	Surface cvd.SeparatorResult
}

// InPlaceEOS computes the fluid in place from the equation of state: the
// moles that fill the hydrocarbon pore volume at the initial pressure and
// temperature (one phase above the saturation pressure), and the surface
// products of those moles through the separator train.
//
// Special cases: an invalid reservoir: ErrBadReservoir; a fluid that is not
// single-phase at the initial state: ErrInitiallyTwoPhase.
func InPlaceEOS(fl *eos.Fluid, z []float64, r Reservoir, tr cvd.Train, s *eos.Settings) (*InPlace, error) {
	if err := r.Check(); err != nil {
		return nil, err
	}
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	var res eos.FlashResult
	if err := eos.NewFlasher(fl, s).Flash(&res, r.T, r.Pi, z); err != nil {
		return nil, &eos.StateError{What: "the reservoir fluid at its initial state", T: r.T, P: r.Pi, Err: err}
	}
	if res.Phases != 1 {
		return nil, &eos.StateError{What: "the reservoir fluid at its initial state", T: r.T, P: r.Pi, Err: fmt.Errorf("%w: the fluid is two-phase there, liquid mole fraction %.3g", ErrInitiallyTwoPhase, 1-res.Beta)}
	}
	pp := res.V
	if res.Single == eos.Liquid {
		pp = res.L
	}
	sep, err := cvd.NewSeparator(fl, tr, s)
	if err != nil {
		return nil, err
	}
	sr, err := sep.Separate(z)
	if err != nil {
		return nil, err
	}
	std := tr.StandardConditions()
	ip := &InPlace{HCPV: r.HCPV(), Z: pp.Z, V: pp.V, Surface: sr}
	if r.PoreVolume == 0 {
		ip.Bulk = r.BulkVolume
	}
	ip.Moles = ip.HCPV / pp.V
	ip.WetGas = ip.Moles * eos.R * std.T / std.P
	ip.SalesGas = ip.Moles * sr.GasVolume
	ip.Condensate = ip.Moles * sr.OilVolume
	return ip, nil
}
