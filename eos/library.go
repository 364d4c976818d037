package eos

// Component library: the defined (non-plus) components of a reservoir-fluid
// analysis.
//
// Sources:
//
//   - M, Tc, Pc, ω, Vc, Tb: Poling, B.E., Prausnitz, J.M. and O'Connell, J.P.
//     (2001). The Properties of Gases and Liquids, 5th ed., McGraw-Hill,
//     Appendix A. Tb of CO2 is its normal sublimation point (194.67 K): CO2
//     has no normal boiling point.
//   - Shift (Peneloux s = c/b for Peng–Robinson): Jhaveri, B.S. and Youngren,
//     G.K. (1988). Three-parameter modification of the Peng–Robinson equation
//     of state to improve volumetric predictions. SPE Reservoir Engineering
//     3(3), 1033–1040. The hydrocarbon values agree with a second public
//     tabulation to four decimals; the fifth digits and the N2, CO2 and H2S
//     values are from memory.
//   - SG is left zero (unknown): the library components are gases or light
//     liquids at 60 °F and no sourced 60/60 °F gravities are tabulated here.

// library is in conventional analysis order: non-hydrocarbons, then
// hydrocarbons by carbon number, iso before normal. Units: M kg/mol, Tc K,
// Pc Pa, Vc m³/mol, Tb K (Poling's g/mol, bar and cm³/mol scaled by 1e-3,
// 1e5 and 1e-6). Every line: M, Tc, Pc, ω, Vc, Tb from Poling et al. (2001)
// App. A; Shift from Jhaveri and Youngren (1988).
var library = [...]Component{
	{Name: "N2", M: 0.028014, Tc: 126.20, Pc: 33.98e5, Omega: 0.037, Vc: 90.1e-6, Tb: 77.35, Shift: -0.1927},     // Poling App. A; J&Y 1988 (s from memory)
	{Name: "CO2", M: 0.044010, Tc: 304.12, Pc: 73.74e5, Omega: 0.225, Vc: 94.1e-6, Tb: 194.67, Shift: -0.0817},   // Poling App. A (Tb: sublimation); J&Y 1988 (s from memory)
	{Name: "H2S", M: 0.034082, Tc: 373.40, Pc: 89.63e5, Omega: 0.090, Vc: 98.0e-6, Tb: 212.84, Shift: -0.1288},   // Poling App. A; J&Y 1988 (s from memory)
	{Name: "C1", M: 0.016043, Tc: 190.56, Pc: 45.99e5, Omega: 0.011, Vc: 98.6e-6, Tb: 111.66, Shift: -0.1540},    // Poling App. A; J&Y 1988
	{Name: "C2", M: 0.030070, Tc: 305.32, Pc: 48.72e5, Omega: 0.099, Vc: 145.5e-6, Tb: 184.55, Shift: -0.1002},   // Poling App. A; J&Y 1988
	{Name: "C3", M: 0.044097, Tc: 369.83, Pc: 42.48e5, Omega: 0.152, Vc: 200.0e-6, Tb: 231.02, Shift: -0.08501},  // Poling App. A; J&Y 1988
	{Name: "iC4", M: 0.058123, Tc: 407.80, Pc: 36.40e5, Omega: 0.186, Vc: 259.0e-6, Tb: 261.34, Shift: -0.07935}, // Poling App. A (Pc, Vc as in the IUPAC series); J&Y 1988
	{Name: "nC4", M: 0.058123, Tc: 425.12, Pc: 37.96e5, Omega: 0.200, Vc: 255.0e-6, Tb: 272.66, Shift: -0.06413}, // Poling App. A; J&Y 1988
	{Name: "iC5", M: 0.072150, Tc: 460.40, Pc: 33.80e5, Omega: 0.229, Vc: 306.0e-6, Tb: 300.99, Shift: -0.04350}, // Poling App. A (Pc, Vc as in the IUPAC series); J&Y 1988
	{Name: "nC5", M: 0.072150, Tc: 469.70, Pc: 33.70e5, Omega: 0.252, Vc: 311.0e-6, Tb: 309.22, Shift: -0.04183}, // Poling App. A; J&Y 1988
	{Name: "nC6", M: 0.086177, Tc: 507.60, Pc: 30.25e5, Omega: 0.300, Vc: 368.0e-6, Tb: 341.88, Shift: -0.01478}, // Poling App. A; J&Y 1988
}

// libraryAliases maps accepted alternative names to canonical library names.
// A reservoir-fluid analysis reports the hexanes as "C6"; the library
// represents them by n-hexane (common practice, no published source).
var libraryAliases = map[string]string{
	"C6": "nC6",
}

// LibraryComponent returns the library entry for a defined component, in SI
// units, and whether the name is known.
//
// Accepted names are case-sensitive: the canonical names N2, CO2, H2S, C1, C2,
// C3, iC4, nC4, iC5, nC5, nC6, and the alias C6 for nC6. The returned
// component always carries the canonical name (nC6 for C6), which is the name
// DefaultKij recognizes.
func LibraryComponent(name string) (Component, bool) {
	if canon, ok := libraryAliases[name]; ok {
		name = canon
	}
	for _, c := range library {
		if c.Name == name {
			return c, true
		}
	}
	return Component{}, false
}

// LibraryNames lists the library's canonical component names in conventional
// order: N2, CO2, H2S, then hydrocarbons by carbon number, iso before normal.
// Aliases are not listed.
func LibraryNames() []string {
	names := make([]string, len(library))
	for i, c := range library {
		names[i] = c.Name
	}
	return names
}
