package main

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/eos"
)

// The tuned study file: the original file's text with the tuned values
// written in as explicit settings (the plus fraction's molar mass, the
// properties of the tuned components and pseudo-components, the
// interaction coefficients), its [lab] paths rewritten to name the same
// tables from where it is saved, its [[tune.parameter]] and [tune.weights]
// sections turned into comments (their values are now in the file), and a
// header saying when and how well it was tuned. The text is edited line by
// line, keeping the file's comments and order; the result is read back
// and must describe the tuned fluid exactly, or nothing is written.

// tomlSetting is one key to set in one table.
type tomlSetting struct {
	table []string // the table's key path: fluid, properties, C7-C11
	key   string   // the key, unquoted
	value string   // the value as TOML text
}

// tunedStudyText returns the text of the tuned study, saved at path, for
// the study st read from src with the tuned values x; fl and z are the tuned
// fluid and feed (st.Tuned(x)), header the comment lines that head the file.
func tunedStudyText(st *study.Study, src []byte, path string, x []float64, fl *eos.Fluid, z []float64, header []string) ([]byte, error) {
	var sets []tomlSetting
	comps := fl.Components()
	for i, p := range st.Tune.Parameters {
		switch p.Property {
		case study.TuneMolarMass:
			sets = append(sets, tomlSetting{[]string{"fluid", "plus"}, "molar_mass", tomlNumber(st.PlusMolarMass() * 1000 * x[i])})
		case study.TuneInteraction:
			sets = append(sets, tomlSetting{[]string{"fluid", "interaction"}, p.A + "/" + p.B, tomlNumber(x[i])})
		default:
			for _, j := range st.Components(p.Component) {
				c := comps[j]
				name := c.Name
				var v string
				switch p.Property {
				case study.TuneTc:
					v = strconv.Quote(tomlNumber(c.Tc) + " K")
				case study.TunePc:
					v = strconv.Quote(tomlNumber(c.Pc/1000) + " kPa")
				case study.TuneOmega:
					v = tomlNumber(c.Omega)
				case study.TuneShift:
					v = tomlNumber(c.Shift)
				}
				sets = append(sets, tomlSetting{[]string{"fluid", "properties", name}, p.Property, v})
			}
		}
	}
	for _, lab := range []struct{ key, path string }{{"cce", st.Lab.CCE}, {"cvd", st.Lab.CVD}} {
		if lab.path == "" {
			continue
		}
		sets = append(sets, tomlSetting{[]string{"lab"}, lab.key, strconv.Quote(labPathFrom(path, lab.path))})
	}

	doc := splitTOML(string(src))
	doc.commentOut(func(table []string) bool { return len(table) > 0 && table[0] == "tune" },
		"(tuned: the values found are set above; remove the '# ' to tune again)")
	// A tuned pair replaces the study's own keys for the pairs it covers
	// ("C1/C7-C11" under a tuned "C1/C7+"): left as they are, they would
	// set the same coefficients twice.
	for _, p := range st.Tune.Parameters {
		if p.Property == study.TuneInteraction {
			doc.commentOutPairs(st, p.A, p.B)
		}
	}
	for _, s := range sets {
		doc.set(s)
	}
	text := strings.Join(header, "\n") + "\n" + doc.String()

	// Read back: the file must describe the tuned fluid.
	back, err := study.Parse(path, []byte(text))
	if err != nil {
		return nil, fmt.Errorf("the tuned study does not read back (%v); the file's layout (keys set as dotted keys or inline tables) may hide the tuned values", err)
	}
	if err := sameModel(back.Fluid, back.Z, fl, z); err != nil {
		return nil, fmt.Errorf("the tuned study read back describes another fluid (%v); the file's layout (keys set as dotted keys or inline tables) may hide the tuned values", err)
	}
	return []byte(text), nil
}

// tomlNumber writes a value with the digits to reproduce it to 1e-12.
func tomlNumber(v float64) string { return strconv.FormatFloat(v, 'g', 13, 64) }

// labPathFrom is the laboratory table at target (absolute, or relative to
// the working folder) as a path from the folder of the study saved at path.
func labPathFrom(path, target string) string {
	absT, err1 := filepath.Abs(target)
	absD, err2 := filepath.Abs(filepath.Dir(path))
	if err1 != nil || err2 != nil {
		return target
	}
	rel, err := filepath.Rel(absD, absT)
	if err != nil {
		return absT
	}
	return filepath.ToSlash(rel)
}

// sameModel says whether two fluids and feeds agree to the digits the
// tuned file writes (13 significant digits).
func sameModel(a *eos.Fluid, za []float64, b *eos.Fluid, zb []float64) error {
	if a.N() != b.N() {
		return fmt.Errorf("%d components, want %d", a.N(), b.N())
	}
	close := func(x, y float64) bool { return math.Abs(x-y) <= 1e-11*math.Max(math.Abs(x), math.Abs(y)) }
	for i := range a.N() {
		ca, cb := a.Component(i), b.Component(i)
		if ca.Name != cb.Name || !close(ca.Tc, cb.Tc) || !close(ca.Pc, cb.Pc) || !close(ca.Omega, cb.Omega) ||
			!close(ca.M, cb.M) || !close(ca.Shift, cb.Shift) || !close(za[i], zb[i]) {
			return fmt.Errorf("component %s differs", cb.Name)
		}
		for j := range a.N() {
			if math.Abs(a.Kij(i, j)-b.Kij(i, j)) > 1e-12 {
				return fmt.Errorf("interaction %s/%s differs", cb.Name, b.Component(j).Name)
			}
		}
	}
	return nil
}

// saveFile writes data to path whole or not at all: without force it
// refuses a file that exists, even one made while it was writing.
func saveFile(path string, data []byte, force bool) error {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	if fi, err := os.Stat(path); err == nil && fi.IsDir() {
		return fmt.Errorf("%s is a folder; give a file name", path)
	}
	f, err := os.CreateTemp(dir, "."+base+".*.tmp")
	if err != nil {
		return fmt.Errorf("cannot create %s (%v)", path, cause(err))
	}
	tmp := f.Name()
	defer os.Remove(tmp)
	_, err = f.Write(data)
	if err == nil {
		err = f.Chmod(0o644)
	}
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return fmt.Errorf("cannot write %s (%v)", path, cause(err))
	}
	if force {
		if err := os.Rename(tmp, path); err != nil {
			return fmt.Errorf("cannot write %s (%v)", path, cause(err))
		}
		return nil
	}
	if err := os.Link(tmp, path); err != nil {
		if errors.Is(err, fs.ErrExist) {
			return fmt.Errorf("%s exists; give another name, or --force to replace it", path)
		}
		return fmt.Errorf("cannot write %s (%v)", path, cause(err))
	}
	return nil
}

// A tomlDoc is a TOML file as lines, with the table each line belongs to.
type tomlDoc struct {
	lines  []string
	tables [][]string // per line: the key path of the table it is in (nil before the first header)
	header []bool     // per line: a table header
}

func splitTOML(s string) *tomlDoc {
	d := &tomlDoc{}
	var cur []string
	for _, l := range strings.Split(strings.TrimRight(s, "\n"), "\n") {
		isHeader := false
		if path, ok := headerPath(l); ok {
			cur, isHeader = path, true
		}
		d.lines = append(d.lines, l)
		d.tables = append(d.tables, cur)
		d.header = append(d.header, isHeader)
	}
	return d
}

func (d *tomlDoc) String() string { return strings.Join(d.lines, "\n") + "\n" }

// headerPath parses a table header line, [a.b."c d"] or [[a.b]].
func headerPath(line string) ([]string, bool) {
	t := strings.TrimSpace(line)
	if !strings.HasPrefix(t, "[") {
		return nil, false
	}
	t = strings.TrimPrefix(strings.TrimPrefix(t, "["), "[")
	end := strings.Index(t, "]")
	if end < 0 {
		return nil, false
	}
	return keyPath(t[:end])
}

// keyPath parses a dotted TOML key of bare and quoted parts.
func keyPath(s string) ([]string, bool) {
	var parts []string
	s = strings.TrimSpace(s)
	for s != "" {
		var part string
		switch s[0] {
		case '"':
			end := strings.Index(s[1:], `"`)
			if end < 0 {
				return nil, false
			}
			q, err := strconv.Unquote(s[:end+2])
			if err != nil {
				return nil, false
			}
			part, s = q, s[end+2:]
		case '\'':
			end := strings.Index(s[1:], "'")
			if end < 0 {
				return nil, false
			}
			part, s = s[1:end+1], s[end+2:]
		default:
			end := strings.IndexAny(s, ". \t")
			if end < 0 {
				end = len(s)
			}
			part, s = s[:end], s[end:]
		}
		parts = append(parts, part)
		s = strings.TrimSpace(s)
		if strings.HasPrefix(s, ".") {
			s = strings.TrimSpace(s[1:])
		} else if s != "" {
			return nil, false
		}
	}
	return parts, len(parts) > 0
}

// lineKey is the key a "key = value" line sets, unquoted, or "".
func lineKey(line string) string {
	t := strings.TrimSpace(line)
	if t == "" || t[0] == '#' || t[0] == '[' {
		return ""
	}
	eq := -1
	inQuote := byte(0)
	for i := 0; i < len(t); i++ {
		c := t[i]
		switch {
		case inQuote != 0 && c == inQuote:
			inQuote = 0
		case inQuote == 0 && (c == '"' || c == '\''):
			inQuote = c
		case inQuote == 0 && c == '=':
			eq = i
		}
		if eq >= 0 {
			break
		}
	}
	if eq < 0 {
		return ""
	}
	parts, ok := keyPath(t[:eq])
	if !ok || len(parts) != 1 {
		return ""
	}
	return parts[0]
}

func samePath(a, b []string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// tomlKey writes a key part, quoted unless bare.
func tomlKey(k string) string {
	for _, r := range k {
		if !(r >= 'A' && r <= 'Z' || r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r == '_' || r == '-') {
			return strconv.Quote(k)
		}
	}
	return k
}

// set sets s.key in table s.table: the line that sets it is replaced, or a
// line is added after the table's last setting, or the table is added at
// the end.
func (d *tomlDoc) set(s tomlSetting) {
	line := tomlKey(s.key) + " = " + s.value
	last := -1
	for i, l := range d.lines {
		if !samePath(d.tables[i], s.table) {
			continue
		}
		if d.header[i] {
			last = i
			continue
		}
		if lineKey(l) == s.key {
			d.lines[i] = line
			return
		}
		if t := strings.TrimSpace(l); t != "" && !strings.HasPrefix(t, "#") {
			last = i
		}
	}
	if last >= 0 {
		d.insert(last+1, line, s.table)
		return
	}
	parts := make([]string, len(s.table))
	for i, p := range s.table {
		parts[i] = tomlKey(p)
	}
	d.insert(len(d.lines), "", nil)
	d.lines = append(d.lines, "["+strings.Join(parts, ".")+"]")
	d.tables = append(d.tables, s.table)
	d.header = append(d.header, true)
	d.insert(len(d.lines), line, s.table)
}

func (d *tomlDoc) insert(at int, line string, table []string) {
	d.lines = append(d.lines[:at], append([]string{line}, d.lines[at:]...)...)
	d.tables = append(d.tables[:at], append([][]string{table}, d.tables[at:]...)...)
	d.header = append(d.header[:at], append([]bool{false}, d.header[at:]...)...)
}

// commentOutPairs turns into comments the keys of [fluid.interaction]
// other than "a/b" that set a coefficient of the pairs a/b covers.
func (d *tomlDoc) commentOutPairs(st *study.Study, a, b string) {
	in := func(name string, group []int) bool {
		for _, i := range st.Components(name) {
			for _, j := range group {
				if i == j {
					return true
				}
			}
		}
		return false
	}
	ga, gb := st.Components(a), st.Components(b)
	for i, l := range d.lines {
		if !samePath(d.tables[i], []string{"fluid", "interaction"}) {
			continue
		}
		k := lineKey(l)
		x, y, ok := strings.Cut(k, "/")
		if !ok || k == a+"/"+b || k == b+"/"+a {
			continue
		}
		if in(x, ga) && in(y, gb) || in(x, gb) && in(y, ga) {
			d.lines[i] = "# " + l + "   # (tuned: replaced by the tuned \"" + a + "/" + b + "\")"
		}
	}
}

// commentOut turns the tables that match into comments, the first header
// followed by note.
func (d *tomlDoc) commentOut(match func([]string) bool, note string) {
	noted := false
	for i, l := range d.lines {
		if !match(d.tables[i]) {
			continue
		}
		if strings.TrimSpace(l) != "" {
			d.lines[i] = "# " + l
		}
		if d.header[i] && !noted {
			d.lines[i] += "   " + "# " + note
			noted = true
		}
		d.tables[i] = []string{"#"}
		d.header[i] = false
	}
}
