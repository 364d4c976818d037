package cvd

import (
	"fmt"
	"math"

	"dewcell/eos"
)

// ExpansionStep is one pressure of a constant-composition expansion. Volumes
// are relative to the volume at the saturation pressure.
type ExpansionStep struct {
	P              float64 // Pa
	TwoPhase       bool
	RelativeVolume float64 // V/V_sat
	LiquidVolume   float64 // liquid volume over V_sat (0 above the saturation point)
	Z              float64 // single-phase Z above the saturation point; p V/(n R T) of both phases below
	VaporFraction  float64 // vapour mole fraction (1 or 0 when single phase)
	// Compressibility is the single-phase isothermal compressibility
	// −(1/V) ∂V/∂p, 1/Pa (0 below the saturation point).
	Compressibility float64
}

// Expansion is a simulated constant-composition expansion at T.
type Expansion struct {
	T          float64
	Saturation eos.Saturation
	VSat       float64 // molar volume at the saturation point, m³/mol
	Steps      []ExpansionStep
}

// Expand simulates a constant-composition expansion of feed z at t (K) over
// the pressures given (Pa, reported in the order given): one mole of feed at
// each pressure, flashed, its total volume compared with the volume at the
// saturation point. The single-phase compressibility comes from the
// equation of state's ∂v/∂p (eos.Flasher.Phase). Volumes are
// volume-translated when the fluid is.
//
// Special cases: no saturation point at t: an error wrapping
// eos.ErrNoSaturation; a pressure that is not positive: ErrBadOptions; a
// flash that fails: its *eos.SolveError, wrapped with the pressure.
func Expand(fl *eos.Fluid, z []float64, t float64, pressures []float64, s *eos.Settings) (*Expansion, error) {
	if err := fl.CheckComposition(z); err != nil {
		return nil, err
	}
	for k, p := range pressures {
		if !(p > 0) || math.IsInf(p, 0) {
			return nil, fmt.Errorf("%w: pressure %d is %g Pa", ErrBadOptions, k+1, p)
		}
	}
	sat, err := eos.NewSaturator(fl, s).Upper(t, z)
	if err != nil {
		return nil, &eos.StateError{What: "saturation point", T: t, Err: err}
	}
	e := &Expansion{T: t, Saturation: sat, VSat: sat.Feed.V}
	f := eos.NewFlasher(fl, s)
	var res eos.FlashResult
	k := make([]float64, fl.N()) // K-values of the last two-phase step, when hasK
	hasK := false
	for _, p := range pressures {
		var err error
		if hasK {
			err = f.FlashFrom(&res, t, p, z, k)
		} else {
			err = f.Flash(&res, t, p, z)
		}
		if err != nil {
			return e, &eos.StateError{What: "flash", T: t, P: p, Err: err}
		}
		if hasK = res.Phases == 2; hasK {
			for i := range k {
				k[i] = res.Y[i] / res.X[i]
			}
		}
		st := ExpansionStep{P: p, VaporFraction: res.Beta}
		var v float64
		switch {
		case res.Phases == 2:
			v = res.Beta*res.V.V + (1-res.Beta)*res.L.V
			st.TwoPhase = true
			st.LiquidVolume = (1 - res.Beta) * res.L.V / e.VSat
		case res.Single == eos.Liquid:
			v = res.L.V
		default:
			v = res.V.V
		}
		if !st.TwoPhase {
			_, _, st.Compressibility = f.Phase(t, p, z)
		}
		st.RelativeVolume = v / e.VSat
		st.Z = p * v / (eos.R * t)
		e.Steps = append(e.Steps, st)
	}
	return e, nil
}
