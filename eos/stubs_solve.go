package eos

// Solver API: declarations only, replaced as the solvers land.

// TraceEnvelope traces the phase envelope of z by continuation.
func TraceEnvelope(fl *Fluid, z []float64, s *Settings) (*Envelope, error) { return nil, errNotYet }
