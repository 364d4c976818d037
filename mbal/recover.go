package mbal

import (
	"errors"
	"fmt"

	"dewcell/cvd"
	"dewcell/eos"
)

// RecoverOptions control Recover. Pressures, when given, are the reported
// pressures below the initial pressure (decreasing, at or above the
// abandonment pressure); otherwise Steps even steps from the dew point to
// the abandonment pressure (0 means 10). The depletion is integrated as the
// continuous process it is, adaptively, whatever the reported pressures
// (cvd.DepletionOptions.Adaptive).
type RecoverOptions struct {
	Pressures []float64
	Steps     int
	// FixedSteps, when above zero, integrates instead with that many even
	// first-order steps from the dew point to the abandonment pressure (the
	// laboratory's removals, whose recovery falls short of the continuous
	// depletion's by about in proportion to the step), and reports each of
	// them. Pressures and Steps must then be unset. At most 1000.
	FixedSteps int
	// Tolerance of the adaptive integration (cvd.DepletionOptions); 0 means
	// cvd.DefaultTolerance.
	Tolerance float64
	// MobileLiquid lets the condensate above the critical saturation flow
	// with the gas, in proportion to its mobility (fractional flow with the
	// reservoir's relative permeabilities and the phases' viscosities): the
	// upper bound of condensate recovery, where the default, immobile
	// condensate is the lower one.
	MobileLiquid bool
	// SkipMaxSaturation leaves Recovery.MaxSo and MaxSoP zero, saving the
	// search for the maximum condensate saturation.
	SkipMaxSaturation bool
	Settings          *eos.Settings
}

// MaxFixedSteps is the largest RecoverOptions.FixedSteps.
const MaxFixedSteps = 1000

// RecoveryStep is the reservoir at one pressure of the depletion. Volumes are
// cumulative produced standard volumes, m³; recoveries are fractions of the
// initial in place.
type RecoveryStep struct {
	P float64 // Pa

	WetGas, SalesGas, Condensate       float64
	WetGasRF, SalesGasRF, CondensateRF float64
	// CGR is the producing condensate-gas ratio of the stream produced
	// since the step before, stock-tank m³ per standard m³ of surface gas.
	CGR float64
	// The estimated discretisation errors of the cumulative volumes
	// (computed minus exact; zero with FixedSteps), standard m³, and of the
	// recoveries, fractions.
	WetGasError, SalesGasError, CondensateError       float64
	WetGasRFError, SalesGasRFError, CondensateRFError float64

	Z2 float64 // two-phase Z of the reservoir contents
	PZ float64 // p/Z2, Pa
	// So is the condensate saturation, liquid dropout × (1 − Sw), a fraction
	// of the pore volume; Mobile says it exceeds the critical saturation.
	So     float64
	Mobile bool
	// CondensateFlow is the condensate's share of the reservoir volume
	// flowing at this pressure (zero unless MobileLiquid).
	CondensateFlow float64

	SalesGasMoles, OilMoles float64 // cumulative surface gas and stock-tank oil moles
	Remaining               float64 // moles left in the reservoir
}

// Recovery is the depletion of a gas-condensate reservoir.
type Recovery struct {
	InPlace   *InPlace
	Depletion *cvd.Depletion // per mole of initial fluid
	Steps     []RecoveryStep
	// CriticalP is the highest reported pressure at which the condensate
	// saturation exceeds the critical saturation (0 when it never does).
	CriticalP float64
	// MaxSo is the largest condensate saturation of the depletion and
	// MaxSoP its pressure (a search on the continuous depletion; see
	// cvd.Depletion.MaxDropout).
	MaxSo, MaxSoP float64
	// CondensateLeft is the condensate in place not produced by the
	// abandonment pressure, standard m³: in place = produced + left.
	CondensateLeft float64
	// RemainingFluidCondensate is the stock-tank condensate that the fluid
	// left in the reservoir at abandonment would give if it were produced
	// and processed through the separator train, standard m³. It is not
	// CondensateLeft: separator yields do not add, the remaining fluid being
	// richer than what was produced.
	RemainingFluidCondensate float64
}

// Recover follows the reservoir from its initial pressure down to the
// abandonment pressure as a constant-volume depletion of its hydrocarbon
// pore volume (METHODS 8.3, 9.1): one simulated cell stands for the
// reservoir, scaled by the moles in place, its volume shrinking with the rock
// and water compressibilities. Below the dew point the depletion is
// integrated as a continuous process (cvd.Deplete with Adaptive), each step's
// produced stream through the separator train, and the estimated
// discretisation error is reported with the volumes. The condensate
// saturation is the liquid dropout times (1 − Sw); with o.MobileLiquid the
// condensate flows with its fractional flow (Reservoir.RelPerm, the phases'
// Lohrenz–Bray–Clark viscosities).
//
// Special cases: as InPlaceEOS and cvd.Deplete; a fluid with a bubble point
// at the reservoir temperature: ErrNotCondensate; FixedSteps with Pressures
// or Steps, or above MaxFixedSteps: ErrBadReservoir.
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
	switch {
	case o.FixedSteps < 0 || o.FixedSteps > MaxFixedSteps:
		return nil, fmt.Errorf("%w: %d fixed steps, want 1 to %d", ErrBadReservoir, o.FixedSteps, MaxFixedSteps)
	case o.FixedSteps > 0 && (o.Pressures != nil || o.Steps != 0):
		return nil, fmt.Errorf("%w: fixed steps exclude reported pressures and steps", ErrBadReservoir)
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
		Adaptive:            o.FixedSteps == 0,
		Tolerance:           o.Tolerance,
		SkipMaxDropout:      o.SkipMaxSaturation,
		DewOnly:             true,
	}
	if o.FixedSteps > 0 {
		dopt.Steps = o.FixedSteps
	}
	if o.MobileLiquid {
		kr, sw, scc := r.RelPerm, r.Sw, r.sc()
		dopt.LiquidFlow = func(s cvd.FlowState) float64 {
			fc, _, _ := kr.FractionalFlow(s.LiquidFraction*(1-sw), sw, scc, s.LiquidViscosity, s.GasViscosity)
			return fc
		}
	}
	d, err := cvd.Deplete(fl, z, r.T, dopt)
	if errors.Is(err, cvd.ErrBubblePoint) {
		oe := &OilError{T: r.T}
		if d != nil {
			oe.Pb = d.Dew.P
		}
		if cp, ok, cerr := eos.VLCritical(fl, z); cerr == nil && ok {
			oe.Tc = cp.T
		}
		return nil, oe
	}
	if err != nil {
		return nil, err
	}
	rec := &Recovery{InPlace: ip, Depletion: d, MaxSo: d.MaxDropout * (1 - r.Sw), MaxSoP: d.MaxDropoutP}
	n := ip.Moles
	vsc := tr.StandardConditions().IdealGasVolume()
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

			Condensate:     n * s.Surface.CumOil,
			SalesGasMoles:  n * s.Surface.CumGasMoles,
			OilMoles:       n * s.Surface.CumOilMoles,
			CondensateFlow: s.LiquidFlow,

			SalesGasError:   n * s.Surface.CumGasError,
			CondensateError: n * s.Surface.CumOilError,
		}
		for _, e := range s.ProducedError {
			rs.WetGasError += n * e * vsc
		}
		if s.StepProduced == 0 { // the initial state: what would be produced
			rs.CGR = ip.Surface.CGR
		}
		rs.WetGasRF = rs.WetGas / ip.WetGas
		rs.SalesGasRF = rs.SalesGas / ip.SalesGas
		rs.WetGasRFError = rs.WetGasError / ip.WetGas
		rs.SalesGasRFError = rs.SalesGasError / ip.SalesGas
		if ip.Condensate > 0 {
			rs.CondensateRF = rs.Condensate / ip.Condensate
			rs.CondensateRFError = rs.CondensateError / ip.Condensate
		}
		rs.Mobile = rs.So > r.sc()
		if rs.Mobile && rec.CriticalP == 0 {
			rec.CriticalP = s.P
		}
		rec.Steps = append(rec.Steps, rs)
	}
	last := d.Steps[len(d.Steps)-1]
	rec.CondensateLeft = ip.Condensate - rec.Steps[len(rec.Steps)-1].Condensate
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
		return nil, fmt.Errorf("surface yield of the fluid left at abandonment: %w", err)
	}
	rec.RemainingFluidCondensate = n * total * sr.OilVolume
	return rec, nil
}
