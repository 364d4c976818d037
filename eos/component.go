package eos

import (
	"errors"
	"fmt"
	"math"

	"dewcell/internal/phys"
)

// R is the molar gas constant, 8.31446261815324 J/(mol·K) (exact since the
// 2019 SI redefinition; package phys).
const R = phys.R

// Peng–Robinson constants from the critical-point conditions (triple root of
// the cubic), unrounded. The rounded 0.45724 and 0.07780 of Peng and Robinson
// (1976) differ by less than 0.01 % in saturation pressure.
const (
	OmegaA = 0.4572355289213822
	OmegaB = 0.07779607390388846
)

// A Component is one species or pseudo-component of a fluid. Zero Vc, Tb or
// SG mean unknown.
type Component struct {
	Name  string
	M     float64 // molar mass, kg/mol
	Tc    float64 // critical temperature, K
	Pc    float64 // critical pressure, Pa
	Omega float64 // acentric factor
	Vc    float64 // critical molar volume, m³/mol
	Tb    float64 // normal boiling point, K
	SG    float64 // liquid specific gravity 60/60 °F
	Shift float64 // Peneloux volume shift, dimensionless s = c/b
}

// Equation selects the cubic equation of state of a fluid.
type Equation int

const (
	// PR78 is Peng–Robinson with the Robinson–Peng (1978) kappa for
	// omega > 0.491 and the 1976 kappa below; the default.
	PR78 Equation = iota
	// PR76 is Peng–Robinson with the original (1976) kappa for every component.
	PR76
	// SRK is Soave–Redlich–Kwong (Soave 1972).
	SRK
)

func (e Equation) String() string {
	switch e {
	case PR78, PR76, SRK:
		return e.Cubic().Name()
	}
	return fmt.Sprintf("Equation(%d)", int(e))
}

// Cubic returns the equation's constants (PR78Cubic, PR76Cubic, SRKCubic).
func (e Equation) Cubic() Cubic {
	switch e {
	case PR76:
		return PR76Cubic()
	case SRK:
		return SRKCubic()
	}
	return PR78Cubic()
}

// Kappa returns the alpha-function slope κ(ω) of the equation for acentric
// factor w:
//
//	PR76: κ = 0.37464 + 1.54226 ω − 0.26992 ω²
//	PR78: κ = 0.379642 + 1.48503 ω − 0.164423 ω² + 0.016666 ω³  for ω > 0.491
//	SRK:  κ = 0.480 + 1.574 ω − 0.176 ω²
func (e Equation) Kappa(w float64) float64 { return e.Cubic().alpha.KappaOf(w) }

// Options describe how NewFluid builds the equation of state.
// The zero value means PR78 without volume translation.
type Options struct {
	Equation    Equation // the cubic; Cubic, when set, replaces it
	Cubic       *Cubic   // another cubic of the family (NewCubic); nil: Equation's
	VolumeShift bool     // apply each component's Peneloux shift to volumes and densities
}

// A Fluid is a cubic-equation (Peng–Robinson by default) description of a fixed set of components with
// their binary interaction coefficients. It is immutable after NewFluid and
// safe for concurrent use; the solvers keep their scratch space elsewhere.
type Fluid struct {
	comps []Component
	kij   []float64 // n×n row-major, symmetric, zero diagonal
	opt   Options
	cubic Cubic

	n     int
	ac    []float64 // Ωa R² Tc²/Pc, Pa·m⁶/mol²
	kappa []float64
	b     []float64 // Ωb R Tc/Pc, m³/mol
	c     []float64 // volume shift s·b, m³/mol (zero without VolumeShift)
	m     []float64 // molar mass, kg/mol
	tc    []float64
	pc    []float64
	omega []float64
	vc    []float64 // critical volume for viscosity, m³/mol: Vc, or estimateVc when Vc is 0

	crit *critMemo // the last few answers of VLCritical
}

// Errors returned by NewFluid, wrapped with the offending component.
var (
	ErrBadComponent = errors.New("invalid component property")
	ErrBadKij       = errors.New("invalid interaction coefficient")
)

// NewFluid checks and copies its input. kij is n×n row-major and must be
// symmetric with zero diagonal and entries in (-1, 1); nil means all zero.
func NewFluid(comps []Component, kij []float64, opt Options) (*Fluid, error) {
	n := len(comps)
	if n == 0 {
		return nil, fmt.Errorf("%w: no components", ErrBadComponent)
	}
	if opt.Equation != PR76 && opt.Equation != PR78 && opt.Equation != SRK {
		return nil, fmt.Errorf("unknown equation %v", opt.Equation)
	}
	cubic := opt.Equation.Cubic()
	if opt.Cubic != nil {
		if opt.Cubic.dd <= 0 || opt.Cubic.omegaB <= 0 {
			return nil, errors.New("cubic equation not made by NewCubic or its constructors")
		}
		cubic = *opt.Cubic
		cp := cubic
		opt.Cubic = &cp
	}
	f := &Fluid{
		comps: append([]Component(nil), comps...),
		kij:   make([]float64, n*n),
		opt:   opt,
		cubic: cubic,
		n:     n,
		ac:    make([]float64, n),
		kappa: make([]float64, n),
		b:     make([]float64, n),
		c:     make([]float64, n),
		m:     make([]float64, n),
		tc:    make([]float64, n),
		pc:    make([]float64, n),
		omega: make([]float64, n),
		vc:    make([]float64, n),
		crit:  new(critMemo),
	}
	seen := make(map[string]bool, n)
	for i, c := range comps {
		if err := c.validate(); err != nil {
			return nil, err
		}
		if seen[c.Name] {
			return nil, fmt.Errorf("%w: component %q listed twice", ErrBadComponent, c.Name)
		}
		seen[c.Name] = true
		f.ac[i] = cubic.omegaAR2 * c.Tc * c.Tc / c.Pc
		f.b[i] = cubic.omegaBR * c.Tc / c.Pc
		f.kappa[i] = cubic.alpha.KappaOf(c.Omega)
		if opt.VolumeShift {
			f.c[i] = c.Shift * f.b[i]
		}
		f.m[i], f.tc[i], f.pc[i], f.omega[i] = c.M, c.Tc, c.Pc, c.Omega
		f.vc[i] = c.Vc
		if f.vc[i] == 0 {
			f.vc[i] = estimateVc(c.Tc, c.Pc, c.Omega)
		}
	}
	if kij != nil {
		if len(kij) != n*n {
			return nil, fmt.Errorf("%w: %d values for %d components", ErrBadKij, len(kij), n)
		}
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				v := kij[i*n+j]
				switch {
				case math.IsNaN(v) || v <= -1 || v >= 1:
					return nil, fmt.Errorf("%w: %s/%s = %g, want -1 < kij < 1", ErrBadKij, comps[i].Name, comps[j].Name, v)
				case i == j && v != 0:
					return nil, fmt.Errorf("%w: %s/%s = %g on the diagonal, want 0", ErrBadKij, comps[i].Name, comps[j].Name, v)
				case v != kij[j*n+i]:
					return nil, fmt.Errorf("%w: %s/%s = %g but %s/%s = %g", ErrBadKij, comps[i].Name, comps[j].Name, v, comps[j].Name, comps[i].Name, kij[j*n+i])
				}
			}
		}
		copy(f.kij, kij)
	}
	return f, nil
}

func (c Component) validate() error {
	bad := func(field string, v float64, want string) error {
		return fmt.Errorf("%w: %s %s = %g, want %s", ErrBadComponent, c.Name, field, v, want)
	}
	finitePos := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) && !math.IsNaN(v) }
	switch {
	case c.Name == "":
		return fmt.Errorf("%w: component with no name", ErrBadComponent)
	case !finitePos(c.M):
		return bad("molar mass", c.M, "> 0 kg/mol")
	case !finitePos(c.Tc):
		return bad("critical temperature", c.Tc, "> 0 K")
	case !finitePos(c.Pc):
		return bad("critical pressure", c.Pc, "> 0 Pa")
	case math.IsNaN(c.Omega) || c.Omega <= -1 || c.Omega > 3:
		return bad("acentric factor", c.Omega, "between -1 and 3")
	case math.IsNaN(c.Vc) || c.Vc < 0 || math.IsInf(c.Vc, 0):
		return bad("critical volume", c.Vc, ">= 0 m³/mol")
	case math.IsNaN(c.Tb) || c.Tb < 0 || math.IsInf(c.Tb, 0):
		return bad("boiling point", c.Tb, ">= 0 K")
	case math.IsNaN(c.SG) || c.SG < 0 || math.IsInf(c.SG, 0):
		return bad("specific gravity", c.SG, ">= 0")
	case math.IsNaN(c.Shift) || math.Abs(c.Shift) >= 1:
		return bad("volume shift", c.Shift, "between -1 and 1")
	}
	return nil
}

// N returns the number of components.
func (f *Fluid) N() int { return f.n }

// Components returns a copy of the component list.
func (f *Fluid) Components() []Component { return append([]Component(nil), f.comps...) }

// Component returns component i.
func (f *Fluid) Component(i int) Component { return f.comps[i] }

// Kij returns the interaction coefficient of components i and j.
func (f *Fluid) Kij(i, j int) float64 { return f.kij[i*f.n+j] }

// CriticalVolume returns the critical volume (m³/mol) the fluid uses for
// component i, in the Lohrenz–Bray–Clark viscosity: the component's Vc, or,
// when that is zero (unknown), the estimate Zc R Tc/Pc with
// Zc = 0.2918 − 0.0928 ω (Reid, Prausnitz and Sherwood 1977, see
// estimateVc), in which case estimated is true. The Chueh–Prausnitz
// coefficients of DefaultKij use the component's own Vc, not the estimate.
func (f *Fluid) CriticalVolume(i int) (vc float64, estimated bool) {
	return f.vc[i], f.comps[i].Vc == 0
}

// Cubic returns the fluid's cubic equation of state.
func (f *Fluid) Cubic() Cubic { return f.cubic }

// Options returns the options the fluid was built with.
func (f *Fluid) Options() Options { return f.opt }

// MolarMass returns the mean molar mass of composition z, kg/mol.
func (f *Fluid) MolarMass(z []float64) float64 {
	f.checkLen(z)
	s := 0.0
	for i, zi := range z {
		s += zi * f.m[i]
	}
	return s
}

func (f *Fluid) checkLen(z []float64) {
	if len(z) != f.n {
		panic("eos: len(z) != number of components")
	}
}

// CheckComposition reports whether z is a usable feed for this fluid: the right
// length, no negative or non-finite entries, and summing to 1 within 1e-8.
func (f *Fluid) CheckComposition(z []float64) error {
	if len(z) != f.n {
		return fmt.Errorf("composition has %d entries for %d components", len(z), f.n)
	}
	s := 0.0
	for i, v := range z {
		if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
			return fmt.Errorf("mole fraction of %s = %g, want a finite value >= 0", f.comps[i].Name, v)
		}
		s += v
	}
	if math.Abs(s-1) > 1e-8 {
		return fmt.Errorf("mole fractions sum to %.10g, want 1", s)
	}
	return nil
}
