package mbal

import (
	"errors"
	"math"
	"strings"
	"testing"

	"dewcell/eos"
)

// plSeparatorGas is demo data: a separator gas of a rich gas condensate,
// with a heavy pseudo-component that carries its own specific gravity.
func plSeparatorGas(t testing.TB) ([]eos.Component, []float64) {
	t.Helper()
	comps := hvLib(t, "N2", "CO2", "H2S", "C1", "C2", "C3", "iC4", "nC4", "iC5", "nC5", "nC6")
	comps = append(comps, eos.Component{Name: "C7-C11", M: 0.1152, Tc: 580, Pc: 27e5, Omega: 0.35, SG: 0.762})
	y := []float64{0.012, 0.031, 0.004, 0.745, 0.098, 0.052, 0.010, 0.016, 0.0065, 0.0075, 0.0095, 0.0085}
	return comps, y
}

// TestPlantZeroIsIdentity: the zero Plant sells the separator gas as it
// came, mole for mole.
func TestPlantZeroIsIdentity(t *testing.T) {
	comps, y := plSeparatorGas(t)
	r, err := Plant{}.Process(comps, y, 2500)
	if err != nil {
		t.Fatal(err)
	}
	if r.Inlet != 2500 || r.Removed != 0 || r.NGLMoles != 0 || r.Fuel != 0 || r.NGLVolume != 0 {
		t.Errorf("zero plant: %+v", r)
	}
	if math.Abs(r.Sales-2500) > 1e-9 {
		t.Errorf("sales %.12g moles, want 2500", r.Sales)
	}
	for i := range y {
		if math.Abs(r.SalesComposition[i]-y[i]) > 1e-15 || math.Abs(r.SalesMoles[i]-2500*y[i]) > 1e-12 {
			t.Errorf("%s: sales fraction %g (%g mol), inlet %g", comps[i].Name, r.SalesComposition[i], r.SalesMoles[i], y[i])
		}
	}
}

// TestPlantHandWorked: 1000 mol of a gas of CO2 0.05, C1 0.80, C2 0.10, C3
// 0.05 through a plant that removes 90 % of the CO2, recovers 50 % of the
// ethane and 90 % of the propane, and burns 2 % of the inlet as fuel.
//
//	inlet:    CO2 50, C1 800, C2 100, C3 50 mol
//	removed:  CO2 45                                   Removed  = 45
//	NGL:      C2 50, C3 45                             NGLMoles = 95
//	residue:  CO2 5, C1 800, C2 50, C3 5               860 mol
//	fuel:     0.02 × 1000 = 20 mol                     Sales    = 840
//	sales composition: 5/860, 800/860, 50/860, 5/860
//	                 = 0.0058140, 0.9302326, 0.0581395, 0.0058140
//	NGL volume: ethane  50 × 0.030070/355.936 = 4.22407e-3 m³
//	            propane 45 × 0.044097/506.699 = 3.91626e-3 m³
//	            total 8.14034e-3 m³ (2.15045 US gal)
//
// with the GPA 2145-16 liquid densities M × (p V/R T per ft³) × (ft³ per
// gallon) of ethane, 30.0690 g/mol × 1.1952911 mol/ft³ × 37.488 ft³/gal ÷
// 3.785411784 L/gal = 355.936 kg/m³, and of propane (36.391 ft³/gal),
// 506.699 kg/m³. The sales gas's ideal gross heating value is then
// 0.9302326 × 1010.0 + 0.0581395 × 1769.7 + 0.0058140 × 2516.1 = 1057.053
// Btu/ft³, inside the 950–1150 Btu/scf of pipeline gas (common practice, no
// published source).
func TestPlantHandWorked(t *testing.T) {
	comps := hvLib(t, "CO2", "C1", "C2", "C3")
	p := Plant{Remove: map[string]float64{"CO2": 0.9}, NGL: map[string]float64{"C2": 0.5, "C3": 0.9}, Fuel: 0.02}
	r, err := p.Process(comps, []float64{0.05, 0.80, 0.10, 0.05}, 1000)
	if err != nil {
		t.Fatal(err)
	}
	near := func(what string, got, want, tol float64) {
		t.Helper()
		if math.Abs(got-want) > tol {
			t.Errorf("%s = %.10g, want %.10g", what, got, want)
		}
	}
	near("Inlet", r.Inlet, 1000, 0)
	near("Removed", r.Removed, 45, 1e-12)
	near("NGLMoles", r.NGLMoles, 95, 1e-12)
	near("NGL C2", r.NGL[2], 50, 1e-12)
	near("NGL C3", r.NGL[3], 45, 1e-12)
	near("Fuel", r.Fuel, 20, 1e-12)
	near("Sales", r.Sales, 840, 1e-10)
	for i, w := range []float64{5.0 / 860, 800.0 / 860, 50.0 / 860, 5.0 / 860} {
		near("sales fraction of "+comps[i].Name, r.SalesComposition[i], w, 1e-15)
		near("sales moles of "+comps[i].Name, r.SalesMoles[i], 840*w, 1e-10)
	}
	near("NGLVolume (m³)", r.NGLVolume, 8.14034e-3, 1e-8)
	near("NGLVolume (gal)", r.NGLVolume/hvGal, 2.15045, 1e-5)

	h, err := GrossHeatingValue(comps, r.SalesComposition)
	if err != nil {
		t.Fatal(err)
	}
	hv := IdealGrossBtuPerFt3(h)
	near("sales gas heating value (Btu/ft³)", hv, 1057.053, 1e-3)
	if hv < 950 || hv > 1150 {
		t.Errorf("sales gas %.1f Btu/ft³, outside 950–1150", hv)
	}
}

// TestPlantBalanceCloses: with every kind of take-off at once, the moles
// balance (Inlet = Removed + NGLMoles + Fuel + Sales) and each component's
// (inlet = removed + NGL + sales + its share of the fuel, at the residue's
// composition) close to rounding, and the sales composition sums to 1.
func TestPlantBalanceCloses(t *testing.T) {
	comps, y := plSeparatorGas(t)
	p := Plant{
		Remove: map[string]float64{"CO2": 0.97, "H2S": 0.999, "N2": 0.6},
		NGL:    map[string]float64{"C2": 0.35, "C3": 0.92, "iC4": 0.98, "nC4": 0.99, "iC5": 1, "nC5": 1, "nC6": 1, "C7-C11": 1, "CO2": 0.03},
		Fuel:   0.035,
	}
	const moles = 7.25e6
	r, err := p.Process(comps, y, moles)
	if err != nil {
		t.Fatal(err)
	}
	if sum := r.Removed + r.NGLMoles + r.Fuel + r.Sales; math.Abs(sum-r.Inlet) > 1e-12*moles {
		t.Errorf("out %.15g mol, in %.15g", sum, r.Inlet)
	}
	residue := r.Sales + r.Fuel
	sx := 0.0
	for i, c := range comps {
		fuelShare := r.Fuel * r.SalesComposition[i]
		if d := moles*y[i] - (r.Removals[i] + r.NGL[i] + r.SalesMoles[i] + fuelShare); math.Abs(d) > 1e-12*moles {
			t.Errorf("%s: balance off by %g mol", c.Name, d)
		}
		if math.Abs(r.SalesMoles[i]-r.SalesComposition[i]*r.Sales) > 1e-12*moles {
			t.Errorf("%s: sales moles %g, fraction × sales %g", c.Name, r.SalesMoles[i], r.SalesComposition[i]*r.Sales)
		}
		sx += r.SalesComposition[i]
	}
	if math.Abs(sx-1) > 1e-14 {
		t.Errorf("sales composition sums to %.16g", sx)
	}
	if r.SalesComposition[1] != 0 { // CO2: 97 % removed + 3 % as NGL
		t.Errorf("CO2 left in the sales gas: %g", r.SalesComposition[1])
	}
	if math.Abs(residue-moles*(1-(0.012*0.6+0.031+0.004*0.999+0.098*0.35+0.052*0.92+0.010*0.98+0.016*0.99+0.0065+0.0075+0.0095+0.0085))) > 1e-6 {
		t.Errorf("residue %.6f mol", residue)
	}
	// The NGL volume adds SG-based and table-based densities: the
	// pseudo-component's share is n M/(SG × 999.016).
	rC7 := r.NGL[11] * 0.1152 / (0.762 * 999.016)
	if r.NGLVolume <= rC7 {
		t.Errorf("NGL volume %g m³, the C7-C11 alone %g", r.NGLVolume, rC7)
	}
}

// TestPlantPropaneVolume: the NGL volume of pure propane is n M/ρ with
// propane's liquid density at 60 °F: 36.39 ft³ of gas (60 °F, 14.696 psia)
// per US gallon of liquid, as printed in GPA 2145-16 (36.391, as
// transcribed) and in propane suppliers' and engine makers' fuel charts
// (36.39). 1000 mol is 836.62 ideal ft³, 22.990 gal, 0.087028 m³; the
// tolerance covers 36.39 against 36.391 and the library's molar mass
// (44.097 g/mol) against GPA's (44.0956), 3e-5 each.
func TestPlantPropaneVolume(t *testing.T) {
	comps := hvLib(t, "C3")
	r, err := Plant{NGL: map[string]float64{"C3": 1}}.Process(comps, []float64{1}, 1000)
	if err != nil {
		t.Fatal(err)
	}
	want := 1000 / hvMolF3 / 36.39 * hvGal // m³
	if math.Abs(r.NGLVolume-want) > 1e-4*want {
		t.Errorf("NGL volume %.7f m³, want %.7f (1000 mol at 36.39 ft³/gal)", r.NGLVolume, want)
	}
	if r.Sales != 0 || r.NGLMoles != 1000 {
		t.Errorf("all propane recovered: sales %g, NGL %g", r.Sales, r.NGLMoles)
	}
	for i, x := range r.SalesComposition {
		if x != 0 {
			t.Errorf("nothing left to sell, but fraction %d = %g", i, x)
		}
	}
}

func TestPlantErrors(t *testing.T) {
	comps, y := plSeparatorGas(t)
	for _, tc := range []struct {
		name string
		p    Plant
		is   error
		text string
	}{
		{"unknown name", Plant{NGL: map[string]float64{"C7+": 0.9}}, ErrBadPlant,
			`NGL names "C7+", which is not a component of the fluid (its components: N2, CO2, H2S, C1, C2, C3, iC4, nC4, iC5, nC5, nC6, C7-C11)`},
		{"alias not a name of the fluid", Plant{Remove: map[string]float64{"C6": 0.5}}, ErrBadPlant, `Remove names "C6"`},
		{"fraction above 1", Plant{Remove: map[string]float64{"CO2": 1.2}}, ErrBadPlant, "Remove fraction of CO2 = 1.2, want 0 to 1"},
		{"negative fraction", Plant{NGL: map[string]float64{"C3": -0.1}}, ErrBadPlant, "NGL fraction of C3 = -0.1"},
		{"NaN fraction", Plant{NGL: map[string]float64{"C3": math.NaN()}}, ErrBadPlant, "NGL fraction of C3 = NaN"},
		{"both over 1", Plant{Remove: map[string]float64{"CO2": 0.7}, NGL: map[string]float64{"CO2": 0.4}}, ErrBadPlant,
			"CO2 is removed (0.7) and recovered as NGL (0.4), 1.1 of it in all"},
		{"fuel 1", Plant{Fuel: 1}, ErrBadPlant, "fuel fraction 1 of the inlet gas, want 0 <= fuel < 1"},
		{"fuel negative", Plant{Fuel: -0.01}, ErrBadPlant, "fuel fraction -0.01"},
		{"fuel exceeds residue", Plant{NGL: map[string]float64{"C1": 1}, Fuel: 0.5}, ErrBadPlant,
			"fuel 0.5 of the inlet gas is more than the residue gas after removal and NGL recovery, 0.255 of the inlet"},
	} {
		_, err := tc.p.Process(comps, y, 100)
		if !errors.Is(err, tc.is) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: %v\nwant %v containing %q", tc.name, err, tc.is, tc.text)
		}
	}
	// An NGL component whose liquid density is unknown: a pseudo-component
	// without SG.
	heavy := append(append([]eos.Component(nil), comps[:11]...), eos.Component{Name: "C7+", M: 0.13, Tc: 600, Pc: 25e5, Omega: 0.4})
	err := Plant{NGL: map[string]float64{"C7+": 1}}.Check(heavy)
	if !errors.Is(err, ErrNoProperty) || !strings.Contains(err.Error(), "NGL recovery of C7+: no value known for the component: no liquid density at 60 °F for C7+") {
		t.Errorf("NGL without density: %v", err)
	}
	// The gas and its amount.
	for _, tc := range []struct {
		name  string
		gas   []float64
		moles float64
		text  string
	}{
		{"sum", append(append([]float64(nil), y[:11]...), 0.0185), 100, "sum to"},
		{"length", y[:5], 100, "5 mole fractions for 12 components"},
		{"negative moles", y, -1, "-1 moles of gas"},
		{"infinite moles", y, math.Inf(1), "+Inf moles of gas"},
	} {
		_, err := Plant{}.Process(comps, tc.gas, tc.moles)
		if !errors.Is(err, ErrBadGas) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: %v, want ErrBadGas containing %q", tc.name, err, tc.text)
		}
	}
	if err := (Plant{Remove: map[string]float64{"H2S": 1}, NGL: map[string]float64{"C3": 0.9, "H2S": 0}, Fuel: 0.05}).Check(comps); err != nil {
		t.Errorf("valid plant: %v", err)
	}
}
