// Package testfluid builds an invented gas condensate for the tests of the
// packages above eos, where a test checks identities (material balances,
// volumes, monotone recoveries) rather than published values. Its numbers
// describe no real fluid.
package testfluid

import (
	"dewcell/eos"
	"dewcell/internal/phys"
)

// Condensate returns a 12-component gas condensate: N2, CO2 and C1–nC6 from
// the eos library and a C7+ of 7 mol %, 150 g/mol and specific gravity 0.80
// split by the gamma distribution (shape 2) into four pseudo-components, with
// the default interaction coefficients, on PR78 with or without volume shift.
// Its dew point at 250 °F lies near 4600 psia.
func Condensate(shift bool) (*eos.Fluid, []float64, error) {
	return build([]component{{"N2", 0.3}, {"CO2", 2.4}, {"C1", 72}, {"C2", 8.5}, {"C3", 4.8}, {"nC4", 2.6}, {"nC5", 1.4}, {"nC6", 1.0}},
		7, 0.150, 0.80, eos.Characterization{Alpha: 2}, eos.Options{VolumeShift: shift})
}

// A component is a library component and its mole percent.
type component struct {
	name string
	pct  float64
}

// A Case is an invented reservoir fluid with the temperature and pressures
// of an invented reservoir, for the depletion tests: SI throughout.
type Case struct {
	Name        string
	Fluid       *eos.Fluid
	Z           []float64
	T           float64 // reservoir temperature, K
	Pi          float64 // initial pressure, Pa, a few hundred psi above the dew point
	Abandonment float64 // Pa
}

const psi = phys.PaPerPsi // Pa per psi

func degF(f float64) float64 { return phys.KelvinFromFahrenheit(f) }

// build makes a fluid from library components (mol %) and a C7+ of pct
// mol %, molar mass m (kg/mol) and specific gravity sg, split by ch, with the
// default interaction coefficients.
func build(defined []component, pct, m, sg float64, ch eos.Characterization, opt eos.Options) (*eos.Fluid, []float64, error) {
	var comps []eos.Component
	var z []float64
	for _, d := range defined {
		c, _ := eos.LibraryComponent(d.name)
		comps = append(comps, c)
		z = append(z, d.pct/100)
	}
	pcs, pz, err := eos.SplitPlus(eos.PlusFraction{Name: "C7+", FirstCarbon: 7, Z: pct / 100, M: m, SG: sg}, ch)
	if err != nil {
		return nil, nil, err
	}
	comps = append(comps, pcs...)
	z = append(z, pz...)
	s := 0.0
	for _, v := range z {
		s += v
	}
	for i := range z {
		z[i] /= s
	}
	fl, err := eos.NewFluid(comps, eos.DefaultKij(comps, eos.ChuehPrausnitz{}), opt)
	if err != nil {
		return nil, nil, err
	}
	return fl, z, nil
}

// caseFluid is build for the depletion cases: PR78 with volume shift, the
// C7+ split by the gamma distribution (shape 2) into four pseudo-components
// with the Kesler–Lee correlations.
func caseFluid(defined []component, pct, m, sg float64) (*eos.Fluid, []float64, error) {
	return build(defined, pct, m, sg, eos.Characterization{Alpha: 2, Correlation: eos.KeslerLee, Acentric: eos.AcentricKeslerLee},
		eos.Options{Equation: eos.PR78, VolumeShift: true})
}

// Lean is a lean gas condensate at 300 °F: 3 mol % C7+ of 130 g/mol and
// specific gravity 0.77; dew point near 2225 psia, maximum liquid dropout
// about 0.5 % of the cell volume.
func Lean() (Case, error) {
	fl, z, err := caseFluid([]component{{"N2", 0.5}, {"CO2", 1.5}, {"C1", 82}, {"C2", 6.5}, {"C3", 3}, {"iC4", 0.7}, {"nC4", 1}, {"iC5", 0.45}, {"nC5", 0.45}, {"nC6", 0.9}},
		3, 0.130, 0.77)
	return Case{"lean", fl, z, degF(300), 2600 * psi, 700 * psi}, err
}

// Sour is a sour gas condensate at 240 °F: 8 mol % CO2, 2 mol % H2S and
// 5.7 mol % C7+ of 140 g/mol and specific gravity 0.785; dew point near
// 3920 psia, maximum liquid dropout about 11 %.
func Sour() (Case, error) {
	fl, z, err := caseFluid([]component{{"N2", 0.4}, {"CO2", 8}, {"H2S", 2}, {"C1", 68}, {"C2", 7}, {"C3", 4}, {"iC4", 0.9}, {"nC4", 1.5}, {"iC5", 0.7}, {"nC5", 0.7}, {"nC6", 1.1}},
		5.7, 0.140, 0.785)
	return Case{"sour", fl, z, degF(240), 4400 * psi, 700 * psi}, err
}

// Rich is a rich, near-critical gas condensate at 280 °F: 12 mol % C7+ of
// 135 g/mol and specific gravity 0.81. Its critical point lies near 268 °F
// and 3907 psia, so at 280 °F it has a dew point (near 3867 psia) with a
// steep liquid dropout below it, up to about 38 % of the cell volume.
func Rich() (Case, error) {
	fl, z, err := caseFluid([]component{{"N2", 0.3}, {"CO2", 2}, {"C1", 62.4}, {"C2", 9}, {"C3", 6}, {"iC4", 1.3}, {"nC4", 2.5}, {"iC5", 1.1}, {"nC5", 1.3}, {"nC6", 2.1}},
		12, 0.135, 0.81)
	return Case{"rich", fl, z, degF(280), 4300 * psi, 700 * psi}, err
}

// Condensate10 is an invented 10-component gas condensate at 250 °F, for the
// benchmarks: N2, CO2 and C1–nC6 from the eos library (iC4 counted with nC4,
// iC5 with nC5) and 6 mol % C7+ of 145 g/mol and specific gravity 0.795,
// split by the gamma distribution (shape 1) into two pseudo-components
// (C7–C18 and C19+) with the Kesler–Lee correlations, on PR78 with volume
// shift. Its upper dew point at 250 °F lies near 4446 psia and its lower dew
// point below 1 psia; the initial pressure is 4800 psia. The composition
// describes no real fluid.
func Condensate10() (Case, error) {
	fl, z, err := build([]component{{"N2", 0.4}, {"CO2", 2.2}, {"C1", 73.5}, {"C2", 8.3}, {"C3", 4.5}, {"nC4", 2.6}, {"nC5", 1.5}, {"nC6", 1.0}},
		6, 0.145, 0.795, eos.Characterization{Alpha: 1, Pseudo: 2, Correlation: eos.KeslerLee, Acentric: eos.AcentricKeslerLee},
		eos.Options{Equation: eos.PR78, VolumeShift: true})
	return Case{"ten", fl, z, degF(250), 4800 * psi, 700 * psi}, err
}
