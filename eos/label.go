package eos

import "math"

// Naming a single phase. Away from a phase boundary a fluid of one phase is
// neither liquid nor vapour by any test of its own; dewcell follows the
// convention for pure fluids throughout (flash, expansion, depletion, the
// separator): a single phase is a liquid when it is below the critical
// temperature of its composition and denser than its critical density
// (its molar volume, untranslated, below the critical molar volume), and a
// vapour (gas) otherwise, supercritical fluid included. The critical point is
// the mixture's vapour–liquid critical point (VLCritical). A composition with
// none (a heavy tail whose saturation curve turns into a liquid–liquid
// boundary) uses pseudo-critical values instead: the temperature of Li (1971),
// Σ φ_i T_ci with volume fractions φ_i taken with the co-volumes, and the
// molar volume Z_c/Ω_b b_m = 3.951 b_m of a pure Peng–Robinson fluid at its
// critical point.
//
// Reference: Li, C.C. (1971). Critical temperature estimation for simple
// mixtures. Can. J. Chem. Eng. 49, 709–710.

// pureCriticalVolumeRatio is v_c/b of any pure fluid of the fluid's cubic:
// Z_c/Ω_b (3.951 for Peng–Robinson with Z_c = 0.3074013087, METHODS C1;
// 3.847 for Soave–Redlich–Kwong).
func (f *Fluid) pureCriticalVolumeRatio() float64 { return f.cubic.zc / f.cubic.omegaB }

// critCache holds the critical point of the last composition a work
// labelled, so that repeated single-phase results of one feed (an
// expansion, the steps of a depletion above the dew point) solve it once.
type critCache struct {
	z   []float64
	cp  CriticalPoint
	has bool // z has a vapour–liquid critical point
	set bool
}

// critical returns the critical temperature and molar volume used to name a
// phase of composition x: its vapour–liquid critical point, or the
// pseudo-critical values when it has none.
func (w *work) critical(x []float64) (tc, vc float64) {
	c := &w.crit
	if !c.set || !sameButRoundOff(c.z, x) {
		if c.z == nil {
			c.z = make([]float64, w.n)
		}
		copy(c.z, x)
		c.set = true
		cp, ok, err := VLCritical(w.fl, x)
		c.cp, c.has = cp, ok && err == nil
	}
	if c.has {
		return c.cp.T, c.cp.V
	}
	bm := 0.0
	for i, xi := range x {
		bm += xi * w.fl.b[i]
	}
	return w.fl.liTc(x), w.fl.pureCriticalVolumeRatio() * bm
}

// singleLabel names a single phase of composition x at t (K) with
// untranslated molar volume v (m³/mol) by the rule above. A phase hotter
// than the critical temperature of every component it holds, or of larger
// molar volume than every one of them at its critical point, is a gas
// without the mixture's critical point being solved for: the vapour–liquid
// critical temperature and volume of a reservoir fluid lie below the highest
// of its components'. Low pressures and high temperatures, the common case,
// so cost nothing.
func (w *work) singleLabel(t, v float64, x []float64) Phase {
	tmax, vmax := 0.0, 0.0
	for i, xi := range x {
		if xi > 0 {
			tmax = max(tmax, w.fl.tc[i])
			vmax = max(vmax, w.fl.pureCriticalVolumeRatio()*w.fl.b[i])
		}
	}
	if t >= tmax || v >= vmax {
		return Vapour
	}
	tc, vc := w.critical(x)
	if t < tc && v < vc {
		return Liquid
	}
	return Vapour
}

// sameButRoundOff reports whether a and b agree within 1e-12 relative in
// every element: the same composition but for the round-off of being
// normalised again (a depletion cell above its saturation point gives up
// moles of its own composition at every step), whose critical point is the
// same to that accuracy.
func sameButRoundOff(a, b []float64) bool {
	for i := range a {
		if math.Abs(a[i]-b[i]) > 1e-12*math.Max(math.Abs(a[i]), math.Abs(b[i])) {
			return false
		}
	}
	return true
}

func sameVector(a, b []float64) bool {
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// liTc is the pseudo-critical temperature of Li (1971) with the co-volumes
// b_i standing for the critical volumes.
func (f *Fluid) liTc(x []float64) float64 {
	num, den := 0.0, 0.0
	for i, xi := range x {
		w := xi * f.b[i]
		num += w * f.tc[i]
		den += w
	}
	if den == 0 {
		return math.NaN()
	}
	return num / den
}
