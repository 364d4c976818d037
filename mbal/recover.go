package mbal

import (
	"fmt"

	"dewcell/cvd"
	"dewcell/eos"
)

// RecoverOptions control Recover. Pressures, when given, are the steps below
// the initial pressure (decreasing, at or above the abandonment pressure);
// otherwise Steps even steps from the dew point to the abandonment pressure
// (0 means 10).
type RecoverOptions struct {
	Pressures []float64
	Steps     int
	// MobileLiquid lets the condensate above the critical saturation flow
	// with the gas (the modified depletion): the upper bound of condensate
	// recovery, where the default, immobile condensate is the lower one.
	MobileLiquid bool
	Settings     *eos.Settings
}

// RecoveryStep is the reservoir at one pressure of the depletion. Volumes are
// cumulative produced standard volumes, m³; recoveries are fractions of the
// initial in place.
type RecoveryStep struct {
	P float64 // Pa

	WetGas, SalesGas, Condensate       float64
	WetGasRF, SalesGasRF, CondensateRF float64
	// CGR is the producing condensate-gas ratio of the stream produced
	// at this step, stock-tank m³ per standard m³ of surface gas.
	CGR float64

	Z2 float64 // two-phase Z of the reservoir contents
	PZ float64 // p/Z2, Pa
	// So is the condensate saturation, liquid dropout × (1 − Sw), a fraction
	// of the pore volume; Mobile says it exceeds the critical saturation (or,
	// with mobile liquid, that liquid above it flowed at this step).
	So     float64
	Mobile bool

	SalesGasMoles, OilMoles float64 // cumulative surface gas and stock-tank oil moles
	Remaining               float64 // moles left in the reservoir
}

// Recovery is the depletion of a gas-condensate reservoir.
type Recovery struct {
	InPlace   *InPlace
	Depletion *cvd.Depletion // per mole of initial fluid
	Steps     []RecoveryStep
	// CriticalP is the highest pressure at which the condensate saturation
	// exceeds the critical saturation (0 when it never does).
	CriticalP float64
	// CondensateLeft is the stock-tank condensate of what remains in the
	// reservoir at the last step (the loss to the rock), standard m³.
	CondensateLeft float64
}

// Recover follows the reservoir from its initial pressure down to the
// abandonment pressure as a constant-volume depletion of its hydrocarbon
// pore volume (METHODS 8.3, 9.1): one simulated CVD cell stands for the
// reservoir, scaled by the moles in place, its volume shrinking with the rock
// and water compressibilities. Each step's produced stream goes through the
// separator train. The condensate saturation is the liquid dropout times
// (1 − Sw); with o.MobileLiquid the liquid above the critical saturation is
// produced with the gas.
//
// Special cases: as InPlaceEOS and cvd.Deplete; a fluid with a bubble point
// at the reservoir temperature: ErrNotCondensate.
func Recover(fl *eos.Fluid, z []float64, r Reservoir, tr cvd.Train, o RecoverOptions) (*Recovery, error) {
	ip, err := InPlaceEOS(fl, z, r, tr, o.Settings)
	if err != nil {
		return nil, err
	}
	if !(r.Abandonment > 0) {
		return nil, fmt.Errorf("%w: abandonment pressure %g Pa, want above zero for a recovery", ErrBadReservoir, r.Abandonment)
	}
	for k, p := range o.Pressures {
		if p < r.Abandonment {
			return nil, fmt.Errorf("%w: recovery pressure %d (%.6g Pa) is below the abandonment pressure %.6g Pa", ErrBadReservoir, k+1, p, r.Abandonment)
		}
	}
	steps := o.Steps
	if steps == 0 {
		steps = 10
	}
	dopt := cvd.DepletionOptions{
		Pressures:           o.Pressures,
		Steps:               steps,
		Abandonment:         r.Abandonment,
		Start:               r.Pi,
		Train:               &tr,
		Settings:            o.Settings,
		PoreCompressibility: r.EffectiveCompressibility(),
		MobileLiquid:        o.MobileLiquid,
		CriticalLiquid:      r.sc() / (1 - r.Sw),
	}
	d, err := cvd.Deplete(fl, z, r.T, dopt)
	if err != nil {
		return nil, err
	}
	if d.Dew.Type == eos.Bubble {
		return nil, fmt.Errorf("%w; its saturation point is where it starts to release gas (see the satpoint command)", ErrNotCondensate)
	}
	rec := &Recovery{InPlace: ip, Depletion: d}
	n := ip.Moles
	for _, s := range d.Steps {
		rs := RecoveryStep{
			P:         s.P,
			WetGas:    n * s.Surface.CumWetGas,
			SalesGas:  n * s.Surface.CumGas,
			CGR:       s.Surface.CGR,
			Z2:        s.ZTwoPhase,
			PZ:        s.P / s.ZTwoPhase,
			So:        s.LiquidDropout * (1 - r.Sw),
			Remaining: n * (1 - s.Produced),

			Condensate:    n * s.Surface.CumOil,
			SalesGasMoles: n * s.Surface.CumGasMoles,
			OilMoles:      n * s.Surface.CumOilMoles,
		}
		if s.StepProduced == 0 { // the initial state: what would be produced
			rs.CGR = ip.Surface.CGR
		}
		rs.WetGasRF = rs.WetGas / ip.WetGas
		rs.SalesGasRF = rs.SalesGas / ip.SalesGas
		if ip.Condensate > 0 {
			rs.CondensateRF = rs.Condensate / ip.Condensate
		}
		// with mobile liquid the saturation sits on the critical one, to
		// round-off, where liquid flows
		rs.Mobile = rs.So > r.sc() || s.LiquidOut > 0
		if rs.Mobile && rec.CriticalP == 0 {
			rec.CriticalP = s.P
		}
		rec.Steps = append(rec.Steps, rs)
	}
	last := d.Steps[len(d.Steps)-1]
	left := make([]float64, len(last.Cell))
	total := 0.0
	for _, v := range last.Cell {
		total += v
	}
	for i, v := range last.Cell {
		left[i] = v / total
	}
	sep, err := cvd.NewSeparator(fl, tr, o.Settings)
	if err != nil {
		return nil, err
	}
	sr, err := sep.Separate(left)
	if err != nil {
		return nil, fmt.Errorf("mbal: surface yield of the fluid left at abandonment: %w", err)
	}
	rec.CondensateLeft = n * total * sr.OilVolume
	return rec, nil
}
