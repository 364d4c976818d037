// Package cvd simulates the laboratory experiments on a reservoir fluid
// described by package eos: constant-volume depletion (CVD),
// constant-composition expansion (CCE) and the separator train that turns a
// well stream into surface gas and stock-tank condensate. Its depletion
// cell also serves the reservoir layer: with Adaptive, Deplete integrates
// the continuous depletion a reservoir goes through, to a tolerance, with an
// estimate of its discretisation error. It also evaluates laboratory
// reports: the Whitson–Torp material balance of a depletion
// (BackCalculate) and the quality check built on it (Check), the model
// against a report (Compare), and the regression of the model's parameters
// to it (Tune), which runs on Regress, a bounded nonlinear least-squares
// engine that knows nothing of fluids.
//
// All quantities are SI: K, Pa, m³, mol, kg. Standard volumes are ideal-gas
// volumes at the standard conditions of the Train.
//
// # References
//
//   - Whitson, C.H. and Torp, S.B. (1983). Evaluating constant-volume depletion
//     data. JPT 35(3), 610–620. SPE-10067-PA.
//   - Hoffman, A.E., Crump, J.S. and Hocott, C.R. (1953). Equilibrium
//     constants for a gas-condensate system. JPT 5(1), 1–10; Trans. AIME
//     198 (the characterization factor of Check's K-value plot).
//   - Whitson, C.H. and Brulé, M.R. (2000). Phase Behavior. SPE Monograph 20,
//     Richardson, TX (CVD and CCE procedures, separator calculations).
//   - Lohrenz, J., Bray, B.G. and Clark, C.R. (1964). Calculating viscosities of
//     reservoir fluids from their compositions. JPT 16(10), 1171–1176.
//   - Hairer, E., Nørsett, S.P. and Wanner, G. (1993). Solving Ordinary
//     Differential Equations I, 2nd ed. Springer, §III.1 (Adams methods) and
//     §II.4 (step-size control). (From memory.)
//   - Brent, R.P. (1973). Algorithms for Minimization without Derivatives.
//     Prentice-Hall, ch. 5.
//   - Marquardt, D.W. (1963). An algorithm for least-squares estimation of
//     nonlinear parameters. J. Soc. Indust. Appl. Math. 11(2), 431–441; with
//     the damping of Nielsen (1999) and the other sources cited at Regress.
package cvd
