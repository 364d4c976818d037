package cvd_test

// Checks of the simulated experiments against ../testdata/pr-open.json:
// Peng–Robinson (PR78, no volume shift) values for the synthetic gas
// condensate O9 at 220 °F, computed by the independent general-purpose
// open-source thermodynamics library CalebBell/thermo 0.6.1 and repeated by a
// separate straightforward re-implementation of the same equations. They are
// computed, not measured: they say whether Deplete and Expand carry out the
// procedures of ../testdata/pr-open.md (constant-volume depletion and
// constant-composition expansion, as written there) on the same model, not
// whether PR describes a real fluid.
//
// Two tiers of tolerance:
//
//   - acceptance: the tolerances the feature was specified with: liquid
//     dropout, liquid volume and cumulative produced moles within 0.05 %
//     (absolute, in percent of the dew-point volume or of the initial moles),
//     Z-factors within 1e-4, CCE relative volumes within 1e-4 relative;
//   - same equations: the two reference codes agree to 8e-13 % in dropout and
//     4e-14 % in produced moles (pr-open.md, "Self-consistency checks") and
//     the eos solvers converge |Δ ln f| to 1e-12, so the same procedure on the
//     same model must agree to 1e-6 in every fraction and Z; a larger
//     difference means a different procedure or definition, even when it is
//     inside the acceptance tolerance.
//
// Identities checked at every depletion step, whatever the reference: the
// component balance (moles charged = moles in the cell + moles produced) to
// 1e-10 relative, and the cell volume equal to the dew-point volume to 1e-9.

import (
	"fmt"
	"math"
	"testing"

	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/internal/refdata"
)

const psi = 6894.757293168361 // Pa per psi, from the lb, g_n and inch definitions (as in pr-open.md)

func degF(f float64) float64 { return (f + 459.67) / 1.8 }

const (
	accFraction = 5e-4 // 0.05 % absolute, as a fraction (dropout, liquid volume, produced)
	accZ        = 1e-4 // Z-factors, absolute
	accRelVol   = 1e-4 // CCE relative volume, relative
	sameTol     = 1e-6 // "same equations" tier, absolute on fractions and Z, relative on volumes
)

// loadRef returns pr-open.json as internal/refdata decodes it.
func loadRef(t testing.TB) *refdata.Data {
	t.Helper()
	d, err := refdata.Load()
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// o9Fluid is fluid O9 of pr-open.md, part C: constants and kij as printed
// there, PR78, no volume shift.
func o9Fluid(t testing.TB) (*eos.Fluid, []float64) {
	t.Helper()
	fl, z, err := refdata.O9Fluid()
	if err != nil {
		t.Fatal(err)
	}
	return fl, z
}

// binaryFluid is methane + n-butane with kij 0.02 (pr-open.md, part B).
func binaryFluid(t testing.TB) *eos.Fluid {
	t.Helper()
	fl, err := refdata.BinaryFluid()
	if err != nil {
		t.Fatal(err)
	}
	return fl
}

func bad(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }

// within reports a failure when |got − want| > tol or got is not finite.
func within(t testing.TB, what string, got, want, tol float64, src string) {
	t.Helper()
	if bad(got) || !(math.Abs(got-want) <= tol) {
		t.Errorf("%s = %.10g, want %.10g ± %g (%s)", what, got, want, tol, src)
	}
}

// withinRel reports a failure when |got − want| > tol |want| or got is not finite.
func withinRel(t testing.TB, what string, got, want, tol float64, src string) {
	t.Helper()
	if bad(got) || !(math.Abs(got-want) <= tol*math.Abs(want)) {
		t.Errorf("%s = %.10g, want %.10g within %g relative (%s)", what, got, want, tol, src)
	}
}

// stepAt returns the depletion step at pressure p (1e-12 relative), or nil.
func stepAt(dep *cvd.Depletion, p float64) *cvd.DepletionStep {
	for i := range dep.Steps {
		if math.Abs(dep.Steps[i].P-p) <= 1e-12*p {
			return &dep.Steps[i]
		}
	}
	return nil
}

// o9Depletion runs Deplete on O9 at the pressures of the pr-open CVD table
// (the rows below the dew point, in Pa exactly as the reference used them).
func o9Depletion(t testing.TB, d *refdata.Data) (*cvd.Depletion, *eos.Fluid, []float64) {
	t.Helper()
	fl, z := o9Fluid(t)
	var ps []float64
	for _, row := range d.O9.CVD.Rows[1:] {
		ps = append(ps, row.PPa)
	}
	dep, err := cvd.Deplete(fl, z, d.O9.TK, cvd.DepletionOptions{Pressures: ps})
	if err != nil {
		t.Fatalf("Deplete(O9, %g K): %v", d.O9.TK, err)
	}
	return dep, fl, z
}

func TestDepleteO9Reference(t *testing.T) {
	d := loadRef(t)
	dep, fl, _ := o9Depletion(t, d)
	src := refdata.File + ", o9.cvd"
	n := fl.N()

	// The dew point and the cell volume Vd = Z_d R T/P_d per mole charged.
	dew := d.O9.CVD.Rows[0]
	withinRel(t, "dew-point pressure (Pa)", dep.Dew.P, dew.PPa, sameTol, src)
	withinRel(t, "cell volume (m³/mol)", dep.CellVolume, d.O9.CCE.VDew, sameTol, refdata.File+", o9.cce.V_dew_m3_per_mol")
	if st := stepAt(dep, dep.Dew.P); st != nil { // a reported dew-point step, if Deplete lists one
		within(t, "dew-point step produced", st.Produced, 0, 1e-15, "nothing is removed at the dew point")
		within(t, "dew-point step dropout", st.LiquidDropout, 0, 1e-15, "no liquid at the dew point")
		within(t, "dew-point step Z gas", st.ZGas, dew.ZV, sameTol, src)
	}

	for _, row := range d.O9.CVD.Rows[1:] {
		at := fmt.Sprintf("CVD at %.6g psia", row.PPsia)
		st := stepAt(dep, row.PPa)
		if st == nil {
			t.Errorf("%s: Deplete reports no step at this pressure (%s)", at, src)
			continue
		}
		if !st.TwoPhase {
			t.Errorf("%s: single phase, want two phases below the dew point (%s)", at, src)
			continue
		}
		type q struct {
			name      string
			got, want float64
			acc       float64
		}
		for _, c := range []q{
			{"liquid dropout (fraction of Vd)", st.LiquidDropout, row.DropoutPct / 100, accFraction},
			{"cumulative produced (fraction of moles charged)", st.Produced, row.ProducedPct / 100, accFraction},
			{"Z of the produced gas", st.ZGas, row.ZV, accZ},
			{"two-phase Z", st.ZTwoPhase, row.ZTwoPhase, accZ},
		} {
			t.Run(at+"/"+c.name, func(t *testing.T) {
				within(t, at+": "+c.name+" [acceptance]", c.got, c.want, c.acc, src)
				within(t, at+": "+c.name+" [same equations]", c.got, c.want, sameTol, src)
			})
		}
		if len(st.Y) != n || len(row.ProducedY) != n || len(st.X) != n || len(row.LiquidX) != n {
			t.Errorf("%s: compositions have %d, %d entries (y, x), reference %d, %d; want %d", at, len(st.Y), len(st.X), len(row.ProducedY), len(row.LiquidX), n)
			continue
		}
		for i := range n {
			name := fl.Component(i).Name
			within(t, at+": produced gas y_"+name, st.Y[i], row.ProducedY[i], sameTol, src)
			within(t, at+": liquid x_"+name, st.X[i], row.LiquidX[i], sameTol, src)
		}
		within(t, at+": moles left in the cell", sum(st.Cell), row.MolesInCell, sameTol, src)
		withinRel(t, at+": liquid density (kg/m³)", st.Liquid.Rho, row.RhoL, sameTol, src)
	}
}

func sum(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x
	}
	return s
}

// TestDepleteBalances checks the identities of a CVD at every step: the
// component balance and the constant cell volume. Run on O9 (no volume shift)
// and on a characterized condensate with volume shift.
func TestDepleteBalances(t *testing.T) {
	d := loadRef(t)
	type tc struct {
		name string
		dep  *cvd.Depletion
		z    []float64
	}
	dep, _, z := o9Depletion(t, d)
	cases := []tc{{"O9", dep, z}}
	for _, c := range charCondensates(t) {
		dep, err := cvd.Deplete(c.fl, c.z, c.t, cvd.DepletionOptions{Abandonment: c.pAband})
		if err != nil {
			t.Errorf("Deplete(%s): %v", c.name, err)
			continue
		}
		cases = append(cases, tc{c.name, dep, c.z})
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) { checkDepletionIdentities(t, c.dep, c.z) })
	}
}

func checkDepletionIdentities(t *testing.T, dep *cvd.Depletion, z []float64) {
	n := len(z)
	if len(dep.Steps) == 0 {
		t.Fatal("no depletion steps")
	}
	vd := dep.CellVolume
	if bad(vd) || !(vd > 0) {
		t.Fatalf("cell volume %g m³/mol, want > 0", vd)
	}
	produced := make([]float64, n) // Σ Δn_p y_i so far
	var cum float64
	for k, st := range dep.Steps {
		at := fmt.Sprintf("step %d (%.6g Pa)", k, st.P)
		if len(st.Cell) != n || len(st.Y) != n {
			t.Fatalf("%s: Cell has %d entries, Y %d, want %d", at, len(st.Cell), len(st.Y), n)
		}
		cum += st.StepProduced
		within(t, at+": cumulative produced = Σ step produced", st.Produced, cum, 1e-12, "definition")
		for i := range n {
			produced[i] += st.StepProduced * st.Y[i]
			// moles charged = moles in the cell + moles produced, component by component
			if got := st.Cell[i] + produced[i]; !(math.Abs(got-z[i]) <= 1e-10*z[i]) {
				t.Errorf("%s: component %d: cell %.15g + produced %.15g = %.15g, want the %.15g charged (1e-10 relative)",
					at, i, st.Cell[i], produced[i], got, z[i])
			}
		}
		nt := sum(st.Cell)
		within(t, at+": moles in the cell + produced", nt+st.Produced, 1, 1e-12, "mole balance")
		withinRel(t, at+": two-phase Z = p Vd/(n R T)", st.ZTwoPhase, st.P*vd/(nt*eos.R*dep.T), 1e-12, "definition, METHODS 8.1")
		// the cell holds n_g moles of gas and n_L of liquid and fills Vd exactly
		nl := 0.0
		if st.TwoPhase {
			nl = st.LiquidMoles
			if len(st.X) != n {
				t.Fatalf("%s: X has %d entries, want %d", at, len(st.X), n)
			}
			withinRel(t, at+": liquid dropout = n_L v_L/Vd", st.LiquidDropout, nl*st.Liquid.V/vd, 1e-9, "definition, METHODS 8.3")
			for i := range n { // the cell's components split between its gas and liquid
				ng := nt - nl
				within(t, fmt.Sprintf("%s: component %d in the cell = n_g y + n_L x", at, i), ng*st.Y[i]+nl*st.X[i], st.Cell[i], 1e-12, "mole balance")
			}
		}
		withinRel(t, at+": cell volume n_g v_g + n_L v_L (m³/mol)", (nt-nl)*st.Gas.V+nl*st.Liquid.V, vd, 1e-9, "constant volume")
		withinRel(t, at+": Z of the produced gas = p v_g/(R T)", st.ZGas, st.P*st.Gas.V/(eos.R*dep.T), 1e-12, "definition")
	}
}

func TestExpandO9Reference(t *testing.T) {
	d := loadRef(t)
	fl, z := o9Fluid(t)
	src := refdata.File + ", o9.cce"
	var ps []float64
	for _, row := range d.O9.CCE.Rows {
		ps = append(ps, row.PPa)
	}
	exp, err := cvd.Expand(fl, z, d.O9.TK, ps, nil)
	if err != nil {
		t.Fatalf("Expand(O9, %g K): %v", d.O9.TK, err)
	}
	withinRel(t, "saturation pressure (Pa)", exp.Saturation.P, d.O9.DewPoint.PPa, sameTol, src)
	withinRel(t, "V_sat (m³/mol)", exp.VSat, d.O9.CCE.VDew, sameTol, src)
	if len(exp.Steps) != len(ps) {
		t.Fatalf("Expand returned %d steps for %d pressures", len(exp.Steps), len(ps))
	}
	for k, row := range d.O9.CCE.Rows {
		st := exp.Steps[k]
		at := fmt.Sprintf("CCE at %.6g psia (%s)", row.PPsia, row.Region)
		if st.P != row.PPa {
			t.Errorf("%s: step %d is at %g Pa, want the order given (%g Pa)", at, k, st.P, row.PPa)
			continue
		}
		withinRel(t, at+": relative volume [acceptance]", st.RelativeVolume, row.RelativeVolume, accRelVol, src)
		withinRel(t, at+": relative volume [same equations]", st.RelativeVolume, row.RelativeVolume, sameTol, src)
		within(t, at+": liquid volume (fraction of V_sat) [acceptance]", st.LiquidVolume, row.LiquidPct/100, accFraction, src)
		within(t, at+": liquid volume (fraction of V_sat) [same equations]", st.LiquidVolume, row.LiquidPct/100, sameTol, src)
		switch row.Region {
		case "single phase":
			if st.TwoPhase {
				t.Errorf("%s: two phases, want one (%s)", at, src)
			}
			within(t, at+": Z [acceptance]", st.Z, refdata.Value(row.Z), accZ, src)
			within(t, at+": Z [same equations]", st.Z, refdata.Value(row.Z), sameTol, src)
			if !(st.Compressibility > 0) {
				t.Errorf("%s: compressibility %g 1/Pa, want > 0 for a single phase (thermodynamic stability)", at, st.Compressibility)
			}
		case "two phase":
			if !st.TwoPhase {
				t.Errorf("%s: one phase, want two (%s)", at, src)
			}
			within(t, at+": two-phase Z [acceptance]", st.Z, refdata.Value(row.ZTwoPhase), accZ, src)
			within(t, at+": two-phase Z [same equations]", st.Z, refdata.Value(row.ZTwoPhase), sameTol, src)
			within(t, at+": vapour fraction", st.VaporFraction, refdata.Value(row.VapourFraction), sameTol, src)
			// the same cell: V/V_sat = Z2 (P_sat/P)/Z_sat
			withinRel(t, at+": relative volume = Z2 P_sat/(P Z_sat)", st.RelativeVolume,
				st.Z*exp.Saturation.P/(st.P*exp.Saturation.Feed.Z), 1e-9, "definition")
		default: // the dew point itself, to the solvers' tolerance either side
			within(t, at+": relative volume", st.RelativeVolume, 1, sameTol, src)
		}
	}
}
