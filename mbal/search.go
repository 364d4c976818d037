package mbal

import "math"

// searchRuns keeps the last runs of a pressure search (the pressure and the
// moles the reservoir gave there) for the slope the next search starts
// with.
type searchRuns struct {
	p, g [4]float64
	n    int
}

// add records a run at pressure p that gave g moles.
func (r *searchRuns) add(p, g float64) {
	r.p[r.n%len(r.p)], r.g[r.n%len(r.g)] = p, g
	r.n++
}

// slope is the secant between the last run and the latest before it whose
// moles differ from the last's by 1e-5 of the withdrawal dn or more (a
// last step so short that the flashes' noise, about 1e-9 of it, would show
// in the slope is passed over), else the farthest from it in pressure;
// after one run, alone (the slope the search had). ok is false when that
// slope is not negative.
func (r *searchRuns) slope(dn, alone float64) (slope float64, ok bool) {
	slope = alone
	if r.n >= 2 {
		slope = r.secant(dn)
	}
	return slope, slope < 0 && !math.IsInf(slope, 0)
}

// secant is slope's secant, for two runs or more.
func (r *searchRuns) secant(dn float64) float64 {
	last := (r.n - 1) % len(r.p)
	far := last
	for j := 1; j < min(r.n, len(r.p)); j++ {
		k := (r.n - 1 - j) % len(r.p)
		if math.Abs(r.p[k]-r.p[last]) > math.Abs(r.p[far]-r.p[last]) {
			far = k
		}
		if math.Abs(r.g[k]-r.g[last]) >= 1e-5*dn {
			far = k
			break
		}
	}
	return (r.g[last] - r.g[far]) / (r.p[last] - r.p[far])
}
