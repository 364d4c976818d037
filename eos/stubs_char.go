package eos

// Characterization API: declarations only, to be replaced by the real
// implementation (library.go, plus.go, kij.go). Each stub returns an error.

import "errors"

var errNotYet = errors.New("eos: not implemented yet")

// LibraryComponent returns the library entry for a defined component
// (N2, CO2, H2S, C1, C2, C3, iC4, nC4, iC5, nC5, nC6; names are case-sensitive,
// with aliases such as "C6" for nC6 documented in library.go).
func LibraryComponent(name string) (Component, bool) { return Component{}, false }

// LibraryNames lists the library's component names in conventional order.
func LibraryNames() []string { return nil }

// SplitMethod selects how a plus fraction is split.
type SplitMethod int

const (
	SplitGamma       SplitMethod = iota // Whitson (1983) three-parameter gamma, the default
	SplitExponential                    // Pedersen et al. (1984) exponential in carbon number
	SplitNone                           // keep the plus fraction as one pseudo-component
)

// CritCorrelation selects the critical-property correlation of pseudo-components.
type CritCorrelation int

const (
	KeslerLee    CritCorrelation = iota // Kesler and Lee (1976), the default
	RiaziDaubert                        // Riazi and Daubert (1980)
	Twu                                 // Twu (1984)
)

// AcentricMethod selects the acentric-factor correlation of pseudo-components.
type AcentricMethod int

const (
	AcentricKeslerLee AcentricMethod = iota // Lee–Kesler (1975) / Kesler–Lee (1976), the default
	AcentricEdmister                        // Edmister (1958)
)

// PlusFraction is a measured Cn+ fraction of a feed.
type PlusFraction struct {
	Name        string  // e.g. "C7+"
	FirstCarbon int     // n of Cn+, e.g. 7
	Z           float64 // mole fraction of the plus fraction in the feed
	M           float64 // molar mass, kg/mol
	SG          float64 // specific gravity 60/60 °F
}

// Characterization controls SplitPlus. The zero value means: gamma split with
// alpha 1 and eta from the first carbon number, lumped into 4 pseudo-components,
// Kesler–Lee critical properties and acentric factors.
type Characterization struct {
	Split       SplitMethod
	Alpha       float64 // gamma shape; 0 means 1
	Eta         float64 // minimum molar mass in the plus fraction, kg/mol; 0 means (14 n − 6) g/mol
	Pseudo      int     // pseudo-components after lumping; 0 means 4
	Correlation CritCorrelation
	Acentric    AcentricMethod
}

// SplitPlus splits a plus fraction into pseudo-components. The returned mole
// fractions (of the whole feed) sum to p.Z, and the mixture of pseudo-components
// reproduces p.M and p.SG exactly.
func SplitPlus(p PlusFraction, c Characterization) ([]Component, []float64, error) {
	return nil, nil, errNotYet
}

// ChuehPrausnitz holds the constants of the Chueh–Prausnitz (1967) relation for
// hydrocarbon–hydrocarbon interaction coefficients,
//
//	k_ij = A [1 − (2 Vc_i^(1/6) Vc_j^(1/6) / (Vc_i^(1/3) + Vc_j^(1/3)))^B].
//
// The zero value means the documented defaults.
type ChuehPrausnitz struct {
	A, B float64
}

// DefaultKij returns n×n row-major interaction coefficients for comps:
// published values for N2, CO2 and H2S with each other and with hydrocarbons,
// Chueh–Prausnitz for hydrocarbon pairs.
func DefaultKij(comps []Component, cp ChuehPrausnitz) []float64 {
	return make([]float64, len(comps)*len(comps))
}
