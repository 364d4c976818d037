package cvd

import "math"

// Laboratory measurements of a reservoir fluid, as a PVT report gives them:
// the saturation pressure, a constant-composition expansion and a
// constant-volume depletion, in SI. Compare sets the equation of state
// against them, Check tests a depletion report for consistency, and Tune
// regresses the fluid's parameters to them.

// Missing is the value of a measurement the laboratory did not report (a
// blank cell of its table); IsMissing tests for it. It is a NaN, so that no
// arithmetic on it passes for a number.
var Missing = math.NaN()

// IsMissing reports whether v is Missing.
func IsMissing(v float64) bool { return math.IsNaN(v) }

// LabReport is one laboratory report of a fluid.
type LabReport struct {
	T float64 // temperature of the experiments, K
	// SaturationP is the measured saturation (dew or bubble) pressure, Pa;
	// 0 when the report gives none.
	SaturationP float64
	CCE         *LabCCE // nil when the report has no expansion
	CVD         *LabCVD // nil when the report has no depletion
}

// LiquidBasis says what a reported liquid volume is a fraction of.
type LiquidBasis int

const (
	// OfSaturationVolume: liquid volume over the cell volume at the
	// saturation pressure (the CVD's liquid dropout, and most CCE reports).
	OfSaturationVolume LiquidBasis = iota
	// OfTotalVolume: liquid volume over the total (gas and liquid) volume at
	// the same pressure.
	OfTotalVolume
)

// LabCCE is a constant-composition expansion as measured. Points come in the
// order of the report (pressures need not fall).
type LabCCE struct {
	LiquidBasis LiquidBasis // the basis of LiquidVolume
	Points      []LabCCEPoint
}

// LabCCEPoint is one pressure of a measured expansion; a quantity not
// measured is Missing.
type LabCCEPoint struct {
	P              float64 // Pa
	RelativeVolume float64 // V/V_sat
	LiquidVolume   float64 // fraction of the basis volume (LabCCE.LiquidBasis), 0 to 1
	Z              float64 // single-phase Z-factor (above the saturation pressure)
	Density        float64 // single-phase density, kg/m³
}

// LabComponent is one component as the laboratory reports it: a name of the
// study, standing for the model components Index (one for a defined
// component, all the pseudo-components of a plus fraction).
type LabComponent struct {
	Name  string
	Index []int
}

// LabCVD is a constant-volume depletion as measured. Points come in the
// order of the report, pressures falling; the first may be at the
// saturation pressure (dropout 0, produced 0).
type LabCVD struct {
	// Gas lists the components of the produced-gas compositions, in the
	// order of LabCVDPoint.Gas; nil when the report gives none. Liquid lists
	// those of the final liquid composition (LabCVDPoint.Liquid of the last
	// point); nil when not given.
	Gas    []LabComponent
	Liquid []LabComponent
	Points []LabCVDPoint
}

// LabCVDPoint is one pressure step of a measured depletion; a quantity not
// measured is Missing.
type LabCVDPoint struct {
	P float64 // Pa
	// Dropout is the liquid volume over the cell volume at the saturation
	// pressure, 0 to 1.
	Dropout float64
	// Produced is the cumulative moles produced over the moles charged, 0 to 1.
	Produced  float64
	ZGas      float64 // Z-factor of the equilibrium gas
	ZTwoPhase float64 // two-phase Z-factor of the cell contents
	// Gas is the produced gas's composition, mole fractions in the order of
	// LabCVD.Gas (each entry the sum over its model components); nil when
	// the report gives none, a Missing entry where the row is blank.
	Gas          []float64
	GasViscosity float64 // Pa·s
	// CGR is the condensate-gas ratio of the produced gas: stock-tank liquid
	// volume over the surface gas volume, m³/m³ at standard conditions.
	CGR float64
	// Liquid is the liquid composition in the cell, mole fractions in the
	// order of LabCVD.Liquid; reported for the last step only, nil elsewhere.
	Liquid []float64
}
