// Package eos implements two-constant cubic equations of state (Cubic:
// Peng–Robinson 1976 and 1978, Soave–Redlich–Kwong, or another δ1, δ2 of the
// family) for mixtures of defined components and petroleum pseudo-components: a component library,
// plus-fraction characterization, binary interaction coefficients, fugacity
// coefficients with analytic derivatives, Michelsen stability analysis,
// two-phase PT flash, mixture critical points, saturation points and the
// phase envelope.
//
// All quantities are SI: K, Pa, m³/mol, kg/mol, mole fractions. Field units
// appear only inside the empirical correlations that were published in them,
// and are converted at their boundary.
//
// # References
//
//   - Peng, D.-Y. and Robinson, D.B. (1976). A new two-constant equation of state.
//     Ind. Eng. Chem. Fundam. 15(1), 59–64. doi:10.1021/i160057a011
//   - Robinson, D.B. and Peng, D.-Y. (1978). The characterization of the heptanes
//     and heavier fractions for the GPA Peng–Robinson programs. GPA Research Report RR-28.
//   - Soave, G. (1972). Equilibrium constants from a modified Redlich–Kwong
//     equation of state. Chem. Eng. Sci. 27, 1197–1203.
//   - Péneloux, A., Rauzy, E. and Fréze, R. (1982). A consistent correction for
//     Redlich–Kwong–Soave volumes. Fluid Phase Equilib. 8, 7–23.
//   - Michelsen, M.L. (1980). Calculation of phase envelopes and critical points
//     for multicomponent mixtures. Fluid Phase Equilib. 4, 1–10.
//   - Heidemann, R.A. and Khalil, A.M. (1980). The calculation of critical
//     points. AIChE J. 26(5), 769–779.
//   - Michelsen, M.L. and Heidemann, R.A. (1981). Calculation of critical
//     points from cubic two-constant equations of state. AIChE J. 27(3), 521–523.
//   - Michelsen, M.L. (1982). The isothermal flash problem. Part I: Stability;
//     Part II: Phase-split calculation. Fluid Phase Equilib. 9, 1–19 and 21–40.
//   - Michelsen, M.L. and Mollerup, J.M. (2007). Thermodynamic Models:
//     Fundamentals and Computational Aspects, 2nd ed. Tie-Line Publications.
//   - Rachford, H.H. and Rice, J.D. (1952). Procedure for use of electronic digital
//     computers in calculating flash vaporization hydrocarbon equilibrium. JPT 4(10).
package eos
