package mbal

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"

	"dewcell/eos"
)

// ErrBadPlant reports a gas plant that cannot be applied to a fluid.
var ErrBadPlant = errors.New("invalid gas plant")

// fuelRoundoff is how far the fuel fraction may exceed the residue gas (per
// mole of inlet) before Process calls it an error: a plant that burns all
// of its residue, its fractions summing to exactly that in decimal, should
// not fail on the rounding of the sum.
const fuelRoundoff = 1e-12

// Plant takes the separator gas to the sales line. It is a component
// balance, not a process model: each component of the inlet gas loses the
// fraction Remove[name] to treating (CO2 and H2S to an amine unit, N2 to a
// rejection unit, water to dehydration) and the fraction NGL[name] to the
// recovery of natural-gas liquids; what remains is the residue gas, of which
// the plant burns Fuel times the inlet moles, at the residue's composition;
// the rest is sold.
//
// Component names are those of the fluid's own components, exactly as they
// are spelled there (for a fluid with pseudo-components "C7-C9" and
// "C10+", those names; a name standing for a group, such as "C7+" for a
// fluid without such a component, is not accepted: a plant recovers
// component by component, and naming each keeps the balance unambiguous).
// Names missing from the maps are passed through untouched, so the zero
// Plant passes the gas unchanged.
type Plant struct {
	Remove map[string]float64 // component name -> fraction of it taken out (CO2, H2S, N2...), 0..1
	NGL    map[string]float64 // component name -> fraction recovered as natural-gas liquids, 0..1
	// Fuel is the fraction of the plant inlet gas (moles) burnt as fuel,
	// 0 <= Fuel < 1; taken from the residue gas after removal and NGL
	// recovery, at its composition.
	Fuel float64
}

// PlantResult is what Plant.Process makes of an inlet gas. Amounts are in
// moles, as given for the inlet; per-component slices are in the order of
// the fluid's components. The balance Inlet = Removed + NGLMoles + Fuel +
// Sales holds to rounding, and component by component.
type PlantResult struct {
	Inlet    float64   // moles in
	Removed  float64   // moles taken out by Remove
	Removals []float64 // moles taken out by Remove, per component
	NGLMoles float64   // moles recovered as natural-gas liquids
	NGL      []float64 // moles recovered per component
	// NGLVolume is the volume of the recovered liquids at 60 °F, m³:
	// Σ nᵢ Mᵢ/ρᵢ with ρᵢ from StandardLiquidDensity (SGᵢ × the density of
	// water at 60 °F, or the GPA 2145 liquid density of a library
	// component). It adds the volumes of the pure liquids, as the
	// theoretical liquid content of GPA 2172 does; a real mixture shrinks a
	// little on mixing.
	NGLVolume        float64
	Fuel             float64   // moles burnt
	Sales            float64   // moles of sales gas
	SalesMoles       []float64 // moles of sales gas per component
	SalesComposition []float64 // mole fractions of the sales gas (all zero when nothing is left to sell)
}

// Check reports whether the plant can be applied to a fluid of components
// comps: every name in Remove and NGL is one of theirs (the error lists the
// fluid's names), every fraction is finite and in [0, 1], no component
// loses more than all of itself to Remove and NGL together, Fuel is in
// [0, 1), and every component recovered as NGL has a liquid density
// (StandardLiquidDensity). Errors wrap ErrBadPlant, or ErrNoProperty for a
// missing liquid density.
func (p Plant) Check(comps []eos.Component) error {
	index := make(map[string]int, len(comps))
	for i, c := range comps {
		index[c.Name] = i
	}
	fluidNames := func() string {
		names := make([]string, len(comps))
		for i, c := range comps {
			names[i] = c.Name
		}
		return strings.Join(names, ", ")
	}
	for _, m := range []struct {
		what  string
		table map[string]float64
	}{{"Remove", p.Remove}, {"NGL", p.NGL}} {
		for _, name := range sortedKeys(m.table) {
			if _, ok := index[name]; !ok {
				return fmt.Errorf("%w: %s names %q, which is not a component of the fluid (its components: %s)",
					ErrBadPlant, m.what, name, fluidNames())
			}
			if v := m.table[name]; !(v >= 0 && v <= 1) {
				return fmt.Errorf("%w: %s fraction of %s = %g, want 0 to 1", ErrBadPlant, m.what, name, v)
			}
		}
	}
	for _, name := range sortedKeys(p.Remove) {
		if n, ok := p.NGL[name]; ok && p.Remove[name]+n > 1 {
			return fmt.Errorf("%w: %s is removed (%g) and recovered as NGL (%g), %g of it in all, more than all of it",
				ErrBadPlant, name, p.Remove[name], n, p.Remove[name]+n)
		}
	}
	if !(p.Fuel >= 0 && p.Fuel < 1) {
		return fmt.Errorf("%w: fuel fraction %g of the inlet gas, want 0 <= fuel < 1", ErrBadPlant, p.Fuel)
	}
	for _, name := range sortedKeys(p.NGL) {
		if p.NGL[name] == 0 {
			continue
		}
		if _, err := StandardLiquidDensity(comps[index[name]]); err != nil {
			return fmt.Errorf("NGL recovery of %s: %w", name, err)
		}
	}
	return nil
}

func sortedKeys(m map[string]float64) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// Process runs moles of separator gas of composition gas (mole fractions of
// comps) through the plant. gas must sum to 1 within 1e-6 and is
// normalised, so that the balance closes on moles; moles must be finite and
// >= 0. For component i, with inlet nᵢ = moles × gasᵢ,
//
//	removedᵢ = nᵢ Remove[i],  NGLᵢ = nᵢ NGL[i],
//	residueᵢ = nᵢ (1 − Remove[i] − NGL[i]),  residue = Σ residueᵢ,
//	fuel = Fuel × moles,  salesᵢ = residueᵢ (1 − fuel/residue),
//
// and the sales composition is residueᵢ/residue. A fuel fraction larger
// than what the residue holds (residue/moles) is an error: the plant would
// burn gas it does not have. Errors wrap ErrBadPlant (see Check), ErrBadGas
// (the gas or its amount) or ErrNoProperty.
func (p Plant) Process(comps []eos.Component, gas []float64, moles float64) (PlantResult, error) {
	if err := p.Check(comps); err != nil {
		return PlantResult{}, err
	}
	sum, err := checkGas(comps, gas)
	if err != nil {
		return PlantResult{}, err
	}
	if !(moles >= 0) || math.IsInf(moles, 0) {
		return PlantResult{}, fmt.Errorf("%w: %g moles of gas, want a finite amount >= 0", ErrBadGas, moles)
	}
	n := len(comps)
	r := PlantResult{
		Inlet:            moles,
		Removals:         make([]float64, n),
		NGL:              make([]float64, n),
		SalesMoles:       make([]float64, n),
		SalesComposition: make([]float64, n),
	}
	// Per mole of inlet first, so that the fuel check and the sales
	// composition do not depend on the amount.
	resid := make([]float64, n)
	residue := 0.0
	for i, c := range comps {
		yi := gas[i] / sum
		rem, ngl := p.Remove[c.Name], p.NGL[c.Name]
		r.Removals[i] = moles * yi * rem
		r.NGL[i] = moles * yi * ngl
		resid[i] = yi * (1 - (rem + ngl))
		if resid[i] < 0 { // rem + ngl within rounding of 1
			resid[i] = 0
		}
		residue += resid[i]
	}
	if p.Fuel > residue+fuelRoundoff {
		return PlantResult{}, fmt.Errorf("%w: fuel %g of the inlet gas is more than the residue gas after removal and NGL recovery, %.6g of the inlet",
			ErrBadPlant, p.Fuel, residue)
	}
	keep := 0.0 // fraction of the residue sold
	if residue > 0 {
		keep = math.Max(0, 1-p.Fuel/residue)
	}
	for i, c := range comps {
		r.Removed += r.Removals[i]
		r.NGLMoles += r.NGL[i]
		r.SalesMoles[i] = moles * resid[i] * keep
		r.Sales += r.SalesMoles[i]
		if residue > 0 {
			r.SalesComposition[i] = resid[i] / residue
		}
		if r.NGL[i] > 0 {
			rho, err := StandardLiquidDensity(c)
			if err != nil { // Check has seen to it; kept for safety
				return PlantResult{}, err
			}
			r.NGLVolume += r.NGL[i] * c.M / rho
		}
	}
	r.Fuel = moles * p.Fuel
	return r, nil
}
