// Package testfluid builds an invented gas condensate for the tests of the
// packages above eos, where a test checks identities (material balances,
// volumes, monotone recoveries) rather than published values. Its numbers
// describe no real fluid.
package testfluid

import "dewcell/eos"

// Condensate returns a 12-component gas condensate: N2, CO2 and C1–nC6 from
// the eos library and a C7+ of 7 mol %, 150 g/mol and specific gravity 0.80
// split by the gamma distribution (shape 2) into four pseudo-components, with
// the default interaction coefficients, on PR78 with or without volume shift.
// Its dew point at 250 °F lies near 4600 psia.
func Condensate(shift bool) (*eos.Fluid, []float64, error) {
	defined := []struct {
		name string
		pct  float64
	}{{"N2", 0.3}, {"CO2", 2.4}, {"C1", 72}, {"C2", 8.5}, {"C3", 4.8}, {"nC4", 2.6}, {"nC5", 1.4}, {"nC6", 1.0}}
	var comps []eos.Component
	var z []float64
	for _, d := range defined {
		c, _ := eos.LibraryComponent(d.name)
		comps = append(comps, c)
		z = append(z, d.pct/100)
	}
	pcs, pz, err := eos.SplitPlus(eos.PlusFraction{Name: "C7+", FirstCarbon: 7, Z: 0.07, M: 0.150, SG: 0.80}, eos.Characterization{Alpha: 2})
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
	fl, err := eos.NewFluid(comps, eos.DefaultKij(comps, eos.ChuehPrausnitz{}), eos.Options{VolumeShift: shift})
	if err != nil {
		return nil, nil, err
	}
	return fl, z, nil
}
