package cvd_test

import (
	"errors"
	"fmt"
	"log"
	"math"
	"math/rand"
	"strings"
	"testing"

	"dewcell/cvd"
	"dewcell/eos"
)

// charCondensate is a gas condensate described the way a laboratory reports
// one: library components and a C7+ fraction split by eos.SplitPlus, with
// volume shift. The compositions are invented for testing.
type charCondensate struct {
	name   string
	fl     *eos.Fluid
	z      []float64
	t      float64 // K
	pAband float64 // Pa, the last default depletion step
}

func charCondensates(t testing.TB) []charCondensate {
	t.Helper()
	mk := func(name string, molPct map[string]float64, plus eos.PlusFraction, tf, abandPsia float64) charCondensate {
		order := []string{"N2", "CO2", "C1", "C2", "C3", "iC4", "nC4", "iC5", "nC5", "nC6"}
		var comps []eos.Component
		var z []float64
		for _, nm := range order {
			c, ok := eos.LibraryComponent(nm)
			if !ok {
				t.Fatalf("library has no %s", nm)
			}
			comps = append(comps, c)
			z = append(z, molPct[nm]/100)
		}
		pcs, pz, err := eos.SplitPlus(plus, eos.Characterization{})
		if err != nil {
			t.Fatal(err)
		}
		comps = append(comps, pcs...)
		z = append(z, pz...)
		fl, err := eos.NewFluid(comps, eos.DefaultKij(comps, eos.ChuehPrausnitz{}), eos.Options{Equation: eos.PR78, VolumeShift: true})
		if err != nil {
			t.Fatal(err)
		}
		if err := fl.CheckComposition(z); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		return charCondensate{name: name, fl: fl, z: z, t: degF(tf), pAband: abandPsia * psi}
	}
	return []charCondensate{
		mk("rich condensate", map[string]float64{"N2": 0.40, "CO2": 2.30, "C1": 71.20, "C2": 8.40, "C3": 4.70,
			"iC4": 1.00, "nC4": 1.60, "iC5": 0.70, "nC5": 0.75, "nC6": 1.05},
			eos.PlusFraction{Name: "C7+", FirstCarbon: 7, Z: 0.079, M: 0.148, SG: 0.795}, 250, 800),
	}
}

// reportFromDepletion turns a simulated CVD into the laboratory report it
// stands for; cumulative selects whether the stages give the cumulative
// produced moles only, or the step's moles as well.
func reportFromDepletion(dep *cvd.Depletion, z []float64, cumulative bool) cvd.CVDReport {
	r := cvd.CVDReport{T: dep.T, DewP: dep.Dew.P, DewZ: dep.Dew.Feed.Z, Z: z}
	if cumulative {
		r.DewZ, r.CellVolume = 0, dep.CellVolume
	}
	for _, st := range dep.Steps {
		if !st.TwoPhase || st.P >= dep.Dew.P {
			continue // the dew point is DewP, not a stage
		}
		s := cvd.CVDStage{P: st.P, Produced: st.Produced, ZGas: st.ZGas, Dropout: st.LiquidDropout, Y: st.Y}
		if !cumulative {
			s.Removed = st.StepProduced
		}
		r.Stages = append(r.Stages, s)
	}
	return r
}

func molarMasses(fl *eos.Fluid) []float64 {
	m := make([]float64, fl.N())
	for i := range m {
		m[i] = fl.Component(i).M
	}
	return m
}

// TestBackCalculateReproducesDeplete is the closure check of METHODS C10:
// the data of a simulated CVD, fed back through the Whitson–Torp balance,
// must return the liquid compositions and K-values the simulation found, to
// round-off. The balance is linear in the data (a few subtractions and one
// division by n_L), so 1e-9 leaves three or more orders of magnitude for the
// amplification n_g/n_L of a lean cell.
func TestBackCalculateReproducesDeplete(t *testing.T) {
	d := loadRef(t)
	type tc struct {
		name string
		fl   *eos.Fluid
		z    []float64
		dep  *cvd.Depletion
	}
	dep, fl, z := o9Depletion(t, d)
	cases := []tc{{"O9 (pr-open.json)", fl, z, dep}}
	for _, c := range charCondensates(t) {
		dep, err := cvd.Deplete(c.fl, c.z, c.t, cvd.DepletionOptions{Abandonment: c.pAband})
		if err != nil {
			t.Errorf("Deplete(%s): %v", c.name, err)
			continue
		}
		cases = append(cases, tc{c.name, c.fl, c.z, dep})
	}
	for _, c := range cases {
		for _, cumulative := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s/cumulative=%v", c.name, cumulative), func(t *testing.T) {
				r := reportFromDepletion(c.dep, c.z, cumulative)
				if len(r.Stages) == 0 {
					t.Fatal("the depletion has no two-phase step")
				}
				bc, err := cvd.BackCalculate(r, molarMasses(c.fl))
				if err != nil {
					t.Fatal(err)
				}
				withinRel(t, "cell volume", bc.CellVolume, c.dep.CellVolume, 1e-12, "Z_d R T/p_d")
				k := 0
				for _, st := range c.dep.Steps {
					if !st.TwoPhase || st.P >= c.dep.Dew.P {
						continue
					}
					b := bc.Stages[k]
					k++
					at := fmt.Sprintf("%.6g Pa", st.P)
					if !b.Consistent() {
						t.Errorf("%s: flagged inconsistent (negative x %v, negative z %v, no liquid %v)", at, b.NegativeX, b.NegativeCell, b.NoLiquid)
						continue
					}
					nt := sum(st.Cell)
					within(t, at+": moles left", b.Remaining, nt, 1e-12, "Deplete")
					withinRel(t, at+": liquid moles", b.LiquidMoles, st.LiquidMoles, 1e-9, "Deplete")
					withinRel(t, at+": gas moles", b.GasMoles, nt-st.LiquidMoles, 1e-9, "Deplete")
					within(t, at+": Σx − 1 (closure)", b.SumX-1, 0, 1e-12, "Deplete's compositions sum to 1")
					withinRel(t, at+": two-phase Z", b.ZTwoPhase, st.ZTwoPhase, 1e-12, "Deplete")
					withinRel(t, at+": liquid molar mass", b.LiquidM, st.Liquid.M, 1e-9, "Deplete")
					withinRel(t, at+": liquid density", b.LiquidDensity, st.Liquid.Rho, 1e-9, "Deplete")
					for i := range c.z {
						name := c.fl.Component(i).Name
						within(t, at+": z_"+name+" of the cell", b.Cell[i], st.Cell[i]/nt, 1e-12, "Deplete")
						within(t, at+": x_"+name, b.X[i], st.X[i], 1e-9, "Deplete")
						withinRel(t, at+": K_"+name, b.K[i], st.Y[i]/st.X[i], 1e-8, "Deplete")
					}
				}
				if k != len(bc.Stages) {
					t.Errorf("%d stages back-calculated for %d two-phase steps", len(bc.Stages), k)
				}
			})
		}
	}
}

// The worked example below follows the equations of Whitson and Torp (1983)
// as restated in METHODS 8.2, by hand. With V_d = Z_d R T/p_d the gas in the
// cell is n_g = (p/p_d)(Z_d/Z)(1 − S_L), independent of R and T.
//
//	p_d = 5000 psia, Z_d = 1.0; stage: p = 3000 psia, n_p = 0.25, Z = 0.9, S_L = 0.1
//	n_g = 0.6 · (1/0.9) · 0.9 = 0.6;  n_t = 0.75;  n_L = 0.15
//	z_0 = (0.8, 0.2), y = (0.9, 0.1): cell moles = (0.8 − 0.225, 0.2 − 0.025) = (0.575, 0.175)
//	x = ((0.575 − 0.54)/0.15, (0.175 − 0.06)/0.15) = (7/30, 23/30)
//	K = (0.9·30/7, 0.1·30/23) = (27/7, 3/23)
//	M = (16, 100) g/mol: M_L = (7·16 + 23·100)/30 = 80.4 g/mol
//	ρ_L = n_L M_L/(S_L V_d) = 0.15 · 0.0804/(0.1 V_d) kg/m³
//	Z2 = (3000/5000) · 1.0/0.75 = 0.8 (METHODS C10)
func workedReport() (cvd.CVDReport, []float64) {
	return cvd.CVDReport{
		T: 400, DewP: 5000 * psi, DewZ: 1.0, Z: []float64{0.8, 0.2},
		Stages: []cvd.CVDStage{{P: 3000 * psi, Produced: 0.25, ZGas: 0.9, Dropout: 0.1, Y: []float64{0.9, 0.1}}},
	}, []float64{0.016, 0.100}
}

func TestBackCalculateWorkedExample(t *testing.T) {
	r, m := workedReport()
	bc, err := cvd.BackCalculate(r, m)
	if err != nil {
		t.Fatal(err)
	}
	const src = "worked by hand from METHODS 8.2 (Whitson and Torp 1983)"
	s := bc.Stages[0]
	vd := eos.R * r.T / r.DewP
	withinRel(t, "cell volume", bc.CellVolume, vd, 1e-14, "Z_d R T/p_d")
	within(t, "gas moles", s.GasMoles, 0.6, 1e-14, src)
	within(t, "remaining moles", s.Remaining, 0.75, 1e-14, src)
	within(t, "liquid moles", s.LiquidMoles, 0.15, 1e-14, src)
	within(t, "z_1 of the cell", s.Cell[0], 0.575/0.75, 1e-14, src)
	within(t, "x_1", s.X[0], 7.0/30, 1e-13, src)
	within(t, "x_2", s.X[1], 23.0/30, 1e-13, src)
	within(t, "Σx", s.SumX, 1, 1e-13, src)
	within(t, "K_1", s.K[0], 27.0/7, 1e-12, src)
	within(t, "K_2", s.K[1], 3.0/23, 1e-13, src)
	within(t, "liquid molar mass (kg/mol)", s.LiquidM, 0.0804, 1e-15, src)
	withinRel(t, "liquid density (kg/m³)", s.LiquidDensity, 0.15*0.0804/(0.1*vd), 1e-12, src)
	within(t, "two-phase Z", s.ZTwoPhase, 0.8, 1e-14, "METHODS C10")
	if !s.Consistent() {
		t.Errorf("consistent data flagged: %+v", s)
	}
}

// TestTwoPhaseZ is METHODS C10: p_d 5000 psia, Z_d 1.0, p 3000 psia,
// n_p/n_0 0.25 → Z2 = (3000/5000)·1.0/0.75 = 0.8000.
func TestTwoPhaseZ(t *testing.T) {
	within(t, "TwoPhaseZ(5000 psia, 1.0, 3000 psia, 0.25)", cvd.TwoPhaseZ(5000*psi, 1.0, 3000*psi, 0.25), 0.8, 1e-14, "METHODS C10")
	within(t, "TwoPhaseZ at the dew point", cvd.TwoPhaseZ(5000, 0.85, 5000, 0), 0.85, 1e-15, "Z2 = Z_d before any production")
}

// TestBackCalculateFlags: data that cannot come from a real cell are flagged,
// not rejected, and the closure error shows compositions that do not sum to 1.
func TestBackCalculateFlags(t *testing.T) {
	m := []float64{0.016, 0.100}
	run := func(mod func(*cvd.CVDReport)) cvd.BackCalcStage {
		t.Helper()
		r, _ := workedReport()
		r.Stages[0].Y = append([]float64(nil), r.Stages[0].Y...)
		mod(&r)
		bc, err := cvd.BackCalculate(r, m)
		if err != nil {
			t.Fatal(err)
		}
		return bc.Stages[0]
	}
	// y = (0.902, 0.1) sums to 1.002: cell (0.5745, 0.175), n_g Σy = 0.6012,
	// Σx = (0.7495 − 0.6012)/0.15 = 0.98866…
	s := run(func(r *cvd.CVDReport) { r.Stages[0].Y[0] = 0.902 })
	within(t, "Σx with Σy = 1.002", s.SumX, (0.7495-0.6012)/0.15, 1e-13, "worked by hand")
	within(t, "Σ normalised x", sum(s.X), 1, 1e-14, "normalisation")
	// y = (0.98, 0.02): cell C1 0.8 − 0.245 = 0.555 < n_g y = 0.588: x_1 < 0
	s = run(func(r *cvd.CVDReport) { r.Stages[0].Y = []float64{0.98, 0.02} })
	if len(s.NegativeX) != 1 || s.NegativeX[0] != 0 || s.Consistent() {
		t.Errorf("y = (0.98, 0.02): NegativeX = %v, Consistent %v; want [0], false", s.NegativeX, s.Consistent())
	}
	if s.K[0] != 0 {
		t.Errorf("K of a negative x = %g, want 0 (undefined)", s.K[0])
	}
	// Z = 0.7: n_g = 0.6 · 0.9/0.7 = 0.771 > n_t = 0.75: no liquid left
	s = run(func(r *cvd.CVDReport) { r.Stages[0].ZGas = 0.7 })
	if !s.NoLiquid || s.X != nil || s.Consistent() {
		t.Errorf("Z = 0.7: NoLiquid %v, X %v; want true, nil", s.NoLiquid, s.X)
	}
	// produce more heavy component than was charged: z_2 < 0
	s = run(func(r *cvd.CVDReport) {
		r.Stages[0].Produced = 0.5
		r.Stages[0].Y = []float64{0.55, 0.45}
	})
	if len(s.NegativeCell) != 1 || s.NegativeCell[0] != 1 {
		t.Errorf("0.5 mol of y_2 = 0.45 from z_2 = 0.2: NegativeCell = %v, want [1]", s.NegativeCell)
	}
}

func TestBackCalculateBadInput(t *testing.T) {
	m := []float64{0.016, 0.100}
	cases := []struct {
		field string
		mod   func(r *cvd.CVDReport, m *[]float64)
	}{
		{"molarMass", func(r *cvd.CVDReport, m *[]float64) { *m = (*m)[:1] }},
		{"molarMass[1]", func(r *cvd.CVDReport, m *[]float64) { (*m)[1] = -0.1 }},
		{"Z", func(r *cvd.CVDReport, m *[]float64) { r.Z = nil }},
		{"Z[1]", func(r *cvd.CVDReport, m *[]float64) { r.Z = []float64{1.2, -0.2} }},
		{"Z", func(r *cvd.CVDReport, m *[]float64) { r.Z = []float64{80, 20} }}, // percent, not fractions
		{"Z[0]", func(r *cvd.CVDReport, m *[]float64) { r.Z = []float64{math.NaN(), 0.2} }},
		{"T", func(r *cvd.CVDReport, m *[]float64) { r.T = 0 }},
		{"T", func(r *cvd.CVDReport, m *[]float64) { r.T = math.Inf(1) }},
		{"DewP", func(r *cvd.CVDReport, m *[]float64) { r.DewP = -1 }},
		{"DewZ", func(r *cvd.CVDReport, m *[]float64) { r.DewZ = -0.9 }},
		{"DewZ", func(r *cvd.CVDReport, m *[]float64) { r.DewZ = 0 }},
		{"CellVolume", func(r *cvd.CVDReport, m *[]float64) { r.CellVolume = 1e-3 }}, // disagrees with DewZ
		{"CellVolume", func(r *cvd.CVDReport, m *[]float64) { r.DewZ, r.CellVolume = 0, math.NaN() }},
		{"Stages", func(r *cvd.CVDReport, m *[]float64) { r.Stages = nil }},
		{"Stages[0].P", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].P = r.DewP }},
		{"Stages[1].P", func(r *cvd.CVDReport, m *[]float64) { r.Stages = append(r.Stages, r.Stages[0]) }},
		{"Stages[0].P", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].P = math.NaN() }},
		{"Stages[0].ZGas", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].ZGas = 0 }},
		{"Stages[0].Dropout", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Dropout = 10 }}, // percent, not a fraction
		{"Stages[0].Dropout", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Dropout = -0.01 }},
		{"Stages[0].Produced", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Produced = 1 }},
		{"Stages[0].Produced", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Produced = -0.1 }},
		{"Stages[0].Removed", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Removed = -0.1 }},
		{"Stages[0].Produced", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Removed = 0.2 }}, // 0.25 ≠ 0 + 0.2
		{"Stages[1].Produced", func(r *cvd.CVDReport, m *[]float64) {
			r.Stages = append(r.Stages, r.Stages[0])
			r.Stages[1].P, r.Stages[1].Produced = r.Stages[0].P/2, 0.2 // cumulative falls
		}},
		{"Stages[0].Y", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Y = []float64{1} }},
		{"Stages[0].Y[1]", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Y = []float64{0.9, math.Inf(1)} }},
		{"Stages[0].Y", func(r *cvd.CVDReport, m *[]float64) { r.Stages[0].Y = []float64{0.9, 0.2} }},
	}
	for _, c := range cases {
		r, _ := workedReport()
		mm := append([]float64(nil), m...)
		c.mod(&r, &mm)
		bc, err := cvd.BackCalculate(r, mm)
		var re *cvd.ReportError
		switch {
		case err == nil:
			t.Errorf("%s: no error, want one naming the field", c.field)
		case !errors.Is(err, cvd.ErrBadReport) || !errors.As(err, &re):
			t.Errorf("%s: error %v is not a *ReportError wrapping ErrBadReport", c.field, err)
		case re.Field != c.field:
			t.Errorf("error %q names field %q, want %q", err, re.Field, c.field)
		case bc != nil:
			t.Errorf("%s: a result came back with the error", c.field)
		case !strings.Contains(err.Error(), c.field):
			t.Errorf("error %q does not name %q", err, c.field)
		}
	}
}

// TestBackCalculateNoPanic feeds random, mostly invalid reports: every one
// must come back as a result or an error, never a panic or a NaN.
func TestBackCalculateNoPanic(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	vals := []float64{0, -1, 1e-300, 0.5, 1, 2, 1e300, math.NaN(), math.Inf(1), math.Inf(-1)}
	pick := func() float64 {
		if rng.Intn(2) == 0 {
			return vals[rng.Intn(len(vals))]
		}
		return rng.Float64()
	}
	vec := func(n int) []float64 {
		v := make([]float64, n)
		for i := range v {
			v[i] = pick()
		}
		return v
	}
	for range 2000 {
		n := 1 + rng.Intn(3)
		r := cvd.CVDReport{T: pick() * 500, DewP: 3e7 * pick(), DewZ: pick(), CellVolume: pick() * 1e-4, Z: vec(n)}
		p := r.DewP
		for range rng.Intn(4) {
			p *= rng.Float64()
			r.Stages = append(r.Stages, cvd.CVDStage{P: p, Produced: pick(), Removed: pick() * 0.1, ZGas: pick(), Dropout: pick() * 0.3, Y: vec(n + rng.Intn(2) - rng.Intn(2))})
		}
		func() {
			defer func() {
				if e := recover(); e != nil {
					t.Fatalf("BackCalculate(%+v) panicked: %v", r, e)
				}
			}()
			bc, err := cvd.BackCalculate(r, vec(n))
			if err != nil {
				return
			}
			for _, s := range bc.Stages {
				for _, v := range append(append([]float64{s.GasMoles, s.LiquidMoles, s.ZTwoPhase, s.LiquidM, s.LiquidDensity, s.SumX}, s.X...), s.K...) {
					if bad(v) {
						t.Fatalf("BackCalculate(%+v): non-finite value in stage %+v", r, s)
					}
				}
			}
		}()
	}
}

func ExampleBackCalculate() {
	const psi = 6894.757293168361 // Pa
	r := cvd.CVDReport{
		T: 400, DewP: 5000 * psi, DewZ: 1.0,
		Z:      []float64{0.8, 0.2}, // a two-component fluid charged at its dew point
		Stages: []cvd.CVDStage{{P: 3000 * psi, Produced: 0.25, ZGas: 0.9, Dropout: 0.1, Y: []float64{0.9, 0.1}}},
	}
	bc, err := cvd.BackCalculate(r, []float64{0.016, 0.100}) // molar masses, kg/mol
	if err != nil {
		log.Fatal(err)
	}
	s := bc.Stages[0]
	fmt.Printf("n_g %.4g, n_L %.4g, Z2 %.4g\n", s.GasMoles, s.LiquidMoles, s.ZTwoPhase)
	fmt.Printf("x %.4g, K %.4g, sum of x before normalising %.6f\n", s.X, s.K, s.SumX)
	// Output:
	// n_g 0.6, n_L 0.15, Z2 0.8
	// x [0.2333 0.7667], K [3.857 0.1304], sum of x before normalising 1.000000
}
