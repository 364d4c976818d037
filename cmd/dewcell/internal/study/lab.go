package study

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"

	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
)

// The laboratory report of [lab]: its keys and its CSV tables, read into a
// cvd.LabReport in SI.
//
// A table has one header row of column names, each with its unit in
// brackets ("pressure [psia]", "liquid_dropout [%]"), then one row per
// pressure. Names are case-insensitive; a name that starts with "note" is a
// column for people, and ignored; any other name the table does not know is
// an error. A blank cell is a value not measured (cvd.Missing).
//
// A problem with a table is an *Error naming the study file and the key of
// the table (lab.cvd), whose message starts with the table's path and the
// place in it:
//
//	case.toml: lab.cvd: lab/cvd.csv, row 3 (line 4), column 2 "liquid_dropout [%]": 104 is out of range; ...
//	case.toml: lab.cvd: lab/cvd.csv, header (line 1), column 7 "gas_C9 [mol%]": ...
//	case.toml: lab.cvd: lab/cvd.csv: empty file; ...
//
// Rows count from 1 after the header; lines are the file's, as an editor
// numbers them.

// labSumTolerance is how far, as a fraction, a laboratory composition that
// covers every component of the study may sum from 1 (0.5 mol %): reports
// round each of a dozen or more entries to 0.01 mol % and normalise their
// analyses differently (common practice, no published source).
const labSumTolerance = 0.005

// labSaturationTolerance is how far, relative, a CVD pressure may lie above
// lab.saturation_pressure and count as at it: only the rounding of two unit
// conversions of one pressure.
const labSaturationTolerance = 1e-12

func (r *reader) lab(s *Study, f *fileLab) {
	if f == nil {
		return
	}
	if !f.SaturationPressure.set && !f.CCE.set && !f.CVD.set {
		what := "empty section"
		if f.Temperature.set {
			what = "only the temperature is given"
		}
		r.failf("lab", `%s; [lab] holds the measured saturation_pressure (such as "4141 psia"), the laboratory tables cce and cvd `+
			`(CSV files, paths relative to the study file, such as "lab/cvd.csv") and the temperature of the experiments `+
			`(default: reservoir.temperature): give saturation_pressure, cce or cvd, or leave out [lab]`, what)
		return
	}
	rep := &cvd.LabReport{T: s.Reservoir.Temperature}
	if t, ok := r.state("lab.temperature", f.Temperature, units.Temperature, false); ok {
		rep.T = t
	}
	rep.SaturationP = r.positivePressure("lab.saturation_pressure", f.SaturationPressure, false)
	var cceData, cvdData []byte
	s.Lab.CCE, cceData = r.labFile("lab.cce", f.CCE)
	s.Lab.CVD, cvdData = r.labFile("lab.cvd", f.CVD)
	if r.err != nil {
		return
	}
	if s.Lab.CVD != "" {
		satText := ""
		if f.SaturationPressure.set {
			satText, _ = f.SaturationPressure.raw.(string)
		}
		rep.CVD = r.labCVD(s.Lab.CVD, cvdData, s.specs, rep, satText)
	}
	if s.Lab.CCE != "" && r.err == nil {
		rep.CCE = r.labCCE(s.Lab.CCE, cceData)
	}
	if r.err != nil {
		return
	}
	s.Lab.Report = rep
}

// labFile reads the table that key k names, and returns its path as
// messages show it (resolved against the study file's folder) and its
// content. A file of the operating system must be a regular file: a named
// pipe would make the reader wait for a writer.
func (r *reader) labFile(k string, v value) (string, []byte) {
	p := r.text(k, v, false)
	if !v.set || r.err != nil {
		return "", nil
	}
	if p == "" {
		r.failf(k, "empty path; want the path of a CSV file, relative to the study file")
		return "", nil
	}
	if r.fsys != nil {
		return r.labFileFS(k, p)
	}
	if !filepath.IsAbs(p) {
		p = filepath.Join(filepath.Dir(r.file), p)
	}
	notRegular := func(m fs.FileMode) {
		r.failf(k, "%s is %s, not a regular file; want a CSV file", p, FileKind(m))
	}
	fi, err := os.Stat(p)
	switch {
	case err != nil:
		r.failf(k, "cannot use %s: %v", p, pathCause(err))
		return "", nil
	case !fi.Mode().IsRegular():
		notRegular(fi.Mode())
		return "", nil
	}
	fh, err := os.Open(p)
	if err != nil {
		r.failf(k, "cannot use %s: %v", p, pathCause(err))
		return "", nil
	}
	defer fh.Close()
	if fi, err = fh.Stat(); err == nil && !fi.Mode().IsRegular() { // replaced since the check above
		notRegular(fi.Mode())
		return "", nil
	}
	data, err := io.ReadAll(fh)
	if err != nil {
		r.failf(k, "cannot read %s: %v", p, pathCause(err))
		return "", nil
	}
	return p, data
}

// labFileFS reads the table p of key k from r.fsys.
func (r *reader) labFileFS(k, p string) (string, []byte) {
	if path.IsAbs(p) || filepath.IsAbs(p) {
		r.failf(k, "%s is an absolute path, but the study was read with the files it comes with; give the table's path relative to the study file", p)
		return "", nil
	}
	full := path.Join(path.Dir(r.file), p)
	if !fs.ValidPath(full) {
		r.failf(k, "%s leads out of the files the study was read with; give the path of a table among them, relative to the study file", p)
		return "", nil
	}
	fi, err := fs.Stat(r.fsys, full)
	switch {
	case err != nil:
		r.failf(k, "cannot use %s: %v", full, pathCause(err))
		return "", nil
	case !fi.Mode().IsRegular():
		r.failf(k, "%s is %s, not a regular file; want a CSV file", full, FileKind(fi.Mode()))
		return "", nil
	}
	data, err := fs.ReadFile(r.fsys, full)
	if err != nil {
		r.failf(k, "cannot read %s: %v", full, pathCause(err))
		return "", nil
	}
	return full, data
}

// colKind is what a column of a laboratory table holds.
type colKind int

const (
	colNote     colKind = iota // for people; ignored
	colPressure                // a pressure, its unit in sym, read by units.ParseState
	colShare                   // a share, 0 to 1, given in % or as a fraction
	colPositive                // a bare number above 0 (a Z-factor, a relative volume)
	colQuantity                // a quantity with a unit of the units package
)

// A labColumn is one column of a laboratory table, as its header names it.
type labColumn struct {
	head string // the header cell as written
	// name is what the column measures, the same for two headers of one
	// quantity: "pressure", "gas_C1" (with the study's name of the
	// component); empty for a note.
	name string
	kind colKind
	what string     // the quantity in words, for messages: "a liquid dropout"
	sym  string     // colPressure: the unit symbol
	unit units.Unit // colShare: Percent or Fraction; colQuantity: the unit
	// shown is the unit as messages write it after a value ("%", "psia");
	// empty for a fraction or a bare number.
	shown string
	// zeroOK: a colQuantity may be 0 (a condensate-gas ratio), not only
	// above it.
	zeroOK bool
	// spec is, for a composition, the index in Study.specs of its component
	// and liquid whether it is of the liquid; -1 otherwise.
	spec   int
	liquid bool
	basis  cvd.LiquidBasis // the CCE's liquid volume
}

// A labTable is one laboratory table, read and converted: per row and
// column, the value in SI or cvd.Missing.
type labTable struct {
	r     *reader
	specs []spec // the study's components
	key   string // lab.cce or lab.cvd
	path  string // as messages show it
	head  int    // the header's line
	cols  []labColumn
	cells [][]string  // per row, the cells as written
	vals  [][]float64 // per row, per column
	lines []int       // per row, its line in the file
}

func (t *labTable) failf(format string, args ...any) {
	t.r.failf(t.key, "%s: %s", t.path, fmt.Sprintf(format, args...))
}

// colRef names column c for messages.
func (t *labTable) colRef(c int) string {
	if t.cols[c].head == "" {
		return fmt.Sprintf("column %d (no name)", c+1)
	}
	return fmt.Sprintf("column %d %q", c+1, t.cols[c].head)
}

// failHeader reports a problem with the header of column c.
func (t *labTable) failHeader(c int, format string, args ...any) {
	t.r.failf(t.key, "%s, header (line %d), %s: %s", t.path, t.head, t.colRef(c), fmt.Sprintf(format, args...))
}

// failCell reports a problem with row i (from 0) in column c, or with the
// whole row when c < 0.
func (t *labTable) failCell(i, c int, format string, args ...any) {
	where := fmt.Sprintf("%s, row %d (line %d)", t.path, i+1, t.lines[i])
	if c >= 0 {
		where += ", " + t.colRef(c)
	}
	t.r.failf(t.key, "%s: %s", where, fmt.Sprintf(format, args...))
}

// shown writes the cell of row i in column c with its unit, for messages.
func (t *labTable) shown(i, c int) string {
	if u := t.cols[c].shown; u != "" {
		return t.cells[i][c] + " " + u
	}
	return t.cells[i][c]
}

// find returns the index of the column that measures name, or -1.
func (t *labTable) find(name string) int {
	for c, col := range t.cols {
		if col.name == name {
			return c
		}
	}
	return -1
}

// labHeader matches a header cell: a name, then optionally a unit in
// brackets.
var labHeader = regexp.MustCompile(`^([^\[\]]*?)\s*(?:\[([^\[\]]*)\])?$`)

// labNumber is a number as a cell writes it: decimal, with an optional
// exponent (as units.Parse reads numbers).
var labNumber = regexp.MustCompile(`^[+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?$`)

// readLabTable reads the CSV table data of key k at path p: its header,
// whose cells column turns into columns (or says why it cannot), and its
// rows, every value converted to SI and checked against the range of its
// column. It returns nil after an error.
func (r *reader) readLabTable(k, p string, data []byte, specs []spec, example string, column func(name, unit string, bracket bool) (labColumn, string)) *labTable {
	t := &labTable{r: r, specs: specs, key: k, path: p}
	// Without the byte-order mark that spreadsheets write; the number of
	// cells is checked below, to name the row and line.
	cr := csv.NewReader(bytes.NewReader(bytes.TrimPrefix(data, []byte("\uFEFF"))))
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	var header []string
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				t.failf("line %d, character %d: not valid CSV: %v", pe.Line, pe.Column, pe.Err)
			} else {
				t.failf("not valid CSV: %v", err)
			}
			return nil
		}
		line, _ := cr.FieldPos(0)
		blank := true
		for i := range rec {
			rec[i] = strings.TrimSpace(rec[i])
			blank = blank && rec[i] == ""
		}
		if blank { // a line of empty cells, as spreadsheets leave below a table
			continue
		}
		if header == nil {
			header, t.head = rec, line
			continue
		}
		if len(rec) != len(header) {
			t.lines = append(t.lines, line)
			t.cols = make([]labColumn, len(header))
			t.failCell(len(t.lines)-1, -1, "%d cells, but the header has %d columns; give every row one cell per column (blank for a value not measured)", len(rec), len(header))
			return nil
		}
		t.cells = append(t.cells, rec)
		t.lines = append(t.lines, line)
	}
	if header == nil {
		t.failf("empty file; want a header row of column names with their units, such as %s, then a row per pressure", example)
		return nil
	}
	for c, h := range header {
		t.cols = append(t.cols, labColumn{head: h, spec: -1})
		m := labHeader.FindStringSubmatch(h)
		if m == nil {
			t.failHeader(c, `want a column name with its unit in brackets, such as "pressure [psia]"`)
			return nil
		}
		name := m[1]
		if name == "" {
			t.failHeader(c, "no column name; name every column (a column for people may be called note)")
			return nil
		}
		if strings.HasPrefix(strings.ToLower(name), "note") {
			continue
		}
		col, msg := column(name, strings.TrimSpace(m[2]), strings.Contains(h, "["))
		if msg != "" {
			t.failHeader(c, "%s", msg)
			return nil
		}
		col.head = h
		if d := t.find(col.name); d >= 0 {
			t.failHeader(c, "%s measures the same quantity as column %d %q; give each quantity once", col.name, d+1, header[d])
			return nil
		}
		t.cols[c] = col
	}
	if len(t.cells) == 0 {
		t.failf("the header (line %d) is followed by no rows; give a row per pressure", t.head)
		return nil
	}
	for i, row := range t.cells {
		vals := make([]float64, len(row))
		for c, cell := range row {
			v, msg := t.value(c, cell)
			if msg != "" {
				t.failCell(i, c, "%s", msg)
				return nil
			}
			vals[c] = v
		}
		t.vals = append(t.vals, vals)
	}
	return t
}

// value reads cell of column c in SI, or says what is wrong with it. A
// blank cell is cvd.Missing; so is any cell of a note.
func (t *labTable) value(c int, cell string) (float64, string) {
	col := t.cols[c]
	if cell == "" || col.kind == colNote {
		return cvd.Missing, ""
	}
	if !labNumber.MatchString(cell) {
		return 0, fmt.Sprintf("%q is not a number; want %s as a number in the column's unit, or a blank cell where it was not measured", cell, col.what)
	}
	if col.kind == colPressure {
		p, err := units.ParseState(cell+" "+col.sym, units.Pressure, t.r.atm)
		if err != nil {
			return 0, err.Error()
		}
		return p, ""
	}
	x, err := strconv.ParseFloat(cell, 64)
	if err == nil {
		x = col.unit.ToSI(x)
	}
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
		return 0, fmt.Sprintf("%s is too large: not a finite number", cell)
	}
	switch col.kind {
	case colShare:
		if x < 0 || x > 1 {
			hi := "1"
			if col.unit == units.Percent {
				hi = "100 %"
			}
			return 0, fmt.Sprintf("%s is out of range; want %s from 0 to %s", t.withUnit(c, cell), col.what, hi)
		}
	case colPositive:
		if x <= 0 {
			return 0, fmt.Sprintf("%s is out of range; want %s above 0", cell, col.what)
		}
	case colQuantity:
		if x < 0 || x == 0 && !col.zeroOK {
			bound := "above 0"
			if col.zeroOK {
				bound = "of 0 or more"
			}
			return 0, fmt.Sprintf("%s is out of range; want %s %s", t.withUnit(c, cell), col.what, bound)
		}
	}
	return x, ""
}

func (t *labTable) withUnit(c int, cell string) string {
	if u := t.cols[c].shown; u != "" {
		return cell + " " + u
	}
	return cell
}

// The units of the columns. Each returns the column's unit, or says why the
// header's cannot be read.

func pressureColumn(what, unit string, bracket bool) (labColumn, string) {
	col := labColumn{name: "pressure", kind: colPressure, what: what, spec: -1}
	accepted := strings.Join(units.Symbols(units.Pressure), ", ")
	if !bracket || unit == "" {
		return col, fmt.Sprintf(`the pressure needs its unit in brackets, such as "pressure [psia]"; one of %s`, accepted)
	}
	if unit == "psi" || unit == "bar" {
		return col, fmt.Sprintf("%sa or %sg? %q does not say whether the pressure is absolute or gauge; want one of %s", unit, unit, unit, accepted)
	}
	u, ok := units.Lookup(unit)
	switch {
	case !ok:
		return col, fmt.Sprintf("unknown pressure unit %q; want one of %s (units are case-sensitive)", unit, accepted)
	case u.Kind != units.Pressure:
		return col, fmt.Sprintf("%s is a unit of %s; want a pressure unit, one of %s", unit, u.Kind, accepted)
	}
	col.sym, col.shown = unit, unit
	return col, ""
}

// shareColumn reads the unit of a share: % or fraction, and for a
// composition also mol% and mol fraction.
func shareColumn(name, what, unit string, bracket, composition bool) (labColumn, string) {
	col := labColumn{name: name, kind: colShare, what: what, spec: -1}
	want := `[%] or [fraction]`
	if composition {
		want = `[mol%], [%] or [fraction]`
	}
	norm := strings.ToLower(strings.Join(strings.Fields(unit), ""))
	switch {
	case norm == "%" || composition && norm == "mol%":
		col.unit, col.shown = units.Percent, "%"
	case norm == "fraction" || composition && norm == "molfraction":
		col.unit = units.Fraction
	case !bracket || unit == "":
		return col, fmt.Sprintf("%s needs its unit in brackets: %s", what, want)
	default:
		return col, fmt.Sprintf("unknown unit %q for %s; want %s", unit, what, want)
	}
	return col, ""
}

// bareColumn is a column of a bare number above 0; also may name other
// spellings of its (lack of a) unit.
func bareColumn(name, what, unit string, also ...string) (labColumn, string) {
	col := labColumn{name: name, kind: colPositive, what: what, spec: -1}
	norm := strings.ToLower(strings.Join(strings.Fields(unit), ""))
	if norm == "" || norm == "-" {
		return col, ""
	}
	for _, a := range also {
		if norm == strings.ToLower(a) {
			return col, ""
		}
	}
	return col, fmt.Sprintf("%s is a bare number; write the column without a unit (as %s)", what, name)
}

// quantityColumn is a column with a unit of kind k.
func quantityColumn(name, what, unit string, k units.Kind, zeroOK bool, example string) (labColumn, string) {
	col := labColumn{name: name, kind: colQuantity, what: what, zeroOK: zeroOK, spec: -1}
	accepted := strings.Join(units.Symbols(k), ", ")
	if unit == "" {
		return col, fmt.Sprintf("%s needs its unit in brackets, such as %q; one of %s", what, example, accepted)
	}
	u, ok := units.Lookup(unit)
	switch {
	case !ok:
		return col, fmt.Sprintf("unknown unit %q for %s; want one of %s (units are case-sensitive)", unit, what, accepted)
	case u.Kind != k:
		return col, fmt.Sprintf("%s is a unit of %s; want a unit of %s, one of %s", unit, u.Kind, k, accepted)
	}
	col.unit, col.shown = u, unit
	return col, ""
}

// compositionColumn is the column of one component's mole fraction in the
// produced gas or the final liquid: rest is the header's name after "gas_"
// or "liquid_".
func compositionColumn(specs []spec, prefix, rest, unit string, bracket bool) (labColumn, string) {
	phase := "produced gas"
	if prefix == "liquid_" {
		phase = "liquid"
	}
	i, msg := labComponent(specs, rest)
	if msg != "" {
		return labColumn{}, msg
	}
	name := specs[i].name
	col, msg := shareColumn(prefix+name, fmt.Sprintf("the %s's mole fraction of %s", phase, name), unit, bracket, true)
	col.spec, col.liquid = i, prefix == "liquid_"
	return col, msg
}

// labComponent finds the component of the study that a table names: by its
// name as written, else without regard to case when only one matches.
func labComponent(specs []spec, name string) (int, string) {
	var fold []int
	for i, sp := range specs {
		if sp.name == name {
			return i, ""
		}
		if strings.EqualFold(sp.name, name) {
			fold = append(fold, i)
		}
	}
	names := make([]string, len(specs))
	for i, sp := range specs {
		names[i] = sp.name
	}
	switch len(fold) {
	case 1:
		return fold[0], ""
	case 0:
		return -1, fmt.Sprintf("%q is not a component of the study; the components of fluid.composition are %s", name, strings.Join(names, ", "))
	}
	amb := make([]string, len(fold))
	for j, i := range fold {
		amb[j] = specs[i].name
	}
	return -1, fmt.Sprintf("%q may be any of %s, which differ only in case; write the name as fluid.composition does", name, strings.Join(amb, ", "))
}

// labComponents lists the components of the composition columns of t (of
// the liquid or of the gas), in column order, with their columns.
func (t *labTable) labComponents(liquid bool) ([]cvd.LabComponent, []int) {
	var comps []cvd.LabComponent
	var cols []int
	for c, col := range t.cols {
		if col.spec < 0 || col.liquid != liquid {
			continue
		}
		sp := t.specs[col.spec]
		idx := make([]int, sp.count)
		for j := range idx {
			idx[j] = sp.first + j
		}
		comps = append(comps, cvd.LabComponent{Name: sp.name, Index: idx})
		cols = append(cols, c)
	}
	return comps, cols
}

// checkSum checks the composition of row i in columns cols: with a column
// for every component of the study and every cell given it must sum to 1
// within labSumTolerance; otherwise it cannot be summed, but may not exceed
// 1 by more than that.
func (t *labTable) checkSum(i int, cols []int, what string) {
	sum, blanks := 0.0, 0
	for _, c := range cols {
		if v := t.vals[i][c]; cvd.IsMissing(v) {
			blanks++
		} else {
			sum += v
		}
	}
	if blanks == len(cols) {
		return
	}
	pct := strconv.FormatFloat(100*sum, 'g', 6, 64)
	if len(cols) == len(t.specs) && blanks == 0 {
		if math.Abs(sum-1) > labSumTolerance {
			t.failCell(i, -1, "the %s sums to %s mol %%; want 100 within %g, since the columns cover every component of the study", what, pct, 100*labSumTolerance)
		}
		return
	}
	if sum > 1+labSumTolerance {
		t.failCell(i, -1, "the %s sums to %s mol %%, more than 100 (by more than %g) although its columns, or the cells given, cover only some of the study's components", what, pct, 100*labSumTolerance)
	}
}

// The columns of a CVD table, for messages.
const cvdColumns = "pressure, liquid_dropout, produced, z_gas, z_two_phase, gas_viscosity, cgr, gas_<component>, liquid_<component> and note… (ignored)"

// cvdColumn reads the header of one column of a CVD table.
func cvdColumn(specs []spec, name, unit string, bracket bool) (labColumn, string) {
	low := strings.ToLower(name)
	switch {
	case low == "pressure":
		return pressureColumn("a pressure", unit, bracket)
	case low == "liquid_dropout":
		return shareColumn(low, "a liquid dropout (liquid volume over the cell volume at the saturation pressure)", unit, bracket, false)
	case low == "produced":
		return shareColumn(low, "a cumulative production (moles produced over the moles charged)", unit, bracket, false)
	case low == "z_gas":
		return bareColumn(low, "a Z-factor of the gas", unit)
	case low == "z_two_phase":
		return bareColumn(low, "a two-phase Z-factor", unit)
	case low == "gas_viscosity":
		return quantityColumn(low, "a gas viscosity", unit, units.Viscosity, false, "gas_viscosity [cP]")
	case low == "cgr":
		return quantityColumn(low, "a condensate-gas ratio", unit, units.LiquidGasRatio, true, "cgr [STB/MMscf]")
	case strings.HasPrefix(low, "gas_"):
		return compositionColumn(specs, "gas_", name[len("gas_"):], unit, bracket)
	case strings.HasPrefix(low, "liquid_"):
		return compositionColumn(specs, "liquid_", name[len("liquid_"):], unit, bracket)
	}
	return labColumn{}, fmt.Sprintf("unknown column %q; the columns of a CVD table are %s", name, cvdColumns)
}

// labCVD reads the CVD table at path p. rep holds the temperature and the
// saturation pressure of [lab] (0 when not given; then the table's first
// row gives it, when it is the saturation row); satText is the key's text.
func (r *reader) labCVD(p string, data []byte, specs []spec, rep *cvd.LabReport, satText string) *cvd.LabCVD {
	t := r.readLabTable("lab.cvd", p, data, specs, `"pressure [psia], liquid_dropout [%], produced [%], z_gas, z_two_phase, gas_C1 [mol%]"`,
		func(name, unit string, bracket bool) (labColumn, string) {
			return cvdColumn(specs, name, unit, bracket)
		})
	if t == nil {
		return nil
	}
	pc := t.find("pressure")
	if pc < 0 {
		t.failf(`no pressure column; the header needs one, such as "pressure [psia]"; the columns of a CVD table are %s`, cvdColumns)
		return nil
	}
	dc, nc := t.find("liquid_dropout"), t.find("produced")
	gas, gasCols := t.labComponents(false)
	liq, liqCols := t.labComponents(true)
	last := len(t.vals) - 1
	get := func(i, c int) float64 {
		if c < 0 {
			return cvd.Missing
		}
		return t.vals[i][c]
	}
	prevN := -1 // the last row with a produced value
	for i := range t.vals {
		p := t.vals[i][pc]
		switch {
		case cvd.IsMissing(p):
			t.failCell(i, pc, "no pressure; every row needs its pressure")
			return nil
		case i > 0 && p >= t.vals[i-1][pc]:
			t.failCell(i, pc, "%s is not below the pressure of the row before (%s): the pressures of a CVD fall from row to row", t.shown(i, pc), t.shown(i-1, pc))
			return nil
		case satText != "" && p > rep.SaturationP*(1+labSaturationTolerance):
			t.failCell(i, pc, "%s is above lab.saturation_pressure (%s): the pressures of a CVD are at or below the saturation pressure", t.shown(i, pc), satText)
			return nil
		}
		if n := get(i, nc); !cvd.IsMissing(n) {
			if prevN >= 0 && n <= t.vals[prevN][nc] {
				t.failCell(i, nc, "%s is not above the cumulative production of row %d (%s): the moles produced rise from row to row", t.shown(i, nc), prevN+1, t.shown(prevN, nc))
				return nil
			}
			prevN = i
		}
		if i != last {
			for _, c := range liqCols {
				if !cvd.IsMissing(t.vals[i][c]) {
					t.failCell(i, c, "a liquid composition is given on the last row only (the liquid left in the cell at the last pressure); leave this cell blank")
					return nil
				}
			}
		}
		t.checkSum(i, gasCols, "produced-gas composition")
		if i == last {
			t.checkSum(i, liqCols, "liquid composition")
		}
		if r.err != nil {
			return nil
		}
	}
	if satText == "" {
		if get(0, dc) == 0 && get(0, nc) == 0 {
			rep.SaturationP = t.vals[0][pc]
		} else {
			r.failf("lab.saturation_pressure", "missing, and the CVD table %s does not begin at the saturation pressure (a first row with liquid_dropout 0 and produced 0), "+
				`so the saturation pressure cannot be known; give it, such as saturation_pressure = "4141 psia"`, p)
			return nil
		}
	}
	out := &cvd.LabCVD{Gas: gas, Liquid: liq}
	for i := range t.vals {
		pt := cvd.LabCVDPoint{
			P:            t.vals[i][pc],
			Dropout:      get(i, dc),
			Produced:     get(i, nc),
			ZGas:         get(i, t.find("z_gas")),
			ZTwoPhase:    get(i, t.find("z_two_phase")),
			GasViscosity: get(i, t.find("gas_viscosity")),
			CGR:          get(i, t.find("cgr")),
		}
		if len(gasCols) > 0 {
			pt.Gas = make([]float64, len(gasCols))
			for j, c := range gasCols {
				pt.Gas[j] = t.vals[i][c]
			}
		}
		if i == last && len(liqCols) > 0 {
			pt.Liquid = make([]float64, len(liqCols))
			for j, c := range liqCols {
				pt.Liquid[j] = t.vals[i][c]
			}
		}
		out.Points = append(out.Points, pt)
	}
	return out
}

// The columns of a CCE table, for messages.
const cceColumns = `pressure, relative_volume, liquid_volume (with the unit [% of saturation volume] or [% of total volume]), z, density and note… (ignored)`

// cceColumn reads the header of one column of a CCE table.
func cceColumn(name, unit string, bracket bool) (labColumn, string) {
	low := strings.ToLower(name)
	switch low {
	case "pressure":
		return pressureColumn("a pressure", unit, bracket)
	case "relative_volume":
		return bareColumn(low, "a relative volume (V/Vsat)", unit, "V/Vsat")
	case "z":
		return bareColumn(low, "a single-phase Z-factor", unit)
	case "density":
		return quantityColumn(low, "a density", unit, units.Density, false, "density [g/cm3]")
	case "liquid_volume":
		const want = `[% of saturation volume], [% of total volume], [fraction of saturation volume] or [fraction of total volume]`
		norm := strings.ToLower(strings.Join(strings.Fields(unit), " "))
		share, basis, ok := strings.Cut(norm, " of ")
		col := labColumn{name: low, kind: colShare, what: "a liquid volume", spec: -1}
		switch {
		case !ok && (norm == "%" || norm == "fraction"):
			return col, fmt.Sprintf("say which volume the liquid volume is a share of: %s", want)
		case !ok:
			return col, fmt.Sprintf("the liquid volume needs its unit in brackets, saying which volume it is a share of: %s", want)
		}
		switch basis {
		case "saturation volume":
			col.basis = cvd.OfSaturationVolume
		case "total volume":
			col.basis = cvd.OfTotalVolume
		default:
			return col, fmt.Sprintf("unknown unit %q for the liquid volume; want %s", unit, want)
		}
		switch share {
		case "%":
			col.unit, col.shown = units.Percent, "%"
		case "fraction":
			col.unit = units.Fraction
		default:
			return col, fmt.Sprintf("unknown unit %q for the liquid volume; want %s", unit, want)
		}
		col.what = "a liquid volume (" + norm + ")"
		return col, ""
	}
	return labColumn{}, fmt.Sprintf("unknown column %q; the columns of a CCE table are %s", name, cceColumns)
}

// labCCE reads the CCE table at path p.
func (r *reader) labCCE(p string, data []byte) *cvd.LabCCE {
	t := r.readLabTable("lab.cce", p, data, nil, `"pressure [psia], relative_volume, liquid_volume [% of saturation volume], z, density [g/cm3]"`, cceColumn)
	if t == nil {
		return nil
	}
	pc := t.find("pressure")
	if pc < 0 {
		t.failf(`no pressure column; the header needs one, such as "pressure [psia]"; the columns of a CCE table are %s`, cceColumns)
		return nil
	}
	get := func(i, c int) float64 {
		if c < 0 {
			return cvd.Missing
		}
		return t.vals[i][c]
	}
	out := &cvd.LabCCE{}
	lc := t.find("liquid_volume")
	if lc >= 0 {
		out.LiquidBasis = t.cols[lc].basis
	}
	seen := map[float64]int{}
	for i := range t.vals {
		if cvd.IsMissing(t.vals[i][pc]) {
			t.failCell(i, pc, "no pressure; every row needs its pressure")
			return nil
		}
		if k, dup := seen[t.vals[i][pc]]; dup {
			t.failCell(i, pc, "the pressure of row %d again: give each pressure of the expansion once", k+1)
			return nil
		}
		seen[t.vals[i][pc]] = i
		out.Points = append(out.Points, cvd.LabCCEPoint{
			P:              t.vals[i][pc],
			RelativeVolume: get(i, t.find("relative_volume")),
			LiquidVolume:   get(i, lc),
			Z:              get(i, t.find("z")),
			Density:        get(i, t.find("density")),
		})
	}
	return out
}
