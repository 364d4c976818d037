package cvd

import (
	"errors"
	"fmt"
	"math"

	"dewcell/eos"
)

// Whitson–Torp material balance of a constant-volume depletion report.
//
// Reference:
//
//   - Whitson, C.H. and Torp, S.B. (1983). Evaluating constant-volume depletion
//     data. JPT 35(3), 610–620. SPE-10067-PA.

// CVDReport is the laboratory report of a constant-volume depletion, in SI,
// per mole of fluid charged to the cell at its dew point.
type CVDReport struct {
	T    float64 // temperature, K
	DewP float64 // dew-point pressure, Pa
	// DewZ is the Z-factor of the fluid at the dew point, p_d V_d/(n_0 R T).
	// CellVolume is the cell (dew-point) volume per mole charged, m³/mol.
	// Give one of them; when both are given they must agree within 1e-6
	// relative.
	DewZ       float64
	CellVolume float64
	Z          []float64 // composition of the fluid charged (the dew-point fluid), mole fractions
	Stages     []CVDStage
}

// CVDStage is one pressure step of a CVD report: the cell after the gas has
// been displaced back to the dew-point volume. The dew point itself is not a
// stage; it is given by CVDReport.DewP.
type CVDStage struct {
	P float64 // pressure, Pa; below DewP and decreasing from stage to stage
	// Produced is the cumulative moles of gas removed from the cell down to
	// and including this stage, per mole charged (the report's "cumulative
	// produced, % of initial moles" over 100). Removed, when not zero, is the
	// moles removed at this stage alone; Produced may then be zero, and is
	// otherwise checked against the previous stage's Produced plus Removed
	// (1e-9 absolute).
	Produced float64
	Removed  float64
	ZGas     float64   // Z-factor of the equilibrium gas removed
	Dropout  float64   // retrograde liquid volume over the cell volume, 0 to 1
	Y        []float64 // composition of the gas removed, mole fractions
}

// BackCalcStage is the cell at one stage as the Whitson–Torp material balance
// finds it. Amounts are per mole of fluid charged to the cell.
type BackCalcStage struct {
	P           float64   // Pa
	Removed     float64   // moles of gas removed at this stage, Δn_p
	Produced    float64   // cumulative moles removed, n_p
	Remaining   float64   // moles left in the cell, n_t = 1 − n_p
	GasMoles    float64   // moles of gas in the cell, n_g = p V_d (1 − S_L)/(Z R T)
	LiquidMoles float64   // moles of liquid in the cell, n_L = n_t − n_g
	Cell        []float64 // overall composition of the cell contents, z_i (sums to 1 when the input compositions do)
	ZTwoPhase   float64   // two-phase Z of the cell contents, p V_d/(n_t R T)

	// X is the liquid composition x_i = (n_t z_i − n_g y_i)/n_L, normalised
	// to sum to 1; SumX is Σ x_i before normalisation: 1 for compositions
	// that close, and the closure error is SumX − 1. X is nil, and SumX 0,
	// when LiquidMoles ≤ 0; X is left unnormalised when SumX ≤ 0 (data far
	// from closing).
	X    []float64
	SumX float64
	// K are the equilibrium ratios y_i/x_i with the normalised x. K_i is 0
	// where x_i ≤ 0: a component absent from both phases, or a negative
	// x_i (listed in NegativeX), has no K-value.
	K []float64
	// LiquidM is the liquid molar mass (n_t M_t − n_g M_g)/n_L, kg/mol,
	// from the unnormalised balance; LiquidDensity is the liquid mass over
	// its volume, n_L M_L/(S_L V_d), kg/m³. Both are 0 when LiquidMoles ≤ 0;
	// LiquidDensity is also 0 when the reported dropout is 0.
	LiquidM       float64
	LiquidDensity float64

	// Flags of inconsistent data (Whitson and Torp 1983): NegativeX lists
	// the components whose computed liquid mole fraction is negative,
	// NegativeCell those of which more has been produced than was charged,
	// and NoLiquid is set when the gas in the cell accounts for all the
	// moles left in it or more (LiquidMoles ≤ 0).
	NegativeX    []int
	NegativeCell []int
	NoLiquid     bool
}

// Consistent reports whether the stage raised none of the flags.
func (s *BackCalcStage) Consistent() bool {
	return !s.NoLiquid && len(s.NegativeX) == 0 && len(s.NegativeCell) == 0
}

// BackCalc is the Whitson–Torp back-calculation of a CVD report.
type BackCalc struct {
	T          float64 // K
	DewP       float64 // Pa
	CellVolume float64 // m³ per mole charged
	Stages     []BackCalcStage
}

// ErrBadReport is wrapped by every error BackCalculate returns for invalid input.
var ErrBadReport = errors.New("invalid CVD report")

// ReportError names the field of a CVD report that is invalid and says what is
// wrong with it. errors.Is(err, ErrBadReport) holds.
type ReportError struct {
	Field string // e.g. "Stages[2].Dropout", "Z[4]", "DewZ", or "molarMass" for the argument
	Msg   string // e.g. "= 1.2, want 0 to 1"
}

func (e *ReportError) Error() string { return "CVD report: " + e.Field + " " + e.Msg }

// Unwrap returns ErrBadReport.
func (e *ReportError) Unwrap() error { return ErrBadReport }

// compositionTol is how far a reported composition may sum from 1. Reports
// print mole percents to two decimals, so sums of 99.9x–100.0x are common; a
// larger deviation is taken for a typing error. BackCalculate does not
// normalise the input: the deviation shows in SumX.
const compositionTol = 0.01 // common practice, no published source

// TwoPhaseZ returns the two-phase Z-factor of a CVD cell at pressure p after
// the fraction produced of the moles charged has been removed:
//
//	Z2 = p V_d/[(n_0 − n_p) R T] = (p/p_d) Z_d/(1 − n_p/n_0)
//
// (Whitson and Torp 1983). pDew and p are in the same unit; zDew is the
// Z-factor at the dew point. It does not check its arguments.
func TwoPhaseZ(pDew, zDew, p, produced float64) float64 {
	return p / pDew * zDew / (1 - produced)
}

// BackCalculate applies the material balance of Whitson and Torp (1983) to a
// CVD report: starting from one mole of the dew-point fluid in the cell
// volume V_d, at each stage k
//
//	n_t,k = n_t,k−1 − Δn_p,k                           moles left in the cell
//	n_g,k = p_k V_d (1 − S_L,k)/(Z_k R T)              gas in the cell
//	n_L,k = n_t,k − n_g,k                              liquid in the cell
//	n_t,k z_i,k = n_t,k−1 z_i,k−1 − Δn_p,k y_i,k       overall composition
//	x_i,k = (n_t,k z_i,k − n_g,k y_i,k)/n_L,k          liquid composition
//	K_i,k = y_i,k/x_i,k
//
// molarMass holds the molar mass of each component, kg/mol, in the order of
// the compositions. The liquid compositions are reported with their closure
// error (SumX) before they are normalised, and the stage flags inconsistent
// data (negative x or z, no liquid) instead of failing: finding those is what
// the method is for.
//
// Input that cannot be evaluated returns a *ReportError (errors.Is
// ErrBadReport) naming the field, and a nil *BackCalc: compositions of the
// wrong length, negative or non-finite values, summing further than 0.01
// from 1; a non-positive temperature, pressure, Z-factor or cell volume;
// DewZ and CellVolume that disagree; pressures not strictly decreasing from
// the dew point; dropout outside [0, 1); cumulative produced moles that
// decrease, reach 1, or disagree with Removed.
func BackCalculate(r CVDReport, molarMass []float64) (*BackCalc, error) {
	vd, err := checkReport(r, molarMass)
	if err != nil {
		return nil, err
	}
	n := len(r.Z)
	bc := &BackCalc{T: r.T, DewP: r.DewP, CellVolume: vd, Stages: make([]BackCalcStage, len(r.Stages))}
	cell := append([]float64(nil), r.Z...) // n_t z_i, moles of each component in the cell
	nt, np := 1.0, 0.0
	for k, st := range r.Stages {
		dn := st.Removed
		if dn == 0 {
			dn = st.Produced - np
		}
		np += dn
		nt = 1 - np
		s := &bc.Stages[k]
		s.P, s.Removed, s.Produced, s.Remaining = st.P, dn, np, nt
		s.ZTwoPhase = st.P * vd / (nt * eos.R * r.T)
		s.GasMoles = st.P * vd * (1 - st.Dropout) / (st.ZGas * eos.R * r.T)
		s.LiquidMoles = nt - s.GasMoles
		s.Cell = make([]float64, n)
		var mt, mg float64 // n_t M_t and M_g
		for i := range cell {
			cell[i] -= dn * st.Y[i]
			s.Cell[i] = cell[i] / nt
			if cell[i] < 0 {
				s.NegativeCell = append(s.NegativeCell, i)
			}
			mt += cell[i] * molarMass[i]
			mg += st.Y[i] * molarMass[i]
		}
		if !(s.LiquidMoles > 0) {
			s.NoLiquid = true
			continue
		}
		s.X = make([]float64, n)
		s.K = make([]float64, n)
		for i := range cell {
			s.X[i] = (cell[i] - s.GasMoles*st.Y[i]) / s.LiquidMoles
			s.SumX += s.X[i]
		}
		s.LiquidM = (mt - s.GasMoles*mg) / s.LiquidMoles
		if st.Dropout > 0 {
			s.LiquidDensity = s.LiquidMoles * s.LiquidM / (st.Dropout * vd)
		}
		for i := range s.X {
			if s.SumX > 0 {
				s.X[i] /= s.SumX
			}
			if s.X[i] < 0 {
				s.NegativeX = append(s.NegativeX, i)
			}
			if s.X[i] > 0 {
				s.K[i] = st.Y[i] / s.X[i]
			}
		}
	}
	return bc, nil
}

// checkReport validates r and returns the cell volume per mole charged.
func checkReport(r CVDReport, molarMass []float64) (float64, error) {
	bad := func(field, format string, args ...any) error {
		return &ReportError{Field: field, Msg: fmt.Sprintf(format, args...)}
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	pos := func(v float64) bool { return v > 0 && finite(v) }
	n := len(r.Z)
	if n == 0 {
		return 0, bad("Z", "is empty, want the composition of the fluid charged")
	}
	if len(molarMass) != n {
		return 0, bad("molarMass", "has %d entries for %d components", len(molarMass), n)
	}
	for i, m := range molarMass {
		if !pos(m) {
			return 0, bad(fmt.Sprintf("molarMass[%d]", i), "= %g, want > 0 kg/mol", m)
		}
	}
	if err := checkComposition("Z", r.Z); err != nil {
		return 0, err
	}
	if !pos(r.T) {
		return 0, bad("T", "= %g, want > 0 K", r.T)
	}
	if !pos(r.DewP) {
		return 0, bad("DewP", "= %g, want > 0 Pa", r.DewP)
	}
	if r.DewZ != 0 && !pos(r.DewZ) {
		return 0, bad("DewZ", "= %g, want > 0 (or 0 with CellVolume given)", r.DewZ)
	}
	if r.CellVolume != 0 && !pos(r.CellVolume) {
		return 0, bad("CellVolume", "= %g, want > 0 m³/mol (or 0 with DewZ given)", r.CellVolume)
	}
	vd := r.CellVolume
	switch {
	case r.DewZ == 0 && r.CellVolume == 0:
		return 0, bad("DewZ", "and CellVolume are both 0, want one of them")
	case r.CellVolume == 0:
		vd = r.DewZ * eos.R * r.T / r.DewP
	case r.DewZ != 0:
		if v := r.DewZ * eos.R * r.T / r.DewP; math.Abs(v-vd) > 1e-6*vd {
			return 0, bad("CellVolume", "= %g m³/mol, but DewZ = %g gives %g", vd, r.DewZ, v)
		}
	}
	if len(r.Stages) == 0 {
		return 0, bad("Stages", "is empty, want at least one pressure below the dew point")
	}
	pPrev, npPrev := r.DewP, 0.0
	for k, st := range r.Stages {
		f := func(name string) string { return fmt.Sprintf("Stages[%d].%s", k, name) }
		switch {
		case !pos(st.P):
			return 0, bad(f("P"), "= %g, want > 0 Pa", st.P)
		case k == 0 && st.P >= pPrev:
			return 0, bad(f("P"), "= %g Pa, want below the dew point %g Pa (the dew point is DewP, not a stage)", st.P, pPrev)
		case st.P >= pPrev:
			return 0, bad(f("P"), "= %g Pa, want below the previous stage's %g Pa", st.P, pPrev)
		case !pos(st.ZGas):
			return 0, bad(f("ZGas"), "= %g, want > 0", st.ZGas)
		case !finite(st.Dropout) || st.Dropout < 0 || st.Dropout >= 1:
			return 0, bad(f("Dropout"), "= %g, want a fraction of the cell volume, 0 to 1", st.Dropout)
		case !finite(st.Removed) || st.Removed < 0:
			return 0, bad(f("Removed"), "= %g, want >= 0 moles per mole charged", st.Removed)
		case !finite(st.Produced) || st.Produced < 0:
			return 0, bad(f("Produced"), "= %g, want >= 0 moles per mole charged", st.Produced)
		}
		np := st.Produced
		if st.Removed != 0 {
			np = npPrev + st.Removed
			if st.Produced != 0 && math.Abs(st.Produced-np) > 1e-9 {
				return 0, bad(f("Produced"), "= %.10g, but the previous stage's %.10g plus Removed %.10g is %.10g",
					st.Produced, npPrev, st.Removed, np)
			}
		}
		switch {
		case np < npPrev:
			return 0, bad(f("Produced"), "= %g, less than the previous stage's %g: cumulative production cannot fall", np, npPrev)
		case np >= 1:
			return 0, bad(f("Produced"), "= %g, want below 1 (all the moles charged)", np)
		}
		if len(st.Y) != n {
			return 0, bad(f("Y"), "has %d entries for %d components", len(st.Y), n)
		}
		if err := checkComposition(f("Y"), st.Y); err != nil {
			return 0, err
		}
		pPrev, npPrev = st.P, np
	}
	return vd, nil
}

// checkComposition reports negative or non-finite mole fractions and sums
// further than compositionTol from 1.
func checkComposition(field string, z []float64) error {
	s := 0.0
	for i, v := range z {
		if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
			return &ReportError{Field: fmt.Sprintf("%s[%d]", field, i), Msg: fmt.Sprintf("= %g, want a mole fraction >= 0", v)}
		}
		s += v
	}
	if math.Abs(s-1) > compositionTol {
		return &ReportError{Field: field, Msg: fmt.Sprintf("sums to %.6g, want 1 within %g (mole fractions, not percent)", s, compositionTol)}
	}
	return nil
}
