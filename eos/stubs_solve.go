package eos

// Solver API: declarations only, replaced as the solvers land.

// A Flasher keeps the scratch space for repeated flashes of one Fluid.
// Not safe for concurrent use: one per goroutine.
type Flasher struct{ fl *Fluid }

// NewFlasher returns a Flasher for fl.
func NewFlasher(fl *Fluid, s *Settings) *Flasher { return &Flasher{fl: fl} }

// Flash writes into dst the equilibrium of feed z at t (K) and p (Pa):
// Michelsen stability test first, then successive substitution and Newton.
func (f *Flasher) Flash(dst *FlashResult, t, p float64, z []float64) error { return errNotYet }

// Props returns the single-phase properties of composition x at t and p on the
// cubic root of lowest Gibbs energy, and which root that is.
func (f *Fluid) Props(t, p float64, x []float64) (PhaseProps, Phase) { return PhaseProps{}, Vapour }

// UpperSaturation finds the saturation point of feed z at t met first when the
// pressure falls from above: the upper dew point of a gas condensate, the
// bubble point of an oil. Stable at every pressure: ErrNoSaturation.
func UpperSaturation(fl *Fluid, t float64, z []float64, s *Settings) (Saturation, error) {
	return Saturation{}, errNotYet
}

// LowerDewPoint finds the lower dew point below the upper saturation pressure
// pUpper, where the feed becomes single-phase vapour again. None above the
// lowest pressure searched: ErrNoSaturation.
func LowerDewPoint(fl *Fluid, t float64, z []float64, pUpper float64, s *Settings) (Saturation, error) {
	return Saturation{}, errNotYet
}

// TraceEnvelope traces the phase envelope of z by continuation.
func TraceEnvelope(fl *Fluid, z []float64, s *Settings) (*Envelope, error) { return nil, errNotYet }

// PureSaturationPressure returns the vapour pressure of component c at t < Tc
// on the Peng–Robinson equation eq, where the liquid and vapour fugacities are equal.
func PureSaturationPressure(c Component, eq Equation, t float64) (float64, error) {
	return 0, errNotYet
}
