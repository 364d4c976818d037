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
	// ErrTwoPhaseToLimit: the feed is unstable at every pressure up to
	// 400 MPa, the highest the saturation search tries.
	ErrTwoPhaseToLimit = errors.New("two phases at every pressure up to 400 MPa")
	// ErrNearCritical: see NearCriticalError.
	ErrNearCritical = errors.New("the incipient phase cannot be told from the feed")
)

// SolveError says where an iterative solve stopped, in the manner of strconv.NumError.
type SolveError struct {
	Op       string  // "Flash", "UpperSaturation", "Envelope", ...
	Iter     int     // iterations taken
	Residual float64 // final residual of the solver's convergence measure
	Err      error   // ErrNoConvergence, ErrNoSaturation, ...
}

// Error says what did not succeed, in words ("the flash: iteration did not
// converge"). The iterations and the residual stay in the fields: they are
// for diagnosis, not for the reader of a message.
func (e *SolveError) Error() string {
	return e.What() + ": " + e.Err.Error()
}

// What names the solve in words: "the flash", "the saturation-pressure
// search", …
func (e *SolveError) What() string {
	switch e.Op {
	case "Flash":
		return "the flash"
	case "UpperSaturation":
		return "the saturation-pressure search"
	case "LowerDewPoint":
		return "the lower-dew-point search"
	case "TraceEnvelope":
		return "the phase-envelope trace"
	}
	return "the " + e.Op
}

// Unwrap lets errors.Is(err, ErrNoConvergence) work.
func (e *SolveError) Unwrap() error { return e.Err }

// NearCriticalError reports a saturation point that cannot be resolved: the
// incipient phase the solver found is the feed to within 0.01 % in every K
// value, which happens within a small fraction of a kelvin of the critical
// point (and is otherwise the trivial solution, never an answer).
type NearCriticalError struct {
	Op     string
	T, P   float64 // K, Pa: where the search ended
	Tc, Pc float64 // the feed's vapour–liquid critical point, K and Pa; zero when it has none
	Iter   int
}

// Error gives the temperatures in kelvin; a command shows them in its own
// units from the fields.
func (e *NearCriticalError) Error() string {
	msg := fmt.Sprintf("at %.6g K the incipient phase cannot be told from the feed", e.T)
	if e.Tc > 0 {
		msg += fmt.Sprintf(" (%.3g K from the critical temperature %.6g K)", math.Abs(e.T-e.Tc), e.Tc)
	}
	return msg
}

// A StateError says at which state an operation on a fluid failed. T and
// P are in kelvin and pascal (zero when not part of the state); a command
// shows them in its own units.
type StateError struct {
	What string  // what was done there: "flash of the cell", "separator stage 2", …
	T, P float64 // K, Pa
	Err  error
}

func (e *StateError) Error() string {
	at := ""
	switch {
	case e.T > 0 && e.P > 0:
		at = fmt.Sprintf(" at %.6g K and %.6g Pa", e.T, e.P)
	case e.T > 0:
		at = fmt.Sprintf(" at %.6g K", e.T)
	case e.P > 0:
		at = fmt.Sprintf(" at %.6g Pa", e.P)
	}
	return e.What + at + ": " + e.Err.Error()
}

// Unwrap returns the error at that state.
func (e *StateError) Unwrap() error { return e.Err }

// Unwrap lets errors.Is(err, ErrNearCritical) work.
func (e *NearCriticalError) Unwrap() error { return ErrNearCritical }

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
	Single Phase     // the phase's name when Phases == 1, by the rule of label.go
	X, Y   []float64 // liquid and vapour mole fractions; both equal the feed when single phase
	L, V   PhaseProps
	Iter   int     // total iterations (stability + successive substitution + Newton)
	Resid  float64 // max |ln f_i^L − ln f_i^V| at the solution (0 when single phase)
	// ThreePhase is set when the two-phase split of lowest Gibbs energy
	// found is itself unstable: a third phase would lower the Gibbs energy
	// further (a three-phase region), and X, Y and Beta are that split, not
	// the equilibrium.
	ThreePhase bool
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
	// Type is Dew on the branch traced before the critical point, where
	// the feed is the gas, and Bubble past it.
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
	// End says where and why the trace stopped; Points ends there.
	End EnvelopeEnd
	// Truncated is set when the trace stopped before the bubble branch
	// returned to low pressure (End is not EndClosed); the cricondenbar and
	// cricondentherm are then the extremes of the points traced.
	Truncated bool
	// NearCritical is set with Truncated when the trace stopped on the dew
	// branch with every K within 10 % of 1, short of a critical point it
	// could not cross (End is EndNearCritical).
	NearCritical bool

	pts []envPoint // the traced points with their tangents, for the saturation solvers
}

// EnvelopeEnd names the limit at which a phase-envelope trace stopped.
type EnvelopeEnd int

const (
	// EndClosed: the bubble branch came back to 50 kPa; the envelope is whole.
	EndClosed EnvelopeEnd = iota
	// EndNearCritical: the dew branch reached every K within 10 % of 1 and
	// could cross no critical point.
	EndNearCritical
	// EndSecondCritical: the bubble branch met a second critical point,
	// beyond which the two phases are both dense.
	EndSecondCritical
	// EndDensePhases: the curve turned into the boundary of a region of two
	// dense phases (a liquid–liquid split at low temperature): on one
	// branch the pressure passed its maximum, fell by 2 % and rose again by
	// more than 2 %, or on
	// the dew branch the incipient liquid, having grown lighter, grew
	// heavier again by more than 2 % in molar mass. The trace stops at the
	// lowest pressure, or the lightest incipient liquid.
	EndDensePhases
	// EndNoContinuation: no saturation point continues the trace (past the
	// critical point, or on the way down from the cricondenbar).
	EndNoContinuation
	// EndPressureLimit: the trace reached 400 MPa.
	EndPressureLimit
	// EndLowTemperature: the trace reached 30 K.
	EndLowTemperature
	// EndTooManyPoints: the trace took its limit of 600 points.
	EndTooManyPoints
)

func (e EnvelopeEnd) String() string {
	switch e {
	case EndClosed:
		return "closed"
	case EndNearCritical:
		return "near-critical"
	case EndSecondCritical:
		return "second-critical"
	case EndDensePhases:
		return "dense-phases"
	case EndNoContinuation:
		return "no-continuation"
	case EndPressureLimit:
		return "pressure-limit"
	case EndLowTemperature:
		return "low-temperature"
	case EndTooManyPoints:
		return "too-many-points"
	}
	return fmt.Sprintf("EnvelopeEnd(%d)", int(e))
}

// IncipientPhase is the phase that appears at the saturation point: liquid at
// a dew point, vapour at a bubble point.
func (s Saturation) IncipientPhase() Phase {
	if s.Type == Bubble {
		return Vapour
	}
	return Liquid
}
