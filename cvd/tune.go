package cvd

import (
	"errors"
	"fmt"

	"dewcell/eos"
)

// TuneProblem is a regression of a fluid's parameters to a laboratory
// report. The parameters are whatever Build makes of them (multipliers of
// critical properties, interaction coefficients, a plus fraction's molar
// mass): Tune only sees numbers between bounds.
type TuneProblem struct {
	// Build makes the fluid and its feed for parameter values x.
	Build func(x []float64) (*eos.Fluid, []float64, error)
	// X0 is the start, Lo and Hi the bounds (Lo < Hi, X0 within).
	X0, Lo, Hi []float64
	Lab        LabReport
	// Weights weigh the quantities of the objective (Weight; nil means
	// DefaultWeights).
	Weights map[string]float64
	Compare CompareOptions
	// Regress controls the regression; nil means its defaults, but for the
	// finite-difference step, TuneFDStep unless set.
	Regress *RegressSettings
}

// TuneResult is a tuned fluid and how well it and the untuned one match.
type TuneResult struct {
	X []float64 // the tuned parameters
	// Before and After are the comparisons at X0 and at X; Fluid and Z the
	// tuned fluid and feed.
	Before, After *Comparison
	Fluid         *eos.Fluid
	Z             []float64
	// ObjectiveBefore and ObjectiveAfter are the weighted sums of squared
	// deviations (Comparison.Objective) at X0 and X.
	ObjectiveBefore, ObjectiveAfter float64
	Fit                             *RegressResult
}

// TuneFDStep is the finite-difference step, in scaled parameters, Tune
// gives the regression when its settings give none. The model's CVD cell
// is charged at the higher of the model's and the measured saturation
// pressure (Comparison.Start), so the produced moles, and with them the
// objective, have a kink where the two are equal, and a tuned model's dew
// point lies close to the measured one: a step of 1e-4 (the regression's
// default) straddles the kink there, which halves the standard errors and
// stalls Levenberg–Marquardt. A step of 1e-6 keeps the differences on one
// side for dew points more than about 0.01 psi from the measured one;
// the saturation point and the flashes converge to about 1e-10, so the
// noise of the differences stays near 1e-4 of their size. Measured on the
// example's report (four parameters, rounded data): 6 iterations and 39
// evaluations with Levenberg–Marquardt alone, against 35 iterations, 108
// evaluations and a fall-back on Nelder–Mead with 1e-4.
const TuneFDStep = 1e-6

// ErrNoWeight: every quantity the report measures has weight zero: there is
// nothing to fit.
var ErrNoWeight = errors.New("every measured quantity has weight 0")

// ErrTuneStart: the model at the starting parameters cannot be compared
// with the report, so there is nothing to tune from.
var ErrTuneStart = errors.New("the model at the starting parameters cannot be compared with the laboratory report")

// Tune regresses the parameters of p to the laboratory report: it minimises
// the weighted sum of squared deviations of every measured quantity
// (Comparison.Residuals: relative deviations in percent for pressures,
// Z-factors, relative volumes, densities, viscosities and CGR; absolute
// ones in percentage points for liquid dropout and liquid volume, produced
// moles and compositions), solving the saturation point and simulating the
// experiments at every evaluation, with Regress (bounded Levenberg–Marquardt,
// Nelder–Mead when the Jacobian is poor). A parameter set whose model
// cannot be evaluated (no saturation point, a flash that fails) counts as
// a failed evaluation, never as an error; only a start that cannot be
// evaluated is (ErrTuneStart, wrapping the cause).
func Tune(p TuneProblem) (*TuneResult, error) {
	eval := func(x []float64) (*Comparison, *eos.Fluid, []float64, error) {
		fl, z, err := p.Build(x)
		if err != nil {
			return nil, nil, nil, err
		}
		c, err := Compare(fl, z, p.Lab, p.Compare)
		return c, fl, z, err
	}
	before, _, _, err := eval(p.X0)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrTuneStart, err)
	}
	m := len(before.Residuals(nil, p.Weights))
	if m == 0 {
		return nil, fmt.Errorf("%w: %w", ErrTuneStart, ErrNoLabData)
	}
	weighed := false
	for _, q := range before.Quantities {
		weighed = weighed || Weight(p.Weights, q.Name) > 0
	}
	if !weighed {
		return nil, fmt.Errorf("%w: %w", ErrTuneStart, ErrNoWeight)
	}
	buf := make([]float64, 0, m)
	residuals := func(x, r []float64) error {
		c, _, _, err := eval(x)
		if err != nil {
			return err
		}
		buf = c.Residuals(buf[:0], p.Weights)
		if len(buf) != len(r) {
			return fmt.Errorf("%d deviations for %d measurements", len(buf), len(r))
		}
		copy(r, buf)
		return nil
	}
	set := RegressSettings{}
	if p.Regress != nil {
		set = *p.Regress
	}
	if set.FDStep == 0 {
		set.FDStep = TuneFDStep
	}
	fit, err := Regress(residuals, m, p.X0, p.Lo, p.Hi, &set)
	if err != nil {
		return nil, err
	}
	after, fl, z, err := eval(fit.X)
	if err != nil {
		return nil, fmt.Errorf("the tuned model cannot be compared with the laboratory report: %w", err)
	}
	return &TuneResult{
		X: append([]float64(nil), fit.X...), Before: before, After: after, Fluid: fl, Z: z,
		ObjectiveBefore: before.Objective(p.Weights), ObjectiveAfter: after.Objective(p.Weights),
		Fit: fit,
	}, nil
}
