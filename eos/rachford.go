package eos

import "math"

// rachfordRice solves the Rachford and Rice (1952) equation
//
//	g(β) = Σ_i z_i (K_i − 1) / (1 + β (K_i − 1)) = 0
//
// for the vapour fraction β inside the negative-flash window of Whitson and
// Michelsen (1989), 1/(1 − K_max) < β < 1/(1 − K_min), where g falls strictly
// between its two bracketing poles. Newton steps that leave the current bracket
// are replaced by bisection, so the root is always bracketed. guess is used
// when it lies inside the window. When every K_i ≥ 1 (or ≤ 1) there is no
// root: it returns +Inf (−Inf).
//
// Denominators are formed as (1 − β) + β K_i for β > 1/2, which keeps them
// accurate when β is close to 1 (a flash just below a dew point).
func rachfordRice(z, K []float64, guess float64) float64 {
	return rachfordRiceTol(z, K, guess, 1e-14)
}

// rachfordRiceTol is rachfordRice stopping when the Newton step is below
// rtol relative to the smaller of |β| and |1 − β|: the successive
// substitution of a flash far from its solution does not need β to the last
// digit, but close to a saturation point the amount of the incipient phase
// must be resolved, since a heavy component's K can be as small as that amount.
func rachfordRiceTol(z, K []float64, guess, rtol float64) float64 {
	kmin, kmax := math.Inf(1), math.Inf(-1)
	for i, zi := range z {
		if zi > 0 {
			kmin = min(kmin, K[i])
			kmax = max(kmax, K[i])
		}
	}
	if kmin >= 1 {
		return math.Inf(1)
	}
	if kmax <= 1 {
		return math.Inf(-1)
	}
	lo, hi := 1/(1-kmax), 1/(1-kmin)
	beta := guess
	if !(beta > lo && beta < hi) {
		beta = 0.5 * (lo + hi)
		if lo < 0 && hi > 1 {
			beta = 0.5
		}
	}
	for it := 0; it < 200; it++ {
		g, dg := rrEval(z, K, beta)
		if g == 0 {
			return beta
		}
		if g > 0 {
			lo = beta
		} else {
			hi = beta
		}
		step := g / dg
		if math.Abs(step) <= rtol*min(math.Abs(beta), math.Abs(1-beta))+1e-16 {
			return beta - step
		}
		next := beta - step
		if !(next > lo && next < hi) {
			next = 0.5 * (lo + hi)
		}
		if hi-lo <= 1e-15*math.Abs(beta) {
			return next
		}
		beta = next
	}
	return beta
}

func rrEval(z, K []float64, beta float64) (g, dg float64) {
	for i, zi := range z {
		if zi == 0 {
			continue
		}
		km1 := K[i] - 1
		var t float64
		if beta > 0.5 {
			t = (1 - beta) + beta*K[i]
		} else {
			t = 1 + beta*km1
		}
		q := km1 / t
		g += zi * q
		dg -= zi * q * q
	}
	return g, dg
}

// rrPhases fills x and y from the split β of feed z with K-values K.
func rrPhases(z, K []float64, beta float64, x, y []float64) {
	for i, zi := range z {
		var t float64
		if beta > 0.5 {
			t = (1 - beta) + beta*K[i]
		} else {
			t = 1 + beta*(K[i]-1)
		}
		x[i] = zi / t
		y[i] = K[i] * x[i]
	}
}
