// Package mbal is the reservoir layer: gas and condensate in place (by the
// equation of state and by the quick-look recombination of separator data
// with a Z-factor correlation), depletion recovery versus pressure with the
// condensate saturation (integrated to convergence, the condensate immobile
// or flowing by fractional flow), and the production-history material
// balance (the
// two-phase p/Z line and the Havlena–Odeh check for water influx). It builds
// on the experiments of package cvd. SI units throughout.
//
// # References
//
//   - Havlena, D. and Odeh, A.S. (1963). The material balance as an equation
//     of a straight line. JPT 15(8), 896–900.
//   - Dranchuk, P.M. and Abou-Kassem, J.H. (1975). Calculation of Z factors
//     for natural gases using equations of state. J. Can. Pet. Technol.
//     14(3), 34–36.
//   - Sutton, R.P. (1985). Compressibility factors for high-molecular-weight
//     reservoir gases. SPE-14265-MS.
//   - Wichert, E. and Aziz, K. (1972). Calculate Z's for sour gases.
//     Hydrocarbon Processing 51(5), 119–122.
//   - Corey, A.T. (1954). The interrelation between gas and oil relative
//     permeabilities. Producers Monthly 19(1), 38–41. (From memory.)
//   - McCain, W.D. Jr. (1991). Reservoir-fluid property correlations: state
//     of the art. SPE Reservoir Engineering 6(2), 266–272.
package mbal
