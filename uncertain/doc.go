// Package uncertain holds the statistics of probabilistic runs: the
// distributions of uncertain inputs (uniform, triangular, normal and
// lognormal, these two optionally truncated, and discrete), independent
// random streams, Monte Carlo and Latin hypercube sampling designs, rank
// correlation between inputs by the method of Iman and Conover, and the
// summaries of an output sample (P90, P50, P10, mean, exceedance,
// histogram, cumulative curve). It knows nothing of fluids or reservoirs.
//
// # Designs and distributions
//
// A design is an n×k matrix of u-values in (0, 1), a row per case and a
// column per uncertain input ([MonteCarlo], [LatinHypercube]); the Quantile
// method of a [Distribution] turns the u-values of a column into the
// input's values. [ImanConover] reorders the columns of a design to give
// the inputs the rank correlations asked for, leaving each column's values
// as they were. A distribution of zero width (a [Uniform] with Min equal to
// Max, a [Triangular] with its three points equal, a [Normal] with SD 0, a
// [Lognormal] with Sigma 0, a [Discrete] of one value) returns its
// constant exactly, whatever u, so that fixed inputs reproduce a
// deterministic run to the last bit.
//
// # Reproducibility
//
// Every random number comes from a stream of [Stream](seed, index): a
// design draws each row (Monte Carlo) or column (Latin hypercube) from a
// stream of its own, derived from the seed and the kind of design, so a
// design depends on its seed and size only, never on how many goroutines
// later evaluate its cases, and a Monte Carlo design of n cases is the
// first n rows of any larger one of the same seed.
//
// # P90, P50 and P10
//
// This package follows the reserves convention: P90 is the value exceeded
// with probability 0.9, which is the 10th percentile, and P10 the value
// exceeded with probability 0.1, the 90th percentile; P50 is the median.
// A sample's percentiles are those of Hyndman and Fan's (1996) definition 7,
// linear interpolation between order statistics ([SampleQuantile]).
//
// # References
//
//   - McKay, M.D., Beckman, R.J. and Conover, W.J. (1979). A comparison of
//     three methods for selecting values of input variables in the analysis
//     of output from a computer code. Technometrics 21(2), 239–245.
//   - Iman, R.L. and Conover, W.J. (1982). A distribution-free approach to
//     inducing rank correlation among input variables. Communications in
//     Statistics – Simulation and Computation B11(3), 311–334.
//   - Kruskal, W.H. (1958). Ordinal measures of association. Journal of the
//     American Statistical Association 53(284), 814–861. (The relation
//     ρ_S = (6/π) arcsin(ρ/2) between the rank and the linear correlation of
//     a bivariate normal, due to Pearson (1907).)
//   - Hyndman, R.J. and Fan, Y. (1996). Sample quantiles in statistical
//     packages. The American Statistician 50(4), 361–365.
//   - Johnson, N.L., Kotz, S. and Balakrishnan, N. (1994). Continuous
//     Univariate Distributions, Vol. 1, 2nd ed. Wiley. Chapter 13 (normal,
//     its truncation in Section 10.1, from memory) and Chapter 14
//     (lognormal).
//   - Kotz, S. and van Dorp, J.R. (2004). Beyond Beta: Other Continuous
//     Families of Distributions with Bounded Support and Applications.
//     World Scientific. Chapter 1 (the triangular distribution).
//   - Wichura, M.J. (1988). Algorithm AS 241: The percentage points of the
//     normal distribution. Applied Statistics 37(3), 477–484. (gonum's
//     mathext.NormalQuantile, relative accuracy about 1e-16.)
//   - O'Neill, M.E. (2014). PCG: A family of simple fast space-efficient
//     statistically good algorithms for random number generation. Harvey
//     Mudd College, HMC-CS-2014-0905. (Go's math/rand/v2 PCG.)
//   - Steele, G.L. Jr., Lea, D. and Flood, C.H. (2014). Fast splittable
//     pseudorandom number generators. OOPSLA '14, 453–472. (The SplitMix64
//     mixing function.)
//   - Lemire, D. (2019). Fast random integer generation in an interval. ACM
//     Transactions on Modeling and Computer Simulation 29(1), 3:1–3:12.
//   - Durstenfeld, R. (1964). Algorithm 235: Random permutation.
//     Communications of the ACM 7(7), 420.
//   - Chan, T.F., Golub, G.H. and LeVeque, R.J. (1983). Algorithms for
//     computing the sample variance: analysis and recommendations. The
//     American Statistician 37(3), 242–247.
package uncertain
