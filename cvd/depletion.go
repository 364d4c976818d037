package cvd

import (
	"errors"

	"dewcell/eos"
)

var errNotYet = errors.New("cvd: not implemented yet")

// DepletionOptions control Deplete. Pressures, when given, are the steps
// below the start, strictly decreasing; otherwise Steps pressures are spaced
// evenly from the dew point down to Abandonment.
type DepletionOptions struct {
	Pressures   []float64 // Pa
	Steps       int       // default steps below the dew point; 0 means 8
	Abandonment float64   // Pa, the last default step
	// Start, when above the dew point, starts the depletion there: the cell
	// volume is that of the single-phase fluid at Start, and the steps above
	// the dew point produce feed-composition gas. Zero starts at the dew point.
	Start    float64
	Train    *Train // when set, each step's produced gas goes through the train
	Settings *eos.Settings
}

// SurfaceStep is the surface yield of one depletion step's produced gas.
type SurfaceStep struct {
	CGR        float64 // stock-tank oil over surface gas of this step, standard m³/m³
	GasGravity float64 // surface gas specific gravity (air = 1)
	CumGas     float64 // cumulative surface (sales) gas, standard m³ per mole of initial fluid
	CumOil     float64 // cumulative stock-tank oil, standard m³ per mole of initial fluid
	// CumWetGas is the cumulative produced well stream as an ideal-gas
	// standard volume, m³ per mole of initial fluid.
	CumWetGas float64
}

// DepletionStep is the cell after the gas removal at one pressure. Amounts are
// per mole of fluid initially in the cell.
type DepletionStep struct {
	P             float64 // Pa
	TwoPhase      bool    // liquid present (below the dew point)
	LiquidDropout float64 // retrograde liquid volume over the cell volume
	Produced      float64 // cumulative moles removed
	StepProduced  float64 // moles removed at this step
	ZGas          float64 // Z of the equilibrium (produced) gas
	ZTwoPhase     float64 // p V_cell / (n R T) of the cell contents
	Gas           eos.PhaseProps
	Liquid        eos.PhaseProps // zero when single phase
	GasViscosity  float64        // Pa·s, Lohrenz–Bray–Clark
	Y             []float64      // produced (equilibrium) gas composition
	X             []float64      // liquid composition (nil when single phase)
	LiquidMoles   float64        // moles of liquid in the cell
	Cell          []float64      // moles of each component left in the cell
	Surface       *SurfaceStep   // nil without a Train
}

// Depletion is a simulated constant-volume depletion.
type Depletion struct {
	T          float64        // K
	Dew        eos.Saturation // the upper dew point at T
	CellVolume float64        // m³ per mole of initial fluid
	Steps      []DepletionStep
	// MaxDropout is the largest liquid dropout (fraction of the cell volume)
	// and MaxDropoutP its pressure, from a parabola through the largest
	// reported step and its neighbours (the step itself at an end).
	MaxDropout, MaxDropoutP float64
}

// Deplete simulates a constant-volume depletion of feed z at t (K).
func Deplete(fl *eos.Fluid, z []float64, t float64, o DepletionOptions) (*Depletion, error) {
	return nil, errNotYet
}
