package study

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"strings"

	"github.com/BurntSushi/toml"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/eos"
)

// A Study is one checked case. Every quantity is SI: K, Pa, m, m², m³, 1/Pa.
type Study struct {
	File  string // the file name as given to Read or Parse
	Title string

	Reservoir Reservoir

	Fluid *eos.Fluid
	Z     []float64 // feed mole fractions in the order of Fluid's components; they sum to 1
	// Estimates say, per component of Fluid, how the properties the file
	// does not give were obtained ("" when it gives them all, or the
	// library does): a user component's critical volume, the
	// pseudo-components' correlations.
	Estimates []string

	Separator []Stage   // in order, the stock tank (standard conditions) follows the last
	Depletion []float64 // depletion pressures, Pa, falling; nil when not given

	Lab Lab
	// specs are the entries of [fluid.composition], each with the model
	// components it became; the laboratory tables name components by them.
	specs []spec

	// Surface holds the separator data of [surface]; nil when not given.
	Surface *Surface
	// History holds the [[history]] rows in file order; nil when not given.
	History []HistoryRow
	// RelPerm holds [relative_permeability]; a value not given is 0 (the
	// default).
	RelPerm RelPerm

	// Atmospheric is the atmospheric pressure, Pa, that converts gauge
	// pressures (1 atm unless the study sets one).
	Atmospheric float64

	// Tune holds [[tune.parameter]] and [tune.weights]; nil when not given.
	Tune *Tune

	// Wells, Production, Plant and Economics hold the sections of the
	// production forecast; each nil when not given.
	Wells      *Wells
	Production *Production
	Plant      *Plant
	Economics  *Economics
	// Scenarios are the [[scenario]] tables in file order; nil when none.
	Scenarios []Scenario

	// Uncertainty holds [uncertainty], the probabilistic run; nil when not
	// given.
	Uncertainty *Uncertainty
	// source and fsys are the file's text and the file system of its
	// tables (nil: the operating system's), from which Case reads it again.
	source []byte
	fsys   fs.FS

	standard    units.Conditions
	standardSet [2]bool // temperature, pressure given

	// What rebuilding the fluid with tuned values needs (Tuned): the
	// [fluid] section as decoded, the file's key order, the names that
	// stand for components and the plus fraction's name and molar mass.
	raw      *fileFluid
	md       toml.MetaData
	groups   map[string][]int
	plusName string
	plusM    float64 // kg/mol

	// Warnings are remarks on accepted input (a composition normalised, ...).
	Warnings []string
}

// Reservoir holds the [reservoir] section. Optional values not given are 0.
type Reservoir struct {
	Temperature     float64 // K
	InitialPressure float64 // Pa

	Area         float64 // m²; with NetThickness, or PoreVolume alone
	NetThickness float64 // m
	PoreVolume   float64 // m³

	Porosity        float64
	WaterSaturation float64

	AbandonmentPressure          float64 // Pa
	CriticalCondensateSaturation float64
	RockCompressibility          float64 // 1/Pa
	WaterCompressibility         float64 // 1/Pa
	// WaterFVF is the water formation volume factor, reservoir volume per
	// volume at standard conditions; 0 when not given.
	WaterFVF float64
}

// RelPerm holds the Corey exponents and end points of the gas and
// condensate relative permeabilities.
type RelPerm struct {
	GasExponent, CondensateExponent float64
	GasEndpoint, CondensateEndpoint float64
}

// A Stage is one separator stage.
type Stage struct {
	Pressure    float64 // Pa
	Temperature float64 // K
}

// Lab holds the paths of the laboratory tables, resolved against the
// directory of the study file (paths of the operating system for Read and
// Parse, paths within the file system for ParseFS); empty when not given.
type Lab struct {
	CCE, CVD string
	// Report is the laboratory report the section describes, read from its
	// keys and tables, in SI; nil when the study has no [lab].
	Report *cvd.LabReport
}

// Error is a problem with a study file: the file, the key and what is wrong.
type Error struct {
	File string
	Key  string // dotted TOML key, e.g. fluid.composition.C1; empty for the whole file
	Msg  string
	Err  error // the underlying error, when another package reported it
}

func (e *Error) Error() string {
	if e.Key == "" {
		return fmt.Sprintf("%s: %s", e.File, e.Msg)
	}
	return fmt.Sprintf("%s: %s: %s", e.File, e.Key, e.Msg)
}

// Unwrap gives the underlying error, if any.
func (e *Error) Unwrap() error { return e.Err }

// StandardConditions returns the standard conditions of the study: those set
// in [standard_conditions], the others from the default of sys (60 degF and
// 14.696 psia for field units, 15 degC and 101.325 kPa for metric).
func (s *Study) StandardConditions(sys units.System) units.Conditions {
	c := sys.Standard()
	if s.standardSet[0] {
		c.T = s.standard.T
	}
	if s.standardSet[1] {
		c.P = s.standard.P
	}
	return c
}

// StockTank returns the conditions of the stock tank, the last stage of the
// separator train: those of [standard_conditions] where the study sets
// them, else 60 °F and 14.696 psia in either unit system, the conditions
// at which the stock-tank oil's gravity is defined, so that the oil (and its
// API gravity) does not depend on the output units.
func (s *Study) StockTank() units.Conditions {
	c := units.Field.Standard()
	if s.standardSet[0] {
		c.T = s.standard.T
	}
	if s.standardSet[1] {
		c.P = s.standard.P
	}
	return c
}

// Read reads and checks the study file at path and builds its fluid. The
// path must name a regular file (or a symbolic link to one): a named pipe,
// a device or a folder is refused before it is opened, since reading a pipe
// would wait for a writer.
func Read(path string) (*Study, error) {
	fail := func(err error) (*Study, error) {
		return nil, &Error{File: path, Msg: fmt.Sprintf("cannot read the study file: %v", pathCause(err)), Err: err}
	}
	fi, err := os.Stat(path)
	if err != nil {
		return fail(err)
	}
	if !fi.Mode().IsRegular() {
		return nil, &Error{File: path, Msg: fmt.Sprintf("is %s, not a regular file; give the path of a study file (TOML)", FileKind(fi.Mode()))}
	}
	f, err := os.Open(path)
	if err != nil {
		return fail(err)
	}
	defer f.Close()
	if fi, err = f.Stat(); err != nil {
		return fail(err)
	}
	if !fi.Mode().IsRegular() { // replaced since the check above
		return nil, &Error{File: path, Msg: fmt.Sprintf("is %s, not a regular file; give the path of a study file (TOML)", FileKind(fi.Mode()))}
	}
	data, err := io.ReadAll(f)
	if err != nil {
		return fail(err)
	}
	return Parse(path, data)
}

// ParseFS reads and checks the study file name of fsys, as Read does a
// file of the operating system, and reads the laboratory tables its [lab]
// names from fsys too: a relative path there is taken from the folder of
// name within fsys, and an absolute path, or one that leads out of fsys, is
// an error. Lab.CCE and Lab.CVD are then paths within fsys. A caller with
// the study in memory (an embedded example) gives its tables this way.
func ParseFS(fsys fs.FS, name string) (*Study, error) {
	fail := func(err error) (*Study, error) {
		return nil, &Error{File: name, Msg: fmt.Sprintf("cannot read the study file: %v", pathCause(err)), Err: err}
	}
	fi, err := fs.Stat(fsys, name)
	if err != nil {
		return fail(err)
	}
	if !fi.Mode().IsRegular() {
		return nil, &Error{File: name, Msg: fmt.Sprintf("is %s, not a regular file; give the path of a study file (TOML)", FileKind(fi.Mode()))}
	}
	data, err := fs.ReadFile(fsys, name)
	if err != nil {
		return fail(err)
	}
	return parse(fsys, name, data)
}

// pathCause is the reason of a file-system error without the operation and
// path it repeats ("no such file or directory" for "open x: no such file
// or directory").
func pathCause(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// FileKind names a kind of file that is not a regular one, for messages:
// "a folder", "a named pipe (FIFO)", "a symbolic link", ….
func FileKind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0:
		return "a device"
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	}
	return "a special file"
}

// Parse checks the study in data, read from the file called name (which
// names the file in errors and anchors the relative paths of [lab]), and
// builds its fluid. The laboratory tables of [lab] are read from the
// operating system's files. The error is an *Error, or wraps one.
func Parse(name string, data []byte) (*Study, error) {
	return parse(nil, name, data)
}

// parse is Parse with the laboratory tables read from fsys, or from the
// operating system's files when fsys is nil.
func parse(fsys fs.FS, name string, data []byte) (*Study, error) {
	return parseWith(fsys, name, data, nil)
}

// parseWith is parse with the decoded file changed by patch, when not nil,
// before it is read: Case sets the values of its inputs that way.
func parseWith(fsys fs.FS, name string, data []byte, patch func(*fileStudy) error) (*Study, error) {
	var f fileStudy
	md, err := toml.Decode(string(data), &f)
	if err != nil {
		return nil, decodeError(name, err)
	}
	if patch != nil {
		if err := patch(&f); err != nil {
			return nil, err
		}
	}
	r := &reader{file: name, atm: units.PaPerAtm, fsys: fsys}
	r.checkKeys(md)
	if r.err != nil {
		return nil, r.err
	}
	s := &Study{File: name, Atmospheric: units.PaPerAtm}
	s.Title = r.text("title", f.Title, false)
	r.standard(s, f.Standard)
	r.reservoir(s, f.Reservoir)
	r.fluid(s, f.Fluid, md)
	r.separator(s, f.Separator)
	r.depletion(s, f.Depletion)
	r.lab(s, f.Lab)
	r.surface(s, f.Surface)
	r.history(s, f.History)
	r.relPerm(s, f.RelPerm)
	s.raw, s.md = f.Fluid, md
	r.tune(s, f.Tune)
	r.wells(s, f.Wells)
	r.production(s, f.Production)
	r.plant(s, f.Plant, md)
	r.economics(s, f.Economics)
	r.scenarios(s, &f, f.Scenario, md)
	r.uncertainty(s, &f, md)
	if r.err != nil {
		return nil, r.err
	}
	s.source, s.fsys = data, fsys
	s.Warnings = r.warnings
	return s, nil
}

// decodeError restates a TOML syntax or structure error with the file name.
func decodeError(name string, err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		msg := fmt.Sprintf("line %d: %s", pe.Position.Line, pe.Message)
		return &Error{File: name, Key: pe.LastKey, Msg: msg, Err: err}
	}
	msg := strings.TrimPrefix(err.Error(), "toml: ")
	return &Error{File: name, Msg: "not a valid study file: " + msg, Err: err}
}

// tableOrder lists the keys directly inside table parent, in file order.
func tableOrder(md toml.MetaData, parent ...string) []string {
	var names []string
	seen := map[string]bool{}
next:
	for _, k := range md.Keys() {
		if len(k) <= len(parent) {
			continue
		}
		for i, p := range parent {
			if k[i] != p {
				continue next
			}
		}
		if name := k[len(parent)]; !seen[name] {
			seen[name] = true
			names = append(names, name)
		}
	}
	return names
}

func (r *reader) standard(s *Study, f *fileStandard) {
	if f == nil {
		return
	}
	r.atm = 0 // the atmospheric pressure itself cannot be a gauge value
	if p, ok := r.state("standard_conditions.atmospheric_pressure", f.Atmospheric, units.Pressure, false); ok {
		if p <= 0 {
			r.failf("standard_conditions.atmospheric_pressure", "must be above zero")
		}
		s.Atmospheric = p
	}
	r.atm = s.Atmospheric
	if t, ok := r.state("standard_conditions.temperature", f.Temperature, units.Temperature, false); ok {
		s.standard.T, s.standardSet[0] = t, true
	}
	if p, ok := r.state("standard_conditions.pressure", f.Pressure, units.Pressure, false); ok {
		if p <= 0 {
			r.failf("standard_conditions.pressure", "must be above zero")
		}
		s.standard.P, s.standardSet[1] = p, true
	}
}

// positivePressure reads the pressure of a state (units.ParseState).
func (r *reader) positivePressure(k string, v value, required bool) float64 {
	p, ok := r.state(k, v, units.Pressure, required)
	if ok && p <= 0 {
		r.failf(k, "must be above zero absolute pressure")
	}
	return p
}

func (r *reader) reservoir(s *Study, f *fileReservoir) {
	if f == nil {
		r.failf("reservoir", "missing section; at least [reservoir] temperature is needed")
		return
	}
	res := &s.Reservoir
	res.Temperature, _ = r.state("reservoir.temperature", f.Temperature, units.Temperature, true)
	res.InitialPressure = r.positivePressure("reservoir.initial_pressure", f.InitialPressure, false)
	res.AbandonmentPressure = r.positivePressure("reservoir.abandonment_pressure", f.AbandonmentPressure, false)
	if res.InitialPressure > 0 && res.AbandonmentPressure >= res.InitialPressure {
		r.failf("reservoir.abandonment_pressure", "must be below reservoir.initial_pressure")
	}

	positive := func(k string, v value, kd units.Kind) float64 {
		x, ok := r.quantity(k, v, kd, false)
		if ok && x <= 0 {
			r.failf(k, "must be above zero")
		}
		return x
	}
	res.Area = positive("reservoir.area", f.Area, units.Area)
	res.NetThickness = positive("reservoir.net_thickness", f.NetThickness, units.Length)
	res.PoreVolume = positive("reservoir.pore_volume", f.PoreVolume, units.Volume)
	switch {
	case f.PoreVolume.set && (f.Area.set || f.NetThickness.set):
		r.failf("reservoir.pore_volume", "give either pore_volume or area with net_thickness, not both")
	case f.Area.set && !f.NetThickness.set:
		r.missing("reservoir.net_thickness", `a length such as "85 ft", to go with reservoir.area`)
	case f.NetThickness.set && !f.Area.set:
		r.missing("reservoir.area", `an area such as "2400 acre", to go with reservoir.net_thickness`)
	}
	res.Porosity, _ = r.between("reservoir.porosity", f.Porosity, "a porosity (fraction)", false, 0, 1, true, true)
	res.WaterSaturation, _ = r.between("reservoir.water_saturation", f.WaterSaturation, "a water saturation (fraction)", false, 0, 1, false, true)
	res.CriticalCondensateSaturation, _ = r.between("reservoir.critical_condensate_saturation", f.CriticalCondensate,
		"a critical condensate saturation (fraction of pore volume)", false, 0, 1, false, true)
	if res.CriticalCondensateSaturation+res.WaterSaturation >= 1 {
		r.failf("reservoir.critical_condensate_saturation", "%g with water_saturation %g leaves no room for gas",
			res.CriticalCondensateSaturation, res.WaterSaturation)
	}
	res.RockCompressibility, _ = r.quantity("reservoir.rock_compressibility", f.RockCompressibility, units.Compressibility, false)
	res.WaterCompressibility, _ = r.quantity("reservoir.water_compressibility", f.WaterCompressibility, units.Compressibility, false)
	// a ratio of volumes, like reservoir barrels per stock-tank barrel; real
	// formation water lies within a few per cent of 1, and the range catches
	// a value in other units (common practice, no published source)
	res.WaterFVF, _ = r.between("reservoir.water_formation_volume_factor", f.WaterFVF,
		"a water formation volume factor (reservoir volume per volume at standard conditions, such as 1.02)", false, 0.8, 1.5, false, false)
}

func (r *reader) relPerm(s *Study, f *fileRelPerm) {
	if f == nil {
		return
	}
	k := &s.RelPerm
	k.GasExponent, _ = r.between("relative_permeability.gas_exponent", f.GasExponent, "a Corey exponent", false, 1, 10, false, false)
	k.CondensateExponent, _ = r.between("relative_permeability.condensate_exponent", f.CondensateExponent, "a Corey exponent", false, 1, 10, false, false)
	k.GasEndpoint, _ = r.between("relative_permeability.gas_endpoint", f.GasEndpoint, "an end-point relative permeability", false, 0, 1, true, false)
	k.CondensateEndpoint, _ = r.between("relative_permeability.condensate_endpoint", f.CondensateEndpoint, "an end-point relative permeability", false, 0, 1, true, false)
}

func (r *reader) separator(s *Study, f *fileSeparator) {
	if f == nil {
		return
	}
	for i, st := range f.Stage {
		k := fmt.Sprintf("separator.stage[%d]", i+1)
		p := r.positivePressure(k+".pressure", st.Pressure, true)
		t, _ := r.state(k+".temperature", st.Temperature, units.Temperature, true)
		if i > 0 && p >= s.Separator[i-1].Pressure && r.err == nil {
			r.failf(k+".pressure", "must be below the pressure of stage %d: the separator pressures fall along the train", i)
		}
		s.Separator = append(s.Separator, Stage{Pressure: p, Temperature: t})
	}
}

func (r *reader) depletion(s *Study, f *fileDepletion) {
	if f == nil {
		return
	}
	const k = "depletion.pressures"
	if !f.Pressures.set {
		r.missing(k, `a list of pressures such as ["5000 psia", "4000 psia"]`)
		return
	}
	list, ok := f.Pressures.raw.([]any)
	if !ok {
		r.failf(k, `%s was given; want a list of pressures such as ["5000 psia", "4000 psia"]`, describe(f.Pressures.raw))
		return
	}
	if len(list) == 0 {
		r.failf(k, "empty list; give the pressure steps or leave out [depletion]")
	}
	for i, item := range list {
		ki := fmt.Sprintf("%s[%d]", k, i+1)
		p := r.positivePressure(ki, value{set: true, raw: item}, true)
		if i > 0 && p >= s.Depletion[i-1] && r.err == nil {
			r.failf(ki, "must be below the pressure before it: depletion pressures fall")
		}
		s.Depletion = append(s.Depletion, p)
	}
}
