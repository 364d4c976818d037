package study

import (
	"fmt"
	"io/fs"
	"math"
	"reflect"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"

	"dewcell/cmd/dewcell/internal/units"
)

// The file as TOML gives it. Every leaf is a value, which accepts any TOML
// type, so that type mistakes are reported by reader, with the key and in
// words, and in the order of the file rather than the order of a Go map.
type fileStudy struct {
	Title     value          `toml:"title"`
	Reservoir *fileReservoir `toml:"reservoir"`
	Fluid     *fileFluid     `toml:"fluid"`
	Separator *fileSeparator `toml:"separator"`
	Depletion *fileDepletion `toml:"depletion"`
	Lab       *fileLab       `toml:"lab"`
	Standard  *fileStandard  `toml:"standard_conditions"`
	Surface   *fileSurface   `toml:"surface"`
	History   []fileHistory  `toml:"history"`
	RelPerm   *fileRelPerm   `toml:"relative_permeability"`
	Tune      *fileTune      `toml:"tune"`

	Wells      *fileWells      `toml:"wells"`
	Production *fileProduction `toml:"production"`
	Plant      *filePlant      `toml:"plant"`
	Economics  *fileEconomics  `toml:"economics"`
	Scenario   []fileScenario  `toml:"scenario"`

	Uncertainty *fileUncertainty `toml:"uncertainty"`
}

type fileTune struct {
	Parameter []fileTuneParameter `toml:"parameter"`
	Weights   map[string]value    `toml:"weights"`
}

type fileTuneParameter struct {
	Property  value `toml:"property"`
	Component value `toml:"component"`
	Pair      value `toml:"pair"`
	Min       value `toml:"min"`
	Max       value `toml:"max"`
}

type fileRelPerm struct {
	GasExponent        value `toml:"gas_exponent"`
	CondensateExponent value `toml:"condensate_exponent"`
	GasEndpoint        value `toml:"gas_endpoint"`
	CondensateEndpoint value `toml:"condensate_endpoint"`
}

type fileReservoir struct {
	Temperature          value `toml:"temperature"`
	InitialPressure      value `toml:"initial_pressure"`
	Area                 value `toml:"area"`
	NetThickness         value `toml:"net_thickness"`
	PoreVolume           value `toml:"pore_volume"`
	Porosity             value `toml:"porosity"`
	WaterSaturation      value `toml:"water_saturation"`
	AbandonmentPressure  value `toml:"abandonment_pressure"`
	CriticalCondensate   value `toml:"critical_condensate_saturation"`
	RockCompressibility  value `toml:"rock_compressibility"`
	WaterCompressibility value `toml:"water_compressibility"`
	WaterFVF             value `toml:"water_formation_volume_factor"`
}

type fileFluid struct {
	Equation    value                 `toml:"equation"`
	VolumeShift value                 `toml:"volume_shift"`
	KijA        value                 `toml:"hydrocarbon_kij_a"`
	KijB        value                 `toml:"hydrocarbon_kij_b"`
	Composition map[string]value      `toml:"composition"`
	Plus        *filePlus             `toml:"plus"`
	Properties  map[string]*fileProps `toml:"properties"`
	Interaction map[string]value      `toml:"interaction"`
}

type filePlus struct {
	Name             value `toml:"name"`
	MolarMass        value `toml:"molar_mass"`
	SpecificGravity  value `toml:"specific_gravity"`
	Split            value `toml:"split"`
	PseudoComponents value `toml:"pseudo_components"`
	Correlation      value `toml:"correlation"`
	Acentric         value `toml:"acentric"`
	GammaShape       value `toml:"gamma_shape"`
	MinimumMolarMass value `toml:"minimum_molar_mass"`
	FirstCarbon      value `toml:"first_carbon"`
}

type fileProps struct {
	MolarMass           value `toml:"molar_mass"`
	CriticalTemperature value `toml:"critical_temperature"`
	CriticalPressure    value `toml:"critical_pressure"`
	AcentricFactor      value `toml:"acentric_factor"`
	VolumeShift         value `toml:"volume_shift"`
	CriticalVolume      value `toml:"critical_volume"`
	BoilingPoint        value `toml:"boiling_point"`
	SpecificGravity     value `toml:"specific_gravity"`
}

type fileSeparator struct {
	Stage []fileStage `toml:"stage"`
}

type fileStage struct {
	Pressure    value `toml:"pressure"`
	Temperature value `toml:"temperature"`
}

type fileDepletion struct {
	Pressures value `toml:"pressures"`
}

type fileLab struct {
	Temperature        value `toml:"temperature"`
	SaturationPressure value `toml:"saturation_pressure"`
	CCE                value `toml:"cce"`
	CVD                value `toml:"cvd"`
}

type fileStandard struct {
	Temperature value `toml:"temperature"`
	Pressure    value `toml:"pressure"`
	Atmospheric value `toml:"atmospheric_pressure"`
}

// A value is one TOML value of any type, kept as decoded.
type value struct {
	set bool
	raw any
}

// UnmarshalTOML keeps whatever TOML gives; reader checks it.
func (v *value) UnmarshalTOML(d any) error {
	v.set, v.raw = true, d
	return nil
}

// tomlType names the TOML type of a decoded value, for messages.
func tomlType(d any) string {
	switch d.(type) {
	case string:
		return "string"
	case int64:
		return "integer"
	case float64:
		return "float"
	case bool:
		return "boolean"
	case []any:
		return "array"
	case map[string]any:
		return "table"
	case []map[string]any:
		return "array of tables"
	}
	return "date or time"
}

// key joins key pieces as TOML writes them: fluid.composition."C7+".
func key(pieces ...string) string { return toml.Key(pieces).String() }

// A reader checks values and keeps the first error.
type reader struct {
	// fsys holds the laboratory tables the study names, at paths relative
	// to its root; nil: they are files of the operating system.
	fsys fs.FS

	file     string
	err      error
	atm      float64 // Pa, for gauge pressures
	warnings []string
	adj      *adjustment // tuned values applied while the fluid is built; nil when reading the file
	// shiftGiven holds the names in [fluid.properties] that give volume_shift.
	shiftGiven map[string]bool
	// rename, when set, gives the key an error names: the sections a
	// scenario overrides are read under the scenario's keys.
	rename func(string) string
}

func (r *reader) failf(k, format string, args ...any) {
	if r.rename != nil {
		k = r.rename(k)
	}
	if r.err == nil {
		r.err = &Error{File: r.file, Key: k, Msg: fmt.Sprintf(format, args...)}
	}
}

func (r *reader) missing(k, want string) {
	r.failf(k, "missing; want %s", want)
}

// quantity reads a string with a unit of kind kd, in SI. An absent optional
// value is 0 with ok false.
func (r *reader) quantity(k string, v value, kd units.Kind, required bool) (x float64, ok bool) {
	return r.quantityBy(units.Parse, k, v, kd, required)
}

// state reads the pressure or temperature of a fluid's state (reservoir,
// separator, standard conditions, history), which must lie within the range
// of units.ParseState.
func (r *reader) state(k string, v value, kd units.Kind, required bool) (x float64, ok bool) {
	return r.quantityBy(units.ParseState, k, v, kd, required)
}

func (r *reader) quantityBy(parse func(string, units.Kind, float64) (float64, error), k string, v value, kd units.Kind, required bool) (x float64, ok bool) {
	if !v.set {
		if required {
			r.missing(k, fmt.Sprintf("a %s such as %s", kd, kd.Examples()))
		}
		return 0, false
	}
	s, isString := v.raw.(string)
	if !isString {
		switch n := v.raw.(type) {
		case int64, float64:
			r.failf(k, "%v has no unit; write the %s as a string with its unit, such as %s", n, kd, kd.Examples())
		default:
			r.failf(k, "a %s was given; want a %s as a string with its unit, such as %s", tomlType(v.raw), kd, kd.Examples())
		}
		return 0, false
	}
	x, err := parse(s, kd, r.atm)
	if err != nil {
		r.failf(k, "%v", err)
		return 0, false
	}
	return x, true
}

// number reads a bare, finite number.
func (r *reader) number(k string, v value, what string, required bool) (x float64, ok bool) {
	if !v.set {
		if required {
			r.missing(k, what)
		}
		return 0, false
	}
	switch n := v.raw.(type) {
	case int64:
		return float64(n), true
	case float64:
		if math.IsNaN(n) || math.IsInf(n, 0) {
			r.failf(k, "%v is not a finite number; want %s", n, what)
			return 0, false
		}
		return n, true
	case string:
		r.failf(k, "the string %q was given; want %s as a bare number, without quotes or unit", n, what)
	default:
		r.failf(k, "a %s was given; want %s", tomlType(v.raw), what)
	}
	return 0, false
}

// between reads a number in [lo, hi] (or (lo, hi) ends when open is set).
func (r *reader) between(k string, v value, what string, required bool, lo, hi float64, loOpen, hiOpen bool) (float64, bool) {
	x, ok := r.number(k, v, what, required)
	if !ok {
		return 0, false
	}
	if x < lo || x > hi || loOpen && x == lo || hiOpen && x == hi {
		l, h := "[", "]"
		if loOpen {
			l = "("
		}
		if hiOpen {
			h = ")"
		}
		r.failf(k, "%v is out of range; want %s in %s%g, %g%s", x, what, l, lo, hi, h)
		return 0, false
	}
	return x, true
}

// integer reads a whole number in [lo, hi].
func (r *reader) integer(k string, v value, what string, lo, hi int64) (int, bool) {
	if !v.set {
		return 0, false
	}
	n, isInt := v.raw.(int64)
	if !isInt {
		r.failf(k, "%s was given; want %s, a whole number from %d to %d", describe(v.raw), what, lo, hi)
		return 0, false
	}
	if n < lo || n > hi {
		r.failf(k, "%d is out of range; want %s from %d to %d", n, what, lo, hi)
		return 0, false
	}
	return int(n), true
}

// choice reads a string from a fixed set.
func (r *reader) choice(k string, v value, def string, allowed ...string) string {
	if !v.set {
		return def
	}
	s, isString := v.raw.(string)
	if !isString {
		r.failf(k, "%s was given; want one of %s", describe(v.raw), quoteAll(allowed))
		return def
	}
	for _, a := range allowed {
		if s == a {
			return s
		}
	}
	r.failf(k, "unknown value %q; want one of %s", s, quoteAll(allowed))
	return def
}

// text reads a string.
func (r *reader) text(k string, v value, required bool) string {
	if !v.set {
		if required {
			r.missing(k, "a string")
		}
		return ""
	}
	s, isString := v.raw.(string)
	if !isString {
		r.failf(k, "%s was given; want a string", describe(v.raw))
	}
	return s
}

func (r *reader) boolean(k string, v value, def bool) bool {
	if !v.set {
		return def
	}
	b, isBool := v.raw.(bool)
	if !isBool {
		r.failf(k, "%s was given; want true or false", describe(v.raw))
		return def
	}
	return b
}

func describe(d any) string {
	switch d.(type) {
	case string, int64, float64, bool:
		return fmt.Sprintf("the %s %#v", tomlType(d), d)
	}
	return "a " + tomlType(d)
}

func quoteAll(s []string) string {
	q := make([]string, len(s))
	for i, v := range s {
		q[i] = fmt.Sprintf("%q", v)
	}
	return strings.Join(q, ", ")
}

// checkKeys reports the first key of md that the study format does not have.
// BurntSushi/toml decodes a key into a field whose name matches it without
// regard to case, so besides MetaData.Undecoded every key is compared,
// case-sensitively, with the toml tags of fileStudy.
func (r *reader) checkKeys(md toml.MetaData) {
	if u := md.Undecoded(); len(u) > 0 {
		r.unknownKey(u[0])
		return
	}
	for _, k := range md.Keys() {
		t := reflect.TypeOf(fileStudy{})
		for i, piece := range k {
			for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice {
				t = t.Elem()
			}
			if t.Kind() == reflect.Map {
				t = t.Elem()
				continue
			}
			if t.Kind() != reflect.Struct || t == reflect.TypeOf(value{}) {
				break // inside a value: an inline table or array, reported by reader
			}
			f, ok := fieldByTag(t, piece)
			if !ok {
				r.unknownKey(k[:i+1])
				return
			}
			t = f.Type
		}
	}
}

func (r *reader) unknownKey(k toml.Key) {
	known := knownKeys(k[:len(k)-1])
	if len(known) == 0 {
		r.failf(k.String(), "unknown key")
		return
	}
	r.failf(k.String(), "unknown key; keys allowed here: %s", strings.Join(known, ", "))
}

func fieldByTag(t reflect.Type, tag string) (reflect.StructField, bool) {
	for i := 0; i < t.NumField(); i++ {
		if f := t.Field(i); f.Tag.Get("toml") == tag {
			return f, true
		}
	}
	return reflect.StructField{}, false
}

// knownKeys lists the keys allowed inside table k.
func knownKeys(k toml.Key) []string {
	t := reflect.TypeOf(fileStudy{})
	for _, piece := range k {
		for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice {
			t = t.Elem()
		}
		switch {
		case t.Kind() == reflect.Map:
			t = t.Elem()
		case t.Kind() == reflect.Struct && t != reflect.TypeOf(value{}):
			f, ok := fieldByTag(t, piece)
			if !ok {
				return nil
			}
			t = f.Type
		default:
			return nil
		}
	}
	for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice {
		t = t.Elem()
	}
	if t.Kind() != reflect.Struct || t == reflect.TypeOf(value{}) {
		return nil
	}
	var names []string
	for i := 0; i < t.NumField(); i++ {
		names = append(names, t.Field(i).Tag.Get("toml"))
	}
	sort.Strings(names)
	return names
}
