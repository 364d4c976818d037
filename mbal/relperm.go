package mbal

import (
	"fmt"
	"math"
)

// RelativePermeability describes the gas and condensate relative
// permeabilities of the rock at its connate water saturation by Corey-type
// power laws (Corey 1954; the normalised form of Brooks and Corey 1964) in
// the normalised condensate saturation
//
//	S_n = (S_c − S_cc) / (1 − S_w − S_cc),  held to [0, 1],
//
// S_c the condensate saturation, S_cc the critical condensate saturation
// (the condensate's end point, below which it does not flow) and S_w the
// connate water saturation:
//
//	k_rc = k_rc° S_n^n_c,   k_rg = k_rg° (1 − S_n)^n_g.
//
// Below the critical saturation the gas keeps its end-point relative
// permeability k_rg°. Zero fields mean the defaults.
//
// References (from memory, not checked against the originals):
//
//   - Corey, A.T. (1954). The interrelation between gas and oil relative
//     permeabilities. Producers Monthly 19(1), 38–41.
//   - Brooks, R.H. and Corey, A.T. (1964). Hydraulic properties of porous
//     media. Hydrology Papers 3, Colorado State University.
type RelativePermeability struct {
	GasExponent        float64 // n_g, 1 to 10; 0 means DefaultGasExponent
	CondensateExponent float64 // n_c, 1 to 10; 0 means DefaultCondensateExponent
	GasEndpoint        float64 // k_rg° above 0, at most 1; 0 means DefaultGasEndpoint
	CondensateEndpoint float64 // k_rc° above 0, at most 1; 0 means DefaultCondensateEndpoint
}

// Defaults of RelativePermeability: quadratic curves with end points of 1
// (common practice, no published source: Corey exponents of gas–condensate
// rock are typically quoted between 1.5 and 4, end points between 0.3 and 1).
const (
	DefaultGasExponent        = 2.0
	DefaultCondensateExponent = 2.0
	DefaultGasEndpoint        = 1.0
	DefaultCondensateEndpoint = 1.0
)

func orDefault(v, def float64) float64 {
	if v == 0 {
		return def
	}
	return v
}

// withDefaults returns k with its zero fields set to the defaults.
func (k RelativePermeability) withDefaults() RelativePermeability {
	return RelativePermeability{
		GasExponent:        orDefault(k.GasExponent, DefaultGasExponent),
		CondensateExponent: orDefault(k.CondensateExponent, DefaultCondensateExponent),
		GasEndpoint:        orDefault(k.GasEndpoint, DefaultGasEndpoint),
		CondensateEndpoint: orDefault(k.CondensateEndpoint, DefaultCondensateEndpoint),
	}
}

// Check reports the first field of k out of its range.
func (k RelativePermeability) Check() error {
	bad := func(field string, v float64, want string) error {
		return fmt.Errorf("%w: %s = %g, want %s", ErrBadReservoir, field, v, want)
	}
	k = k.withDefaults()
	switch {
	case !(k.GasExponent >= 1 && k.GasExponent <= 10):
		return bad("gas relative permeability exponent", k.GasExponent, "1 to 10")
	case !(k.CondensateExponent >= 1 && k.CondensateExponent <= 10):
		return bad("condensate relative permeability exponent", k.CondensateExponent, "1 to 10")
	case !(k.GasEndpoint > 0 && k.GasEndpoint <= 1):
		return bad("gas end-point relative permeability", k.GasEndpoint, "above 0 and at most 1")
	case !(k.CondensateEndpoint > 0 && k.CondensateEndpoint <= 1):
		return bad("condensate end-point relative permeability", k.CondensateEndpoint, "above 0 and at most 1")
	}
	return nil
}

// Relative returns k_rg and k_rc at condensate saturation sc (a fraction of
// the pore volume), with connate water sw and critical condensate
// saturation scc.
func (k RelativePermeability) Relative(sc, sw, scc float64) (krg, krc float64) {
	k = k.withDefaults()
	sn := math.Min(1, math.Max(0, (sc-scc)/(1-sw-scc)))
	return k.GasEndpoint * math.Pow(1-sn, k.GasExponent), k.CondensateEndpoint * math.Pow(sn, k.CondensateExponent)
}

// FractionalFlow returns the condensate's share of the flowing reservoir
// volume, its mobility over the total mobility,
//
//	f_c = (k_rc/μ_c) / (k_rc/μ_c + k_rg/μ_g),
//
// at condensate saturation sc with viscosities muC and muG (any one unit),
// and the relative permeabilities that give it. It neglects capillary
// pressure and gravity: both phases flow under the same pressure gradient
// (Buckley and Leverett 1942, "Mechanism of fluid displacement in sands",
// Trans. AIME 146, 107–116; from memory).
func (k RelativePermeability) FractionalFlow(sc, sw, scc, muC, muG float64) (fc, krg, krc float64) {
	krg, krc = k.Relative(sc, sw, scc)
	if krc == 0 {
		return 0, krg, krc
	}
	lc, lg := krc/muC, krg/muG
	return lc / (lc + lg), krg, krc
}
