package cvd

import "dewcell/eos"

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
// the pressures given (Pa, any order; reported in the order given).
func Expand(fl *eos.Fluid, z []float64, t float64, pressures []float64, s *eos.Settings) (*Expansion, error) {
	return nil, errNotYet
}
