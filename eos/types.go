package eos

import (
	"errors"
	"fmt"
	"math"
)

// Sentinel errors of the iterative solvers. Solvers wrap them in *SolveError.
var (
	ErrNoConvergence = errors.New("iteration did not converge")
	ErrNoSaturation  = errors.New("no saturation point at this temperature")
	ErrBadState      = errors.New("temperature or pressure not finite and positive")
)

// SolveError says where an iterative solve stopped, in the manner of strconv.NumError.
type SolveError struct {
	Op       string  // "Flash", "UpperSaturation", "Envelope", ...
	Iter     int     // iterations taken
	Residual float64 // final residual of the solver's convergence measure
	Err      error   // ErrNoConvergence, ErrNoSaturation, ...
}

// Error names the iterations when some were made and the residual when one
// was measured (finite and not zero): "eos.Flash: iteration did not converge
// after 36 iterations (residual 2.13e-05)".
func (e *SolveError) Error() string {
	msg := fmt.Sprintf("eos.%s: %v", e.Op, e.Err)
	if e.Iter > 0 {
		msg += fmt.Sprintf(" after %d iterations", e.Iter)
	}
	if e.Residual != 0 && !math.IsNaN(e.Residual) && !math.IsInf(e.Residual, 0) {
		msg += fmt.Sprintf(" (residual %.3g)", e.Residual)
	}
	return msg
}

// Unwrap lets errors.Is(err, ErrNoConvergence) work.
func (e *SolveError) Unwrap() error { return e.Err }

// Phase labels a single phase or the root of the cubic chosen for it.
type Phase int

const (
	// Vapour is the lighter phase: the larger-volume root, or the lower mass density.
	Vapour Phase = iota
	// Liquid is the denser phase.
	Liquid
)

func (p Phase) String() string {
	if p == Liquid {
		return "liquid"
	}
	return "vapour"
}

// Settings controls the iterative solvers. A nil *Settings means all defaults.
type Settings struct {
	Tol     float64 // max |ln f_i^L − ln f_i^V| at convergence; 0 means 1e-12
	MaxIter int     // iteration limit for each stage of a solve; 0 means 200
}

func (s *Settings) tol() float64 {
	if s == nil || s.Tol <= 0 {
		return 1e-12
	}
	return s.Tol
}

func (s *Settings) maxIter() int {
	if s == nil || s.MaxIter <= 0 {
		return 200
	}
	return s.MaxIter
}

// PhaseProps are the properties of one phase. Volumes and densities include
// the Peneloux translation when the fluid was built with VolumeShift.
type PhaseProps struct {
	Z   float64 // compressibility factor P v/(R T)
	V   float64 // molar volume, m³/mol
	Rho float64 // mass density, kg/m³
	M   float64 // molar mass, kg/mol
}

// FlashResult is the outcome of a PT flash. X and Y are owned by the result
// and reused by later flashes into the same value.
type FlashResult struct {
	Phases int       // 1 or 2
	Beta   float64   // vapour mole fraction of the feed: 0 or 1 when single phase
	Single Phase     // the phase label when Phases == 1
	X, Y   []float64 // liquid and vapour mole fractions; both equal the feed when single phase
	L, V   PhaseProps
	Iter   int     // total iterations (stability + successive substitution + Newton)
	Resid  float64 // max |ln f_i^L − ln f_i^V| at the solution (0 when single phase)
}

// SatType is the kind of a saturation point.
type SatType int

const (
	// Dew: the feed is vapour and an incipient liquid appears.
	Dew SatType = iota
	// Bubble: the feed is liquid and an incipient vapour appears.
	Bubble
)

func (t SatType) String() string {
	if t == Bubble {
		return "bubble"
	}
	return "dew"
}

// Saturation is a saturation point of a feed at a temperature.
type Saturation struct {
	Type      SatType
	T, P      float64   // K, Pa
	Incipient []float64 // composition of the incipient phase
	Feed      PhaseProps
	Inc       PhaseProps // incipient-phase properties
	Iter      int
	Resid     float64 // max |ln f_i(feed) − ln f_i(incipient)|
}

// EnvelopePoint is one converged point of a phase envelope.
type EnvelopePoint struct {
	T, P float64 // K, Pa
	// Type is Dew on the branch where the feed is the lighter phase and
	// Bubble past the critical point.
	Type SatType
	K    []float64 // K_i = y_i/x_i between the feed and the incipient phase (feed/incipient on the dew branch)
}

// Envelope is a traced phase envelope.
type Envelope struct {
	Points         []EnvelopePoint // in the order traced: dew branch from low pressure, through the critical point, bubble branch
	HasCritical    bool
	Critical       [2]float64 // T (K), P (Pa) of the critical point, when HasCritical
	Cricondenbar   [2]float64 // T, P at the maximum pressure
	Cricondentherm [2]float64 // T, P at the maximum temperature
	// Truncated is set when the trace ended before returning to low pressure
	// because the continuation could not go on: on the bubble branch at low
	// temperature, typically where a liquid–liquid split takes over; or on
	// the dew branch within a few per cent of a critical point it could not
	// cross (NearCritical; HasCritical is then false). Points holds the
	// converged points up to there, and the cricondenbar and cricondentherm
	// are the extremes of those points.
	Truncated bool
	// NearCritical is set with Truncated when the trace stopped on the dew
	// branch with every K within 10 % of 1, short of a critical point.
	NearCritical bool
}

// IncipientPhase is the phase that appears at the saturation point: liquid at
// a dew point, vapour at a bubble point.
func (s Saturation) IncipientPhase() Phase {
	if s.Type == Bubble {
		return Vapour
	}
	return Liquid
}
