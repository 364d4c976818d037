package study

import (
	"fmt"
	"math"
	"reflect"
	"regexp"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"dewcell/uncertain"
)

// The [uncertainty] section: the probabilistic run of the whole workflow.
//
//	[uncertainty]
//	cases = 1000                       1 to MaxCases
//	seed = 20261202                    optional, 0 or more (default 1)
//	sampling = "latin-hypercube"       or "monte-carlo" (default latin-hypercube)
//	[uncertainty.vary]                 any numeric key of the study by its dotted path
//	"reservoir.area" = { distribution = "triangular", min = "2600 acre", mode = "3150 acre", max = "3700 acre" }
//	"scenario.cycling.sweep_efficiency" = { distribution = "uniform", min = 0.5, max = 0.85 }
//	[[uncertainty.correlate]]
//	between = ["reservoir.porosity", "reservoir.water_saturation"]
//	rank_correlation = -0.6
//
// A path names a key the study file gives a number or a quantity with its
// unit; "scenario.NAME.key" is the key of the [[scenario]] named NAME, and
// another array of tables is indexed from 1 ("economics.capex.2.amount").
// The values of one input share its unit: each is read as a number and a
// unit text ("2600 acre"), the number sampled, and a case's value written
// back as "<number> <unit>", so that the study reader converts and checks
// it as it does every value of the file.

// MaxCases bounds uncertainty.cases.
const MaxCases = 100_000

// DefaultSeed is the seed of an [uncertainty] without one.
const DefaultSeed = 1

// The sampling designs of uncertainty.sampling.
const (
	LatinHypercube = "latin-hypercube"
	MonteCarlo     = "monte-carlo"
)

// The distributions of an uncertain input.
const (
	DistUniform    = "uniform"
	DistTriangular = "triangular"
	DistNormal     = "normal"
	DistLognormal  = "lognormal"
	DistDiscrete   = "discrete"
)

// Uncertainty holds [uncertainty].
type Uncertainty struct {
	Cases    int
	Seed     uint64
	Sampling string // LatinHypercube or MonteCarlo
	// Inputs are the entries of [uncertainty.vary] in file order.
	Inputs []Input
	// Correlations are the [[uncertainty.correlate]] entries.
	Correlations []Correlation
}

// An Input is one uncertain key of the study.
type Input struct {
	Path string // the dotted path as written: "reservoir.area"
	Key  string // the key of its entry, for messages: uncertainty.vary."reservoir.area"
	// Unit is the unit text its values carry ("acre"); "" for bare
	// numbers.
	Unit string
	Kind string // DistUniform, …
	// Dist is the distribution of the number in Unit.
	Dist uncertain.Distribution
	// integer: the study gives the key as a whole number (such as
	// scenario cells), so whole values are written back as integers.
	integer bool
	pieces  []string
}

// A Correlation is the rank correlation asked between inputs I and J
// (indices into Uncertainty.Inputs).
type Correlation struct {
	I, J int
	Rho  float64
	Key  string // uncertainty.correlate[n], for messages
}

// Value returns the text of a value of the input as the study file would
// give it: "2987.5 acre", or the bare number.
func (in Input) Value(x float64) string {
	s := strconv.FormatFloat(x, 'g', -1, 64)
	if in.Unit == "" {
		return s
	}
	return s + " " + in.Unit
}

type fileUncertainty struct {
	Cases     value                    `toml:"cases"`
	Seed      value                    `toml:"seed"`
	Sampling  value                    `toml:"sampling"`
	Vary      map[string]*fileVary     `toml:"vary"`
	Correlate []fileUncertainCorrelate `toml:"correlate"`
}

type fileVary struct {
	Distribution  value `toml:"distribution"`
	Min           value `toml:"min"`
	Mode          value `toml:"mode"`
	Max           value `toml:"max"`
	Mean          value `toml:"mean"`
	SD            value `toml:"sd"`
	Median        value `toml:"median"`
	P90Ratio      value `toml:"p90_ratio"`
	Values        value `toml:"values"`
	Probabilities value `toml:"probabilities"`
}

type fileUncertainCorrelate struct {
	Between         value `toml:"between"`
	RankCorrelation value `toml:"rank_correlation"`
}

// distKeys are the parameters of each distribution (besides
// "distribution"), the required ones first.
var distKeys = map[string]struct{ required, optional []string }{
	DistUniform:    {[]string{"min", "max"}, nil},
	DistTriangular: {[]string{"min", "mode", "max"}, nil},
	DistNormal:     {[]string{"mean", "sd"}, []string{"min", "max"}},
	DistLognormal:  {[]string{"median", "p90_ratio"}, []string{"min", "max"}},
	DistDiscrete:   {[]string{"values", "probabilities"}, nil},
}

// quantityText splits "2600 acre" into its number and unit text.
var quantityText = regexp.MustCompile(`^\s*([-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?)\s*(.*?)\s*$`)

// splitPath splits a dotted path into its keys; a key in double quotes may
// hold dots ("scenario.\"a.b\".sweep_efficiency").
func splitPath(p string) ([]string, bool) {
	var out []string
	var cur strings.Builder
	quoted, wasQuoted := false, false
	for _, r := range p {
		switch {
		case r == '"':
			quoted, wasQuoted = !quoted, true
		case r == '.' && !quoted:
			if cur.Len() == 0 && !wasQuoted {
				return nil, false
			}
			out = append(out, cur.String())
			cur.Reset()
			wasQuoted = false
		default:
			cur.WriteRune(r)
		}
	}
	if quoted || cur.Len() == 0 && !wasQuoted {
		return nil, false
	}
	return append(out, cur.String()), true
}

var valueType = reflect.TypeOf(value{})

// locate finds the value the path names in the decoded file f and, when
// set is not nil, replaces it by *set. It returns the value found, or a
// message saying why the path names none.
func locate(f *fileStudy, pieces []string, set *value) (value, string) {
	v := reflect.ValueOf(f).Elem()
	for i, p := range pieces {
		at := key(pieces[:i+1]...)
		for v.Kind() == reflect.Pointer {
			if v.IsNil() {
				return value{}, fmt.Sprintf("the study has no [%s]", key(pieces[:i]...))
			}
			v = v.Elem()
		}
		switch v.Kind() {
		case reflect.Struct:
			if v.Type() == valueType {
				return value{}, fmt.Sprintf("%s is a single value: nothing lies under it", key(pieces[:i]...))
			}
			sf, ok := fieldByTag(v.Type(), p)
			if !ok {
				var names []string
				for j := 0; j < v.Type().NumField(); j++ {
					names = append(names, v.Type().Field(j).Tag.Get("toml"))
				}
				return value{}, fmt.Sprintf("%s is not a key of the study; keys allowed here: %s", at, strings.Join(names, ", "))
			}
			v = v.FieldByIndex(sf.Index)
		case reflect.Map:
			k := reflect.ValueOf(p)
			mv := v.MapIndex(k)
			if !mv.IsValid() {
				return value{}, fmt.Sprintf("the study gives no %s: give it in the study first", at)
			}
			if v.Type().Elem() == valueType {
				if i != len(pieces)-1 {
					return value{}, fmt.Sprintf("%s is a single value: nothing lies under it", at)
				}
				if set != nil {
					v.SetMapIndex(k, reflect.ValueOf(*set))
				}
				return mv.Interface().(value), ""
			}
			v = mv
		case reflect.Slice:
			j := -1
			for e := 0; e < v.Len() && j < 0; e++ {
				el := v.Index(e)
				if el.Kind() != reflect.Struct {
					break
				}
				if nf, ok := fieldByTag(el.Type(), "name"); ok {
					if name, _ := el.FieldByIndex(nf.Index).Interface().(value).raw.(string); name == p {
						j = e
					}
				}
			}
			if n, err := strconv.Atoi(p); j < 0 && err == nil && n >= 1 && n <= v.Len() {
				j = n - 1
			}
			if j < 0 {
				if et := v.Type().Elem(); et.Kind() == reflect.Struct && hasName(et) {
					return value{}, fmt.Sprintf("no [[%s]] is named %q (and %q is not its number, 1 to %d)", key(pieces[:i]...), p, p, v.Len())
				}
				return value{}, fmt.Sprintf("%q is not the number of one of the %d [[%s]] (1 to %d)", p, v.Len(), key(pieces[:i]...), v.Len())
			}
			v = v.Index(j)
		default:
			return value{}, fmt.Sprintf("%s cannot be reached", at)
		}
	}
	for v.Kind() == reflect.Pointer && !v.IsNil() {
		v = v.Elem()
	}
	if v.Type() != valueType {
		return value{}, fmt.Sprintf("%s is a section, not a value: name one of its keys", key(pieces...))
	}
	found := v.Interface().(value)
	if set != nil {
		v.Set(reflect.ValueOf(*set))
	}
	return found, ""
}

// hasName says whether the tables of an array have a name key.
func hasName(t reflect.Type) bool {
	_, ok := fieldByTag(t, "name")
	return ok
}

// paramOf is one parameter of a distribution: its number and unit text.
type paramOf struct {
	x    float64
	unit string
	bare bool
}

// uncertainty reads [uncertainty]; f is the whole decoded file, whose keys
// the paths of [uncertainty.vary] name.
func (r *reader) uncertainty(s *Study, f *fileStudy, md toml.MetaData) {
	u := f.Uncertainty
	if u == nil {
		return
	}
	out := &Uncertainty{Seed: DefaultSeed, Sampling: LatinHypercube}
	if !u.Cases.set {
		r.missing("uncertainty.cases", fmt.Sprintf("the number of cases to run, a whole number from 1 to %d, such as 1000", MaxCases))
		return
	}
	if n, ok := r.integer("uncertainty.cases", u.Cases, "the number of cases", 1, MaxCases); ok {
		out.Cases = n
	}
	if u.Seed.set {
		if n, ok := r.integer("uncertainty.seed", u.Seed, "the seed of the random streams", 0, math.MaxInt64); ok {
			out.Seed = uint64(n)
		}
	}
	out.Sampling = r.choice("uncertainty.sampling", u.Sampling, LatinHypercube, LatinHypercube, MonteCarlo)
	if r.err != nil {
		return
	}
	if len(u.Vary) == 0 {
		r.missing("uncertainty.vary", `at least one uncertain input, such as "reservoir.porosity" = { distribution = "normal", mean = 0.16, sd = 0.015 }`)
		return
	}
	index := map[string]int{}
	for _, path := range tableOrder(md, "uncertainty", "vary") {
		fv := u.Vary[path]
		k := key("uncertainty", "vary", path)
		if fv == nil {
			r.failf(k, `want a table such as { distribution = "uniform", min = 0.1, max = 0.2 }`)
			return
		}
		in, ok := r.uncertainInput(f, k, path, fv)
		if !ok {
			return
		}
		index[path] = len(out.Inputs)
		out.Inputs = append(out.Inputs, in)
	}
	seen := map[[2]int]bool{}
	for i, c := range u.Correlate {
		k := fmt.Sprintf("uncertainty.correlate[%d]", i+1)
		if !c.Between.set {
			r.missing(k+".between", `the two inputs, such as between = ["reservoir.porosity", "reservoir.water_saturation"]`)
			return
		}
		list, isList := c.Between.raw.([]any)
		if !isList || len(list) != 2 {
			r.failf(k+".between", `%s was given; want the paths of two inputs of [uncertainty.vary], such as ["reservoir.porosity", "reservoir.water_saturation"]`, describe(c.Between.raw))
			return
		}
		var ij [2]int
		for n, item := range list {
			p, isText := item.(string)
			j, known := index[p]
			switch {
			case !isText:
				r.failf(k+".between", "%s was given; want the path of an input of [uncertainty.vary], as a string", describe(item))
				return
			case !known:
				r.failf(k+".between", "%q is not an input of [uncertainty.vary]: give it a distribution there, or correlate inputs that have one", p)
				return
			}
			ij[n] = j
		}
		if ij[0] == ij[1] {
			r.failf(k+".between", "names %q twice; want two different inputs", list[0])
			return
		}
		if ij[0] > ij[1] {
			ij[0], ij[1] = ij[1], ij[0]
		}
		if seen[ij] {
			r.failf(k+".between", "correlates %q and %q again; give each pair once", out.Inputs[ij[0]].Path, out.Inputs[ij[1]].Path)
			return
		}
		seen[ij] = true
		rho, ok := r.between(k+".rank_correlation", c.RankCorrelation, "the rank correlation of the two inputs", true, -1, 1, true, true)
		if !ok {
			return
		}
		out.Correlations = append(out.Correlations, Correlation{I: ij[0], J: ij[1], Rho: rho, Key: k})
	}
	if len(out.Correlations) > 0 && out.Cases <= len(out.Inputs) {
		r.failf("uncertainty.cases", "%d cases for %d correlated inputs: rank correlations need more cases than inputs; ask for at least %d", out.Cases, len(out.Inputs), len(out.Inputs)+1)
		return
	}
	s.Uncertainty = out
}

// uncertainInput reads the distribution of the input at path.
func (r *reader) uncertainInput(f *fileStudy, k, path string, fv *fileVary) (Input, bool) {
	in := Input{Path: path, Key: k}
	pieces, ok := splitPath(path)
	if !ok {
		r.failf(k, "%q is not a dotted path of a study key; want such as \"reservoir.porosity\" or \"scenario.cycling.sweep_efficiency\"", path)
		return in, false
	}
	if pieces[0] == "uncertainty" {
		r.failf(k, "the [uncertainty] section itself cannot vary; name a key of the study, such as \"reservoir.porosity\"")
		return in, false
	}
	in.pieces = pieces
	orig, why := locate(f, pieces, nil)
	if why != "" {
		r.failf(k, "%s", why)
		return in, false
	}
	if !orig.set {
		r.failf(k, "the study does not give %s: give it a value there first, which the cases then vary", path)
		return in, false
	}
	var origBare bool
	switch x := orig.raw.(type) {
	case int64:
		origBare, in.integer = true, true
	case float64:
		origBare = true
	case string:
		if m := quantityText.FindStringSubmatch(x); m == nil || m[2] == "" {
			r.failf(k, "%s is %s in the study, not a number or a quantity: only numeric keys can vary", path, describe(x))
			return in, false
		}
	default:
		r.failf(k, "%s is %s in the study, not a number or a quantity: only numeric keys can vary", path, describe(orig.raw))
		return in, false
	}
	in.Kind = r.choice(k+".distribution", fv.Distribution, "", DistUniform, DistTriangular, DistNormal, DistLognormal, DistDiscrete)
	if r.err != nil {
		return in, false
	}
	if !fv.Distribution.set {
		r.missing(k+".distribution", "one of "+quoteAll([]string{DistUniform, DistTriangular, DistNormal, DistLognormal, DistDiscrete}))
		return in, false
	}
	given := map[string]value{"min": fv.Min, "mode": fv.Mode, "max": fv.Max, "mean": fv.Mean, "sd": fv.SD, "median": fv.Median,
		"p90_ratio": fv.P90Ratio, "values": fv.Values, "probabilities": fv.Probabilities}
	spec := distKeys[in.Kind]
	allowed := append(append([]string(nil), spec.required...), spec.optional...)
	for _, name := range []string{"min", "mode", "max", "mean", "sd", "median", "p90_ratio", "values", "probabilities"} {
		if !given[name].set {
			continue
		}
		isAllowed := false
		for _, a := range allowed {
			isAllowed = isAllowed || a == name
		}
		if !isAllowed {
			r.failf(k+"."+name, "is not a parameter of a %s distribution; its parameters: %s", in.Kind, strings.Join(allowed, ", "))
			return in, false
		}
	}
	for _, name := range spec.required {
		if !given[name].set {
			r.missing(k+"."+name, fmt.Sprintf("the %s of the %s distribution (it takes %s)", name, in.Kind, strings.Join(allowed, ", ")))
			return in, false
		}
	}
	unitSet := false
	// param reads a value of the input: a bare number, or a quantity in
	// the input's one unit.
	param := func(pk string, raw any) (float64, bool) {
		var p paramOf
		switch x := raw.(type) {
		case int64:
			p = paramOf{x: float64(x), bare: true}
		case float64:
			if math.IsNaN(x) || math.IsInf(x, 0) {
				r.failf(pk, "%v is not a finite number", x)
				return 0, false
			}
			p = paramOf{x: x, bare: true}
		case string:
			m := quantityText.FindStringSubmatch(x)
			if m == nil {
				r.failf(pk, "%q is not a number with a unit; want such as %s", x, exampleOf(orig))
				return 0, false
			}
			v, err := strconv.ParseFloat(m[1], 64)
			if err != nil || math.IsInf(v, 0) {
				r.failf(pk, "%s is not a finite number", m[1])
				return 0, false
			}
			p = paramOf{x: v, unit: strings.Join(strings.Fields(m[2]), " "), bare: m[2] == ""}
		default:
			r.failf(pk, "%s was given; want a number or a quantity with its unit, such as %s", describe(raw), exampleOf(orig))
			return 0, false
		}
		switch {
		case p.bare && !origBare:
			r.failf(pk, "%v has no unit, but the study gives %s as %q: give the value with a unit too, such as %s", p.x, path, orig.raw, exampleOf(orig))
			return 0, false
		case !p.bare && origBare:
			r.failf(pk, "%q has a unit, but the study gives %s as the bare number %v: give a bare number too", raw, path, orig.raw)
			return 0, false
		case !p.bare && unitSet && p.unit != in.Unit:
			r.failf(pk, "%q is in %s, the input's other values in %s: give every value of one input in the same unit", raw, p.unit, in.Unit)
			return 0, false
		}
		if !p.bare {
			in.Unit, unitSet = p.unit, true
		}
		return p.x, true
	}
	num := func(name string) (float64, bool) {
		v := given[name]
		if !v.set {
			return math.NaN(), true
		}
		return param(k+"."+name, v.raw)
	}
	var d uncertain.Distribution
	switch in.Kind {
	case DistUniform:
		lo, ok1 := num("min")
		hi, ok2 := num("max")
		if !ok1 || !ok2 {
			return in, false
		}
		if hi < lo {
			r.failf(k+".max", "%v is below min %v: want min ≤ max (equal for a fixed value)", hi, lo)
			return in, false
		}
		d = uncertain.Uniform{Min: lo, Max: hi}
	case DistTriangular:
		lo, ok1 := num("min")
		mode, ok2 := num("mode")
		hi, ok3 := num("max")
		if !ok1 || !ok2 || !ok3 {
			return in, false
		}
		switch {
		case mode < lo:
			r.failf(k+".mode", "%v is below min %v: want min ≤ mode ≤ max", mode, lo)
			return in, false
		case mode > hi:
			r.failf(k+".mode", "%v is above max %v: want min ≤ mode ≤ max", mode, hi)
			return in, false
		}
		d = uncertain.Triangular{Min: lo, Mode: mode, Max: hi}
	case DistNormal, DistLognormal:
		lo, ok1 := num("min")
		hi, ok2 := num("max")
		if !ok1 || !ok2 {
			return in, false
		}
		if in.Kind == DistNormal {
			mean, ok3 := num("mean")
			sd, ok4 := num("sd")
			if !ok3 || !ok4 {
				return in, false
			}
			if sd < 0 {
				r.failf(k+".sd", "%v is negative: want a standard deviation of 0 (a fixed value) or more", sd)
				return in, false
			}
			if math.IsNaN(lo) {
				lo = math.Inf(-1)
			}
			if math.IsNaN(hi) {
				hi = math.Inf(1)
			}
			d = uncertain.NewNormal(mean, sd).Truncated(lo, hi)
		} else {
			median, ok3 := num("median")
			if !ok3 {
				return in, false
			}
			ratio, ok4 := r.between(k+".p90_ratio", fv.P90Ratio, "the P90 over the median (a bare number above 0 and at most 1; 1 for a fixed value)", true, 0, 1, true, false)
			if !ok4 {
				return in, false
			}
			if !(median > 0) {
				r.failf(k+".median", "%v: want a median above 0 (a lognormal value is positive)", median)
				return in, false
			}
			if math.IsNaN(lo) {
				lo = 0
			}
			if math.IsNaN(hi) {
				hi = math.Inf(1)
			}
			if lo < 0 {
				r.failf(k+".min", "%v is negative: a lognormal value is positive; want a min of 0 or more", lo)
				return in, false
			}
			ln := uncertain.Lognormal{Median: median, Sigma: -math.Log(ratio) / uncertain.Z90}
			d = ln.Truncated(lo, hi)
		}
		if err := d.Validate(); err != nil {
			r.failf(k, "%s", strings.TrimPrefix(err.Error(), uncertain.ErrBadDistribution.Error()+": "))
			return in, false
		}
	case DistDiscrete:
		vals, ok1 := r.uncertainList(k+".values", fv.Values, param)
		probs, ok2 := r.uncertainList(k+".probabilities", fv.Probabilities, func(pk string, raw any) (float64, bool) {
			return r.number(pk, value{set: true, raw: raw}, "a probability (a bare number above 0)", true)
		})
		if !ok1 || !ok2 {
			return in, false
		}
		if len(vals) != len(probs) {
			r.failf(k+".probabilities", "%d probabilities for %d values: give one probability per value", len(probs), len(vals))
			return in, false
		}
		d = uncertain.Discrete{Values: vals, Probs: probs}
	}
	if err := d.Validate(); err != nil {
		r.failf(k, "%s", strings.TrimPrefix(err.Error(), uncertain.ErrBadDistribution.Error()+": "))
		return in, false
	}
	in.Dist = d
	return in, true
}

// uncertainList reads a non-empty array of values, each by read.
func (r *reader) uncertainList(k string, v value, read func(string, any) (float64, bool)) ([]float64, bool) {
	list, isList := v.raw.([]any)
	if !isList || len(list) == 0 {
		r.failf(k, "%s was given; want a non-empty list, such as [4, 6, 8]", describe(v.raw))
		return nil, false
	}
	out := make([]float64, len(list))
	for i, item := range list {
		x, ok := read(fmt.Sprintf("%s[%d]", k, i+1), item)
		if !ok {
			return nil, false
		}
		out[i] = x
	}
	return out, true
}

// exampleOf is an example of a value like orig, for messages.
func exampleOf(orig value) string {
	if s, ok := orig.raw.(string); ok {
		return fmt.Sprintf("%q", s)
	}
	return fmt.Sprint(orig.raw)
}

// Case reads the study again with the value of each input of
// Uncertainty.Inputs set to x[i] (in the input's unit), as if the file gave
// it: every check and unit conversion of the reader applies. The case's
// own [uncertainty] is read too. It is an error to call Case on a study
// without [uncertainty] or with len(x) other than its number of inputs.
func (s *Study) Case(x []float64) (*Study, error) {
	u := s.Uncertainty
	switch {
	case u == nil:
		return nil, &Error{File: s.File, Key: "uncertainty", Msg: "the study has no [uncertainty]"}
	case len(x) != len(u.Inputs):
		return nil, &Error{File: s.File, Key: "uncertainty.vary", Msg: fmt.Sprintf("%d values for %d inputs", len(x), len(u.Inputs))}
	}
	return parseWith(s.fsys, s.File, s.source, func(f *fileStudy) error {
		for i, in := range u.Inputs {
			v := value{set: true, raw: x[i]}
			switch {
			case in.Unit != "":
				v.raw = in.Value(x[i])
			case in.integer && x[i] == math.Trunc(x[i]) && math.Abs(x[i]) < 1<<53:
				v.raw = int64(x[i])
			}
			if _, why := locate(f, in.pieces, &v); why != "" {
				return &Error{File: s.File, Key: in.Key, Msg: why}
			}
		}
		return nil
	})
}
