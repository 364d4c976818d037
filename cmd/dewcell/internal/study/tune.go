package study

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"dewcell/cvd"
	"dewcell/eos"
)

// The [[tune.parameter]] and [tune.weights] sections:
//
//	[[tune.parameter]]
//	property = "critical_temperature"  # critical_temperature | critical_pressure | acentric_factor |
//	                                   # volume_shift | molar_mass | interaction
//	component = "C7+"                  # a component, a pseudo-component, or the plus fraction
//	                                   # (all its pseudo-components by one common factor)
//	min = 0.9                          # multipliers of the starting value for properties
//	max = 1.1
//	[[tune.parameter]]
//	property = "interaction"
//	pair = "C1/C7+"                    # absolute bounds for interaction coefficients
//	min = 0.0
//	max = 0.2
//	[tune.weights]                     # optional; cvd.DefaultWeights
//	saturation_pressure = 10.0

// Tunable properties, as the study file names them.
const (
	TuneTc          = "critical_temperature"
	TunePc          = "critical_pressure"
	TuneOmega       = "acentric_factor"
	TuneShift       = "volume_shift"
	TuneMolarMass   = "molar_mass"
	TuneInteraction = "interaction"
)

var tuneProperties = []string{TuneTc, TunePc, TuneOmega, TuneShift, TuneMolarMass, TuneInteraction}

// Tune is the regression the study asks for.
type Tune struct {
	Parameters []TuneParameter
	// Weights are the weights of [tune.weights], by quantity name
	// (cvd.Weight looks them up; the others keep cvd.DefaultWeights).
	Weights map[string]float64
}

// A TuneParameter is one [[tune.parameter]]: a property of some components
// scaled by a common factor between Min and Max (the start is 1), or an
// interaction coefficient between Min and Max (the start is the study's
// value).
type TuneParameter struct {
	Key       string // "tune.parameter[2]", for messages
	Property  string // one of the Tune* names
	Component string // for a property: the name as the study gives it
	A, B      string // for an interaction: the pair's two names
	Min, Max  float64
	// Start is the starting value: 1 for a multiplier, the study's
	// coefficient (the mean of them, when the pair stands for several)
	// for an interaction.
	Start float64
}

// Name is how the parameter reads in tables: "critical_temperature C7+",
// "interaction C1/C7+".
func (p TuneParameter) Name() string {
	if p.Property == TuneInteraction {
		return p.Property + " " + p.A + "/" + p.B
	}
	return p.Property + " " + p.Component
}

// Multiplier says the parameter scales a property (a factor of its starting
// value) rather than sets an interaction coefficient.
func (p TuneParameter) Multiplier() bool { return p.Property != TuneInteraction }

func (r *reader) tune(s *Study, f *fileTune) {
	if f == nil || r.err != nil {
		return
	}
	t := &Tune{Weights: map[string]float64{}}
	if len(f.Parameter) == 0 {
		r.missing("tune.parameter", "at least one [[tune.parameter]] with property, component (or pair), min and max")
		return
	}
	tunesM := false
	for i, fp := range f.Parameter {
		k := fmt.Sprintf("tune.parameter[%d]", i+1)
		p := TuneParameter{Key: k}
		p.Property = r.choice(k+".property", fp.Property, "", tuneProperties...)
		if r.err != nil {
			return
		}
		if p.Property == "" {
			r.missing(k+".property", "the property to tune: "+strings.Join(tuneProperties, ", "))
			return
		}
		if p.Property == TuneInteraction {
			if fp.Component.set {
				r.failf(k+".component", "an interaction coefficient names a pair, such as pair = \"C1/C7+\", not a component")
				return
			}
			pair := r.text(k+".pair", fp.Pair, true)
			if r.err != nil {
				return
			}
			parts := strings.Split(pair, "/")
			if len(parts) != 2 {
				r.failf(k+".pair", `want a pair of component names such as "C1/C7+"`)
				return
			}
			p.A, p.B = strings.TrimSpace(parts[0]), strings.TrimSpace(parts[1])
			for _, name := range []string{p.A, p.B} {
				if _, ok := s.groups[name]; !ok {
					r.failf(k+".pair", "%q is not a component of the fluid (%s)", name, strings.Join(s.names(), ", "))
					return
				}
			}
			if p.A == p.B {
				r.failf(k+".pair", "a component does not interact with itself")
				return
			}
			p.Min, _ = r.between(k+".min", fp.Min, "the lowest interaction coefficient", true, -1, 1, false, false)
			p.Max, _ = r.between(k+".max", fp.Max, "the highest interaction coefficient", true, -1, 1, false, false)
			if r.err != nil {
				return
			}
			start, same := s.pairStart(p.A, p.B)
			if !same {
				r.warnings = append(r.warnings, fmt.Sprintf("%s: %s: the coefficients of the pairs %s/%s differ; tuning starts from their mean %.4g and sets them all to one value",
					r.file, k, p.A, p.B, start))
			}
			p.Start = start
			if p.Min >= p.Max {
				r.failf(k+".max", "must be above min")
				return
			}
			if start < p.Min || start > p.Max {
				r.failf(k, "the study's coefficient %.4g lies outside [%g, %g]; widen the bounds or set the coefficient in [fluid.interaction]", start, p.Min, p.Max)
				return
			}
		} else {
			if fp.Pair.set {
				r.failf(k+".pair", "a pair belongs to property = \"interaction\"; %s names a component", p.Property)
				return
			}
			p.Component = r.text(k+".component", fp.Component, true)
			if r.err != nil {
				return
			}
			if _, ok := s.groups[p.Component]; !ok {
				r.failf(k+".component", "%q is not a component of the fluid (%s)", p.Component, strings.Join(s.names(), ", "))
				return
			}
			p.Min, _ = r.between(k+".min", fp.Min, "the lowest multiplier of the starting value", true, 0, 10, true, false)
			p.Max, _ = r.between(k+".max", fp.Max, "the highest multiplier of the starting value", true, 0, 10, true, false)
			if r.err != nil {
				return
			}
			if p.Min >= p.Max {
				r.failf(k+".max", "must be above min")
				return
			}
			if p.Min > 1 || p.Max < 1 {
				r.failf(k, "min %g and max %g are multipliers of the study's value and must enclose 1, where tuning starts", p.Min, p.Max)
				return
			}
			p.Start = 1
			switch p.Property {
			case TuneMolarMass:
				if p.Component != s.plusName || s.plusName == "" {
					r.failf(k+".component", "molar_mass is tuned for the plus fraction only (it re-splits it); %q is not the plus fraction", p.Component)
					return
				}
				tunesM = true
			case TuneShift:
				if !s.Fluid.Options().VolumeShift {
					r.failf(k+".property", "volume_shift is not used: fluid.volume_shift is false; set it to true, or tune another property")
					return
				}
				zero := true
				for _, i := range s.groups[p.Component] {
					if s.Fluid.Component(i).Shift != 0 {
						zero = false
					}
				}
				if zero {
					r.failf(k+".component", "the volume shift of %s is 0, which no multiplier moves; give volume_shift in [fluid.properties.%s], or tune another property", p.Component, p.Component)
					return
				}
			}
		}
		t.Parameters = append(t.Parameters, p)
	}
	// The same property of a component twice, or a pair twice.
	for i, p := range t.Parameters {
		for _, q := range t.Parameters[:i] {
			if p.Property != q.Property {
				continue
			}
			var overlap bool
			if p.Property == TuneInteraction {
				overlap = s.pairsOverlap(p.A, p.B, q.A, q.B)
			} else {
				overlap = intersects(s.groups[p.Component], s.groups[q.Component])
			}
			if overlap {
				r.failf(p.Key, "%s overlaps %s of %s: each coefficient or property is tuned once", p.Name(), q.Name(), q.Key)
				return
			}
		}
	}
	// A re-split renames the pseudo-components: nothing may name them.
	if tunesM {
		for _, p := range t.Parameters {
			for _, name := range []string{p.Component, p.A, p.B} {
				if s.isPseudo(name) {
					r.failf(p.Key, "names the pseudo-component %s while the plus fraction's molar_mass is tuned, which re-splits it and renames its pseudo-components; name the plus fraction %s instead", name, s.plusName)
					return
				}
			}
		}
		for name := range s.raw0().Properties {
			if s.isPseudo(name) {
				r.failf(key("fluid", "properties", name), "overrides a pseudo-component while [[tune.parameter]] tunes the plus fraction's molar_mass, which re-splits it and renames its pseudo-components; tune the override's properties instead, or not the molar mass")
				return
			}
		}
	}
	for _, name := range sortedKeys(f.Weights) {
		k := key("tune", "weights", name)
		if !s.knownQuantity(name) {
			r.failf(k, "unknown quantity; weights are for %s, or gas_<component> of a component of the study", strings.Join(weightNames(), ", "))
			return
		}
		w, ok := r.between(k, f.Weights[name], "a weight", true, 0, 1e6, false, false)
		if !ok {
			return
		}
		t.Weights[name] = w
	}
	s.Tune = t
}

func sortedKeys[V any](m map[string]V) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
}

func weightNames() []string { return sortedKeys(cvd.DefaultWeights) }

func (s *Study) knownQuantity(name string) bool {
	if _, ok := cvd.DefaultWeights[name]; ok {
		return true
	}
	if c, ok := strings.CutPrefix(name, "gas_"); ok {
		_, known := s.groups[c]
		return known
	}
	return false
}

// raw0 is the decoded [fluid] section, while it is being read or after.
func (s *Study) raw0() *fileFluid {
	if s.raw != nil {
		return s.raw
	}
	return &fileFluid{}
}

// names lists the names that stand for components, sorted.
func (s *Study) names() []string { return sortedKeys(s.groups) }

// isPseudo says whether name is a pseudo-component of the plus fraction.
func (s *Study) isPseudo(name string) bool {
	if name == "" || name == s.plusName {
		return false
	}
	g, ok := s.groups[name]
	if !ok || len(g) != 1 {
		return false
	}
	for _, i := range s.groups[s.plusName] {
		if i == g[0] {
			return true
		}
	}
	return false
}

func intersects(a, b []int) bool {
	for _, i := range a {
		for _, j := range b {
			if i == j {
				return true
			}
		}
	}
	return false
}

func (s *Study) pairsOverlap(a1, b1, a2, b2 string) bool {
	g := s.groups
	return (intersects(g[a1], g[a2]) && intersects(g[b1], g[b2])) || (intersects(g[a1], g[b2]) && intersects(g[b1], g[a2]))
}

// pairStart is the mean of the interaction coefficients of the pairs a/b
// stands for, and whether they are all the same.
func (s *Study) pairStart(a, b string) (float64, bool) {
	sum, n := 0.0, 0
	first, same := math.NaN(), true
	for _, i := range s.groups[a] {
		for _, j := range s.groups[b] {
			if i == j {
				continue
			}
			k := s.Fluid.Kij(i, j)
			if n == 0 {
				first = k
			} else if k != first {
				same = false
			}
			sum += k
			n++
		}
	}
	if n == 0 {
		return 0, true
	}
	return sum / float64(n), same
}

// adjustment is the tuned values applied while the fluid is built.
type adjustment struct {
	plusM float64 // kg/mol; 0 keeps the file's
	props []propAdjustment
	kij   []kijAdjustment
}

type propAdjustment struct {
	key, property, target string
	factor                float64
}

type kijAdjustment struct {
	key, a, b string
	value     float64
}

// properties scales the properties of comps the adjustment tunes.
func (a *adjustment) properties(file string, groups map[string][]int, comps []eos.Component) error {
	for _, p := range a.props {
		g, ok := groups[p.target]
		if !ok {
			return &Error{File: file, Key: p.key, Msg: fmt.Sprintf("%q is no longer a component of the fluid", p.target)}
		}
		for _, i := range g {
			c := &comps[i]
			switch p.property {
			case TuneTc:
				c.Tc *= p.factor
			case TunePc:
				c.Pc *= p.factor
			case TuneOmega:
				c.Omega *= p.factor
			case TuneShift:
				c.Shift *= p.factor
			}
		}
	}
	return nil
}

// interactions sets the coefficients the adjustment tunes.
func (a *adjustment) interactions(file string, groups map[string][]int, comps []eos.Component, kij []float64) error {
	n := len(comps)
	for _, p := range a.kij {
		ga, okA := groups[p.a]
		gb, okB := groups[p.b]
		if !okA || !okB {
			return &Error{File: file, Key: p.key, Msg: fmt.Sprintf("%s/%s is no longer a pair of the fluid", p.a, p.b)}
		}
		for _, i := range ga {
			for _, j := range gb {
				if i != j {
					kij[i*n+j], kij[j*n+i] = p.value, p.value
				}
			}
		}
	}
	return nil
}

// Tuned builds the study's fluid with the tune parameters at x (one value
// each, in the order of Tune.Parameters: multipliers for properties,
// coefficients for interactions), as the study file would describe it with
// those values: the plus fraction re-split at the scaled molar mass, the
// pseudo-components' overrides applied, the properties scaled, the
// interaction coefficients set. It returns the fluid and its feed.
func (s *Study) Tuned(x []float64) (*eos.Fluid, []float64, error) {
	if s.Tune == nil || len(x) != len(s.Tune.Parameters) {
		return nil, nil, fmt.Errorf("study: %d tuned values for %d parameters", len(x), s.tuneCount())
	}
	adj := &adjustment{}
	for i, p := range s.Tune.Parameters {
		switch p.Property {
		case TuneMolarMass:
			adj.plusM = s.plusM * x[i]
		case TuneInteraction:
			adj.kij = append(adj.kij, kijAdjustment{key: p.Key, a: p.A, b: p.B, value: x[i]})
		default:
			adj.props = append(adj.props, propAdjustment{key: p.Key, property: p.Property, target: p.Component, factor: x[i]})
		}
	}
	r := &reader{file: s.File, atm: s.Atmospheric, adj: adj}
	t := &Study{File: s.File}
	r.fluid(t, s.raw, s.md)
	if r.err != nil {
		return nil, nil, r.err
	}
	return t.Fluid, t.Z, nil
}

func (s *Study) tuneCount() int {
	if s.Tune == nil {
		return 0
	}
	return len(s.Tune.Parameters)
}

// PlusMolarMass is the molar mass of the plus fraction as the study gives
// it, kg/mol; 0 without one.
func (s *Study) PlusMolarMass() float64 { return s.plusM }

// Components lists the indices, in the fluid, of the components name stands
// for: a component or pseudo-component itself, or every pseudo-component
// of the plus fraction; nil for an unknown name.
func (s *Study) Components(name string) []int { return append([]int(nil), s.groups[name]...) }
