package eos

// Default binary interaction coefficients for Peng–Robinson.
//
// References:
//
//   - Knapp, H., Döring, R., Oellrich, L., Plöcker, U. and Prausnitz, J.M.
//     (1982). Vapor–Liquid Equilibria for Mixtures of Low Boiling Substances.
//     DECHEMA Chemistry Data Series VI. (Non-hydrocarbon pairs; the values
//     below are as stored in a general process-simulator databank that
//     attributes them to this compilation; the attribution is from memory.)
//   - Chueh, P.L. and Prausnitz, J.M. (1967). Vapor–liquid equilibria at high
//     pressures: calculation of partial molar volumes in nonpolar liquid
//     mixtures. AIChE J. 13(6), 1099–1107.

import "math"

// ChuehPrausnitz holds the constants of the Chueh–Prausnitz (1967) relation for
// hydrocarbon–hydrocarbon interaction coefficients,
//
//	k_ij = A [1 − (2 Vc_i^(1/6) Vc_j^(1/6) / (Vc_i^(1/3) + Vc_j^(1/3)))^B].
//
// The zero value means the documented defaults: A = 0.18, B = 6 (from
// memory: B = 6 is the usual exponent; A is a tuning constant, commonly
// 0.1–0.25).
type ChuehPrausnitz struct {
	A, B float64
	// Off sets every hydrocarbon–hydrocarbon pair to zero (A and B unused),
	// since A = 0 in the zero value means the default.
	Off bool
}

const (
	defaultCPA = 0.18
	defaultCPB = 6
)

// Kij returns the Chueh–Prausnitz coefficient of two components of critical
// volumes vci and vcj (any one unit); 0 if either is not positive (unknown).
func (cp ChuehPrausnitz) Kij(vci, vcj float64) float64 {
	if cp.Off || !(vci > 0 && vcj > 0) {
		return 0
	}
	a, b := cp.A, cp.B
	if a == 0 {
		a = defaultCPA
	}
	if b == 0 {
		b = defaultCPB
	}
	ri, rj := math.Cbrt(vci), math.Cbrt(vcj)
	return a * (1 - math.Pow(2*math.Sqrt(ri*rj)/(ri+rj), b))
}

// kijColumns names the hydrocarbons of the published non-hydrocarbon table.
var kijColumns = [...]string{"C1", "C2", "C3", "nC4", "nC5", "nC6", "nC7", "nC10"}

// Molar masses of the nC7 and nC10 columns, kg/mol: C7H16 and C10H22 with
// the conventional atomic weights C 12.011, H 1.008 (IUPAC).
const (
	mNC7  = 0.100205
	mNC10 = 0.142286
)

// nonHCKij holds Peng–Robinson k_ij of N2, CO2 and H2S with the hydrocarbons
// of kijColumns, in that order (Knapp et al., 1982, as stored in a public
// process-simulator databank).
var nonHCKij = map[string][len(kijColumns)]float64{
	"N2":  {0.0311, 0.0515, 0.0852, 0.0800, 0.1000, 0.1496, 0.1441, 0.1293},
	"CO2": {0.0919, 0.1322, 0.1241, 0.1333, 0.1222, 0.1100, 0.1000, 0.1141},
	"H2S": {0.0850, 0.0833, 0.0878, 0.0650, 0.0630, 0.0570, 0.0550, 0.0450},
}

// nonNonKij holds the non-hydrocarbon pairs (same source).
var nonNonKij = map[[2]string]float64{
	{"N2", "CO2"}:  -0.0170,
	{"N2", "H2S"}:  0.1767,
	{"CO2", "H2S"}: 0.0974,
}

// hcColumn maps library hydrocarbon names to their column in kijColumns.
// The branched isomers take their normal isomer's value (common practice, no
// published source).
var hcColumn = map[string]int{
	"C1": 0, "C2": 1, "C3": 2, "iC4": 3, "nC4": 3, "iC5": 4, "nC5": 4, "nC6": 5, "C6": 5,
}

// nonHCWithHC returns k_ij of non-hydrocarbon nh with hydrocarbon c.
// Library hydrocarbons take their tabulated value; any other component is
// treated as a heavier hydrocarbon: the nC7 value up to the molar mass of
// nC7, the nC10 value from that of nC10, linear in M between (a rule of this
// package: common practice, no published source).
func nonHCWithHC(nh string, c Component) float64 {
	row := nonHCKij[nh]
	if col, ok := hcColumn[c.Name]; ok {
		return row[col]
	}
	k7, k10 := row[6], row[7]
	switch {
	case c.M <= mNC7:
		return k7
	case c.M >= mNC10:
		return k10
	}
	return k7 + (k10-k7)*(c.M-mNC7)/(mNC10-mNC7)
}

// DefaultKij returns n×n row-major interaction coefficients for comps:
// published values for N2, CO2 and H2S with each other and with hydrocarbons,
// Chueh–Prausnitz for hydrocarbon pairs.
//
// Components are identified by Name: N2, CO2 and H2S are the non-hydrocarbons,
// every other component is a hydrocarbon. With a non-hydrocarbon, C1 … nC6 of
// the library (and C6) take their tabulated value, iC4 and iC5 that of nC4 and
// nC5, and any other component (pseudo-components, user components) the
// nC7 value up to M = 100.2 g/mol, the nC10 value from M = 142.3 g/mol, and a
// linear interpolation in M between. Hydrocarbon pairs use cp.Kij of their
// critical volumes, so a pair in which either Vc is zero (unknown) gets 0.
// The result is symmetric with a zero diagonal.
func DefaultKij(comps []Component, cp ChuehPrausnitz) []float64 {
	n := len(comps)
	k := make([]float64, n*n)
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			v := pairKij(comps[i], comps[j], cp)
			k[i*n+j], k[j*n+i] = v, v
		}
	}
	return k
}

func pairKij(a, b Component, cp ChuehPrausnitz) float64 {
	_, aNon := nonHCKij[a.Name]
	_, bNon := nonHCKij[b.Name]
	switch {
	case aNon && bNon:
		if a.Name == b.Name {
			return 0
		}
		if v, ok := nonNonKij[[2]string{a.Name, b.Name}]; ok {
			return v
		}
		return nonNonKij[[2]string{b.Name, a.Name}]
	case aNon:
		return nonHCWithHC(a.Name, b)
	case bNon:
		return nonHCWithHC(b.Name, a)
	}
	return cp.Kij(a.Vc, b.Vc)
}
