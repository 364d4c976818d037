package eos

// Plus-fraction characterization: split a measured Cn+ fraction into
// single-carbon-number (SCN) groups by a molar distribution, give each group a
// specific gravity at constant Watson factor, lump the groups into
// pseudo-components and give each its critical properties.
//
// References:
//
//   - Whitson, C.H. (1983). Characterizing hydrocarbon plus fractions. SPEJ
//     23(4), 683–694. (Gamma distribution, constant-Kw specific gravities,
//     lumping by equal intervals in ln M.)
//   - Whitson, C.H., Anderson, T.F. and Søreide, I. (1989). C7+ characterization
//     of related equilibrium fluids using the gamma distribution. In C7+
//     Fraction Characterization (Chorn and Mansoori, eds.), Taylor & Francis,
//     35–56. (Gaussian quadrature pseudo-components.)
//   - Pedersen, K.S., Thomassen, P. and Fredenslund, Aa. (1984). Thermodynamics
//     of petroleum mixtures containing heavy hydrocarbons. 1. Phase envelope
//     calculations by use of the Soave–Redlich–Kwong equation of state. Ind.
//     Eng. Chem. Process Des. Dev. 23(1), 163–170. (Exponential distribution.)

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/mathext"
)

// SplitMethod selects how a plus fraction is split.
type SplitMethod int

const (
	SplitGamma       SplitMethod = iota // Whitson (1983) three-parameter gamma, the default
	SplitExponential                    // Pedersen et al. (1984) exponential in carbon number
	SplitNone                           // keep the plus fraction as one pseudo-component
	// SplitGammaQuadrature places the pseudo-components at the nodes of the
	// Gauss–Laguerre quadrature of the gamma distribution, after Whitson,
	// Anderson and Søreide (1989); no SCN groups and no lumping.
	SplitGammaQuadrature
)

// CritCorrelation selects the critical-property correlation of pseudo-components.
type CritCorrelation int

const (
	KeslerLee        CritCorrelation = iota // Kesler and Lee (1976), the default
	RiaziDaubert                            // Riazi and Daubert (1980)
	Twu                                     // Twu (1984)
	RiaziDaubert1987                        // Riazi and Daubert (1987), (Tb, SG) form
)

// AcentricMethod selects the acentric-factor correlation of pseudo-components.
type AcentricMethod int

const (
	AcentricKeslerLee AcentricMethod = iota // Lee–Kesler (1975) / Kesler–Lee (1976), the default
	AcentricEdmister                        // Edmister (1958)
)

// PlusFraction is a measured Cn+ fraction of a feed.
type PlusFraction struct {
	Name        string  // e.g. "C7+"; empty means "C<FirstCarbon>+"
	FirstCarbon int     // n of Cn+, e.g. 7; 6 to 40
	Z           float64 // mole fraction of the plus fraction in the feed, (0, 1]
	M           float64 // molar mass, kg/mol, (0, 2]
	SG          float64 // specific gravity 60/60 °F, 0.6 to 1.2
}

// Characterization controls SplitPlus. The zero value means: gamma split with
// alpha 1 and eta from the first carbon number, lumped into 4 pseudo-components,
// Kesler–Lee critical properties and acentric factors.
type Characterization struct {
	Split       SplitMethod
	Alpha       float64 // gamma shape, (0, 20]; 0 means 1; gamma splits only
	Eta         float64 // minimum molar mass in the plus fraction, kg/mol; 0 means (14 n − 6) g/mol; gamma splits only
	Pseudo      int     // pseudo-components, 1 to 20; 0 means 4 (1 for SplitNone)
	Correlation CritCorrelation
	Acentric    AcentricMethod
}

// ErrBadPlus is wrapped by every *PlusError.
var ErrBadPlus = errors.New("invalid plus-fraction characterization")

// A PlusError reports an invalid plus fraction or characterization setting.
// Field is the Go field name, e.g. "PlusFraction.SG" or
// "Characterization.Pseudo"; errors.Is(err, ErrBadPlus) holds.
type PlusError struct {
	Field string
	Msg   string // what is wrong, e.g. "= 1.5, want 0.6 to 1.2"
}

func (e *PlusError) Error() string { return e.Field + " " + e.Msg }

// Unwrap returns ErrBadPlus.
func (e *PlusError) Unwrap() error { return ErrBadPlus }

// Limits of the accepted input.
const (
	maxPlusM    = 2.0  // kg/mol; larger values suggest g/mol were given
	minPlusSG   = 0.6  // plus-fraction specific gravity
	maxPlusSG   = 1.2  //
	maxAlpha    = 20.0 // far above the usual 0.5–2.5 (from memory); a guard against typing errors
	maxPseudo   = 20
	minFirstC   = 6
	maxFirstC   = 40
	lastSCN     = 45    // the split ends with an open C45+ group (or later, to make room for Pseudo groups)
	tailTol     = 1e-12 // mole fraction of the plus fraction below which the distribution's tail is closed off
	defaultLump = 4
)

// SplitPlus splits a plus fraction into pseudo-components. The returned mole
// fractions (of the whole feed) sum to p.Z, and the mixture of pseudo-components
// reproduces p.M (mole balance Σ z M) and p.SG (volume additivity,
// 1/SG = Σ wᵢ/SGᵢ with mass fractions wᵢ) to round-off.
//
// Steps, for SplitGamma and SplitExponential:
//
//  1. Split into SCN groups C_n, C_n+1, …, C_N+ (N = 45, or n + Pseudo − 1 if
//     larger). SplitGamma integrates Whitson's (1983) gamma density over the
//     molar-mass intervals [η, 14n+8), [14(n+1)−6, 14(n+1)+8), …, [14N−6, ∞)
//     g/mol (boundaries at 14k−6 between C_k−1 and C_k, so the C7 group of a
//     C7+ fraction is [92, 106) g/mol):
//
//     zᵢ/z+ = P(α, yᵢ) − P(α, yᵢ₋₁),  Mᵢ = η + αβ [P(α+1, yᵢ) − P(α+1, yᵢ₋₁)] / [P(α, yᵢ) − P(α, yᵢ₋₁)]
//
//     with β = (M+ − η)/α, y = (M_b − η)/β and P the regularized lower
//     incomplete gamma function. SplitExponential takes ln z_k = A + B k,
//     M_k = 14k − 4 g/mol (Pedersen et al., 1984), summed to infinity so that
//     A and B follow in closed form from the mole and mass balances
//     (Pedersen et al. truncated the sum near C80, from memory; the difference is the tail
//     beyond, which here is kept in the last group). Either way the last
//     group is open-ended, its molar mass the mean of the tail, so both
//     balances are exact; the split stops early, with that open group, where
//     the rest of the distribution holds less than 1e-12 of the plus
//     fraction, and groups holding less than that are merged with the next.
//
//  2. Specific gravities SGᵢ = 6.0108 Mᵢ^0.17947 Kw^−1.18241 at one Watson
//     factor Kw (Whitson, 1983), which has a closed form that reproduces
//     p.SG by volume additivity.
//
//  3. Lump into Pseudo groups by equal intervals in ln M between the first
//     and last SCN group (Whitson, 1983); when an interval holds no group its
//     boundary moves so that every lump holds at least one. A lump's M and SG
//     come from the mole and volume balances of its groups.
//
//  4. Each lump's Tb, Tc, Pc, ω, Vc and shift come from its own (M, SG) by
//     PseudoComponent, not by averaging the groups' properties, so a lump
//     and a plus fraction of the same M and SG get the same properties.
//
// Lumps are named from their carbon numbers: "C7-C9", "C10", "C20+".
// SplitNone returns one component named p.Name (default "C<n>+") from
// (p.M, p.SG). SplitGammaQuadrature returns Pseudo components "<name>Q1",
// "<name>Q2", … at Mᵢ = η + β xᵢ with zᵢ/z+ = wᵢ, where xᵢ, wᵢ are the nodes
// and weights of the generalized Gauss–Laguerre rule for the weight
// x^(α−1) e^−x (Golub–Welsch), which conserves moles and mass exactly;
// then steps 2 and 4 as above. Whitson et al. (1989) used the ordinary
// Laguerre rule with x^(α−1)/Γ(α) folded into the weights (from memory); the
// generalized rule integrates the gamma density itself, so no
// renormalization is needed. The quadrature suits few components (2–5):
// with many, the last nodes lie far in the tail (M of several kg/mol),
// beyond every correlation, and SplitPlus returns ErrCorrelationRange.
//
// Errors: a *PlusError (errors.Is ErrBadPlus) names the invalid field; an
// error wrapping ErrCorrelationRange means the chosen correlations gave
// unphysical properties for some pseudo-component, and one wrapping
// ErrNoConvergence that an iteration failed. The slices are nil on error.
func SplitPlus(p PlusFraction, c Characterization) ([]Component, []float64, error) {
	p, c, err := checkPlus(p, c)
	if err != nil {
		return nil, nil, err
	}
	mg := p.M * 1e3
	var groups []scnGroup
	switch c.Split {
	case SplitNone:
		comp, err := pseudoComponent(p.Name, p.M, p.SG, c.Correlation, c.Acentric)
		if err != nil {
			return nil, nil, err
		}
		return []Component{comp}, []float64{p.Z}, nil
	case SplitGamma:
		groups = gammaSCN(p.FirstCarbon, lastCarbon(p.FirstCarbon, c.Pseudo), c.Eta*1e3, mg, c.Alpha)
	case SplitExponential:
		groups = exponentialSCN(p.FirstCarbon, lastCarbon(p.FirstCarbon, c.Pseudo), mg)
	case SplitGammaQuadrature:
		groups, err = gammaQuadrature(c.Pseudo, c.Eta*1e3, mg, c.Alpha)
		if err != nil {
			return nil, nil, err
		}
	}
	if len(groups) < c.Pseudo {
		return nil, nil, &PlusError{Field: "Characterization.Pseudo",
			Msg: fmt.Sprintf("= %d, but the %v distribution puts more than %g of %s in only %d carbon-number groups; ask for at most %d",
				c.Pseudo, c.Split, tailTol, p.Name, len(groups), len(groups))}
	}
	constantWatsonSG(groups, p.SG)
	var lumps []scnGroup
	var names []string
	if c.Split == SplitGammaQuadrature {
		lumps = groups
		for i := range groups {
			names = append(names, fmt.Sprintf("%sQ%d", p.Name, i+1))
		}
	} else {
		lumps = lumpGroups(groups, c.Pseudo)
		for _, g := range lumps {
			names = append(names, g.name())
		}
	}
	comps := make([]Component, len(lumps))
	z := make([]float64, len(lumps))
	for i, g := range lumps {
		comps[i], err = pseudoComponent(names[i], g.m*1e-3, g.sg, c.Correlation, c.Acentric)
		if err != nil {
			return nil, nil, err
		}
		z[i] = p.Z * g.z
	}
	return comps, z, nil
}

// checkPlus validates p and c and fills in the defaults.
func checkPlus(p PlusFraction, c Characterization) (PlusFraction, Characterization, error) {
	bad := func(field, format string, args ...any) error {
		return &PlusError{Field: field, Msg: fmt.Sprintf(format, args...)}
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	gamma := c.Split == SplitGamma || c.Split == SplitGammaQuadrature
	switch {
	case p.FirstCarbon < minFirstC || p.FirstCarbon > maxFirstC:
		return p, c, bad("PlusFraction.FirstCarbon", "= %d, want %d to %d", p.FirstCarbon, minFirstC, maxFirstC)
	case !finite(p.Z) || p.Z <= 0 || p.Z > 1:
		return p, c, bad("PlusFraction.Z", "= %g, want a mole fraction > 0 and <= 1", p.Z)
	case !finite(p.M) || p.M <= 0 || p.M > maxPlusM:
		return p, c, bad("PlusFraction.M", "= %g kg/mol, want > 0 and <= %g kg/mol", p.M, maxPlusM)
	case !finite(p.SG) || p.SG < minPlusSG || p.SG > maxPlusSG:
		return p, c, bad("PlusFraction.SG", "= %g, want %g to %g", p.SG, minPlusSG, maxPlusSG)
	case c.Split < SplitGamma || c.Split > SplitGammaQuadrature:
		return p, c, bad("Characterization.Split", "= %d, unknown split method", int(c.Split))
	case !c.Correlation.valid():
		return p, c, bad("Characterization.Correlation", "= %d, unknown correlation", int(c.Correlation))
	case !c.Acentric.valid():
		return p, c, bad("Characterization.Acentric", "= %d, unknown acentric-factor method", int(c.Acentric))
	case !gamma && c.Alpha != 0:
		return p, c, bad("Characterization.Alpha", "= %g, but alpha applies only to the gamma splits, not %v", c.Alpha, c.Split)
	case !gamma && c.Eta != 0:
		return p, c, bad("Characterization.Eta", "= %g kg/mol, but eta applies only to the gamma splits, not %v", c.Eta, c.Split)
	case !finite(c.Alpha) || c.Alpha < 0 || c.Alpha > maxAlpha:
		return p, c, bad("Characterization.Alpha", "= %g, want 0 < alpha <= %g (0 means 1)", c.Alpha, maxAlpha)
	case !finite(c.Eta) || c.Eta < 0:
		return p, c, bad("Characterization.Eta", "= %g kg/mol, want > 0 (0 means the default)", c.Eta)
	case c.Pseudo < 0 || c.Pseudo > maxPseudo:
		return p, c, bad("Characterization.Pseudo", "= %d, want 1 to %d (0 means the default)", c.Pseudo, maxPseudo)
	case c.Split == SplitNone && c.Pseudo > 1:
		return p, c, bad("Characterization.Pseudo", "= %d, but split none gives one pseudo-component", c.Pseudo)
	}
	if p.Name == "" {
		p.Name = fmt.Sprintf("C%d+", p.FirstCarbon)
	}
	if c.Pseudo == 0 {
		c.Pseudo = defaultLump
		if c.Split == SplitNone {
			c.Pseudo = 1
		}
	}
	mg := p.M * 1e3
	n := float64(p.FirstCarbon)
	switch c.Split {
	case SplitGamma, SplitGammaQuadrature:
		if c.Alpha == 0 {
			c.Alpha = 1
		}
		if c.Eta == 0 {
			c.Eta = (14*n - 6) * 1e-3
		}
		if c.Eta >= p.M {
			return p, c, bad("PlusFraction.M", "= %g kg/mol, want above eta = %g kg/mol", p.M, c.Eta)
		}
		if hi := (14*n + 8) * 1e-3; c.Split == SplitGamma && c.Eta >= hi {
			return p, c, bad("Characterization.Eta", "= %g kg/mol, want below %g kg/mol, the upper boundary of the C%d group",
				c.Eta, hi, p.FirstCarbon)
		}
	case SplitExponential:
		if m0 := 14*n - 4; mg <= m0 {
			return p, c, bad("PlusFraction.M", "= %g kg/mol, want above %g kg/mol, the molar mass of C%d in the exponential split",
				p.M, m0*1e-3, p.FirstCarbon)
		}
	}
	return p, c, nil
}

// lastCarbon is the carbon number of the open last SCN group.
func lastCarbon(first, pseudo int) int {
	return max(lastSCN, first+pseudo-1)
}

// An scnGroup is a carbon-number group, a lump of them, or a quadrature node.
type scnGroup struct {
	first, last int     // carbon numbers of the group (last = first for one SCN)
	open        bool    // the last group: C<first>+
	z           float64 // mole fraction of the plus fraction
	m           float64 // molar mass, g/mol
	sg          float64 // specific gravity
}

func (g scnGroup) name() string {
	switch {
	case g.open:
		return fmt.Sprintf("C%d+", g.first)
	case g.first == g.last:
		return fmt.Sprintf("C%d", g.first)
	}
	return fmt.Sprintf("C%d-C%d", g.first, g.last)
}

// gammaMass returns the probability mass of the standardized gamma
// distribution of shape a between ya and yb (yb may be +Inf), taking the
// difference on the side of the median where it does not cancel.
func gammaMass(a, ya, yb float64) float64 {
	if math.IsInf(yb, 1) {
		return mathext.GammaIncRegComp(a, ya)
	}
	if mathext.GammaIncReg(a, yb) <= 0.5 {
		return mathext.GammaIncReg(a, yb) - mathext.GammaIncReg(a, ya)
	}
	return mathext.GammaIncRegComp(a, ya) - mathext.GammaIncRegComp(a, yb)
}

// gammaSCN splits a gamma distribution of molar mass (shape alpha, origin eta
// and mean mPlus, g/mol) into SCN groups first…last+ as described in SplitPlus.
func gammaSCN(first, last int, eta, mPlus, alpha float64) []scnGroup {
	beta := (mPlus - eta) / alpha
	y := func(mb float64) float64 { return (mb - eta) / beta }
	interval := func(ya, yb float64) (z, m float64) {
		z = gammaMass(alpha, ya, yb)
		m = eta + alpha*beta*gammaMass(alpha+1, ya, yb)/z
		return z, m
	}
	var groups []scnGroup
	lo, from := eta, first
	for n := first; ; n++ {
		hi := float64(14*n + 8) // upper boundary of C_n, g/mol
		if n == last || mathext.GammaIncRegComp(alpha, y(hi)) < tailTol {
			z, m := interval(y(lo), math.Inf(1))
			return append(groups, scnGroup{first: from, last: n, open: true, z: z, m: m})
		}
		z, m := interval(y(lo), y(hi))
		if z < tailTol {
			continue // merge with the next group
		}
		groups = append(groups, scnGroup{first: from, last: n, z: z, m: m})
		lo, from = hi, n+1
	}
}

// exponentialSCN splits a plus fraction of mean molar mass mPlus (g/mol) into
// SCN groups with ln z_k = A + B k and M_k = 14k − 4, Pedersen et al. (1984).
// With q = e^B, the infinite sums give z_k/z+ = (1 − q) q^(k − first) and mean
// carbon number first + q/(1 − q), so q = d/(1 + d) with
// d = (mPlus + 4)/14 − first; the open group C_N+ holds q^(N − first) at mean
// carbon number N + q/(1 − q).
func exponentialSCN(first, last int, mPlus float64) []scnGroup {
	q := exponentialQ(first, mPlus)
	var groups []scnGroup
	for n := first; ; n++ {
		k := float64(n - first)
		if n == last || math.Pow(q, k+1) < tailTol {
			m := 14*(float64(n)+q/(1-q)) - 4
			return append(groups, scnGroup{first: n, last: n, open: true, z: math.Pow(q, k), m: m})
		}
		groups = append(groups, scnGroup{first: n, last: n, z: (1 - q) * math.Pow(q, k), m: float64(14*n - 4)})
	}
}

// exponentialQ returns q = e^B of the exponential split of a C_first+
// fraction of molar mass mPlus (g/mol).
func exponentialQ(first int, mPlus float64) float64 {
	d := (mPlus+4)/14 - float64(first)
	return d / (1 + d)
}

// exponentialAB returns Pedersen's A and B (ln z_k = A + B k, z_k the feed
// mole fraction of SCN group k) of the exponential split of SplitPlus.
func exponentialAB(p PlusFraction) (a, b float64) {
	q := exponentialQ(p.FirstCarbon, p.M*1e3)
	b = math.Log(q)
	return math.Log(p.Z*(1-q)) - b*float64(p.FirstCarbon), b
}

// gammaQuadrature returns n nodes of the gamma distribution (shape alpha,
// origin eta, mean mPlus, g/mol) by the generalized Gauss–Laguerre rule for
// the weight x^(α−1) e^−x: the eigenvalues of its Jacobi matrix (diagonal
// 2k + α, off-diagonal √(k (k + α − 1))) are the nodes, and the squared first
// components of the normalized eigenvectors the weights (Golub and Welsch,
// 1969, Math. Comp. 23, 221–230).
func gammaQuadrature(n int, eta, mPlus, alpha float64) ([]scnGroup, error) {
	beta := (mPlus - eta) / alpha
	jac := mat.NewSymDense(n, nil)
	for k := 0; k < n; k++ {
		jac.SetSym(k, k, 2*float64(k)+alpha)
		if k > 0 {
			jac.SetSym(k-1, k, math.Sqrt(float64(k)*(float64(k)+alpha-1)))
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(jac, true) {
		return nil, &SolveError{Op: "GaussLaguerre", Err: ErrNoConvergence}
	}
	x := eig.Values(nil) // ascending
	var vec mat.Dense
	eig.VectorsTo(&vec)
	groups := make([]scnGroup, n)
	for i := range groups {
		v := vec.At(0, i)
		groups[i] = scnGroup{open: i == n-1, z: v * v, m: eta + beta*x[i]}
	}
	return groups, nil
}

// constantWatsonSG sets the specific gravity of every group to
// SGᵢ = 6.0108 Mᵢ^0.17947 Kw^−1.18241 (Whitson, 1983) with the one Kw for
// which volume additivity, 1/sgPlus = Σ wᵢ/SGᵢ, holds; since 1/SGᵢ is
// proportional to Kw^1.18241, Kw has a closed form. It returns Kw.
func constantWatsonSG(groups []scnGroup, sgPlus float64) float64 {
	var mass, vol float64 // Σ zᵢMᵢ and Σ zᵢMᵢ/SGᵢ(Kw = 1)
	for _, g := range groups {
		mass += g.z * g.m
		vol += g.z * g.m / whitsonSG(g.m, 1)
	}
	kw := math.Pow(mass/(sgPlus*vol), 1/1.18241)
	for i := range groups {
		groups[i].sg = whitsonSG(groups[i].m, kw)
	}
	return kw
}

// lumpGroups merges consecutive groups into ng lumps (ng <= len(groups)) by
// equal intervals in ln M between the first and last group, Whitson (1983);
// M and SG of a lump follow from its mole, mass and volume balances.
func lumpGroups(groups []scnGroup, ng int) []scnGroup {
	n := len(groups)
	cut := make([]int, ng+1) // lump I holds groups cut[I-1] .. cut[I]-1
	cut[ng] = n
	lo, hi := math.Log(groups[0].m), math.Log(groups[n-1].m)
	for i := 1; i < ng; i++ {
		b := lo + float64(i)/float64(ng)*(hi-lo)
		for cut[i] < n && math.Log(groups[cut[i]].m) <= b {
			cut[i]++
		}
	}
	for i := 1; i < ng; i++ { // no empty lump at the light end
		cut[i] = max(cut[i], cut[i-1]+1)
	}
	for i := ng - 1; i >= 1; i-- { // nor at the heavy end
		cut[i] = min(cut[i], cut[i+1]-1)
	}
	lumps := make([]scnGroup, ng)
	for i := range lumps {
		part := groups[cut[i]:cut[i+1]]
		var z, mass, vol float64
		for _, g := range part {
			z += g.z
			mass += g.z * g.m
			vol += g.z * g.m / g.sg
		}
		last := part[len(part)-1]
		lumps[i] = scnGroup{first: part[0].first, last: last.last, open: last.open,
			z: z, m: mass / z, sg: mass / vol}
	}
	return lumps
}
