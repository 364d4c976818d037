package mbal

import "dewcell/internal/phys"

// WaterFVFMcCain returns the formation volume factor of formation water,
// reservoir m³ per m³ at standard conditions (rb/STB), at temperature t (K)
// and pressure p (Pa), by the correlation of McCain (1990, 1991):
//
//	B_w = (1 + ΔV_wt)(1 + ΔV_wp)
//	ΔV_wt = −1.0001e−2 + 1.33391e−4 T + 5.50654e−7 T²
//	ΔV_wp = −1.95301e−9 p T − 1.72834e−13 p² T − 3.58922e−7 p − 2.25341e−10 p²
//
// with T in °F and p in psia, the units it was published in (converted
// here). The volume change with temperature and with pressure from standard
// conditions: fitted to data over the whole range of salinity (whose effects
// on the two changes cancel), up to 260 °F and 5000 psia; beyond that it is
// an extrapolation (see WaterFVFMcCainRange).
//
// References:
//
//   - McCain, W.D. Jr. (1990). The Properties of Petroleum Fluids, 2nd ed.
//     PennWell, Tulsa.
//   - McCain, W.D. Jr. (1991). Reservoir-fluid property correlations: state
//     of the art. SPE Reservoir Engineering 6(2), 266–272. SPE-18571-PA.
//
// The coefficients were checked against two independent statements of the
// correlation and its worked example (3176 psia, 165 °F: B_w = 1.022).
func WaterFVFMcCain(t, p float64) float64 {
	tf := phys.FahrenheitFromKelvin(t)
	pp := p / fieldPsi
	dvt := -1.0001e-2 + 1.33391e-4*tf + 5.50654e-7*tf*tf
	dvp := -1.95301e-9*pp*tf - 1.72834e-13*pp*pp*tf - 3.58922e-7*pp - 2.25341e-10*pp*pp
	return (1 + dvt) * (1 + dvp)
}

// WaterFVFMcCainRange says whether t (K) and p (Pa) lie within the data of
// WaterFVFMcCain: up to 260 °F and 5000 psia.
func WaterFVFMcCainRange(t, p float64) bool {
	return phys.FahrenheitFromKelvin(t) <= 260 && p/fieldPsi <= 5000
}
