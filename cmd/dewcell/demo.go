package main

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/cvd"
	"dewcell/eos"
	"dewcell/examples"
	"dewcell/mbal"
)

// Flags and names of demo.
const (
	flagDir        = "dir"
	defaultDemoDir = "dewcell-demo"
	// demoMarker is the file that says a folder holds the output of demo,
	// and lists the files demo wrote there with their sizes and SHA-256
	// sums. demo replaces such a folder while it holds just those files,
	// unchanged, and no other.
	demoMarker = "dewcell-demo.txt"
	// demoSignature is the first line of demoMarker.
	demoSignature = "dewcell demo output"
)

func demoCommand() *cli.Command {
	return &cli.Command{
		Name: "demo",
		Usage: "run the workflow on the bundled example field: fluid, dew point, phase envelope, constant-volume depletion, separator, " +
			"gas and condensate in place, depletion recovery and the production-history material balance; " +
			"prints the summaries and writes every table as CSV and JSON to a folder",
		ArgsUsage: " ",
		Flags: append(sharedFlags(), &cli.StringFlag{
			Name:  flagDir,
			Value: defaultDemoDir,
			Usage: "write the tables to the folder `DIR`: a new folder, an empty one, or one an earlier demo wrote, which is replaced; any other folder is refused",
		}),
		Action: func(c *cli.Context) error {
			o, err := commonOptions(c, false)
			if err != nil {
				return err
			}
			if o.format == formatCSV {
				return cli.Exit("--format: demo gives several tables, which CSV cannot hold on standard output; use table or json (the folder gets a CSV file per table)", exitUsage)
			}
			dir := c.String(flagDir)
			if err := checkDemoDir(dir); err != nil {
				return cli.Exit(fmt.Sprintf("--%s: %v", flagDir, err), exitUsage)
			}
			// The new folder is made beside dir: check, before computing,
			// that a folder can be made there.
			parent := filepath.Dir(filepath.Clean(dir))
			probe, err := os.MkdirTemp(parent, ".dewcell-*.tmp")
			if err != nil {
				return cli.Exit(fmt.Sprintf("--%s: cannot write %s: no folder can be made in %s (%v); choose another with --%s",
					flagDir, dir, parent, cause(err), flagDir), exitUsage)
			}
			os.Remove(probe)
			st, err := study.Parse("examples/"+examples.StudyName, examples.Study)
			if err != nil {
				return fmt.Errorf("the bundled example: %w", err) // a defect, not the user's input
			}
			o.warn(st.Warnings...)
			fmt.Fprintf(o.stderr, "demo: %s (examples/%s, an invented field)\n", st.Title, examples.StudyName)
			out, files, err := demoReports(o, st)
			if err != nil {
				return userError(err, o.sys)
			}
			note, err := writeDemoDir(dir, files)
			if err != nil {
				var refused *demoRefusal
				if errors.As(err, &refused) { // the folder changed while demo ran
					return cli.Exit(fmt.Sprintf("--%s: %v", flagDir, err), exitUsage)
				}
				return fmt.Errorf("--%s: cannot write %s: %v", flagDir, dir, cause(err))
			}
			if note != "" {
				o.warn(note)
			}
			abs, err := filepath.Abs(dir)
			if err != nil {
				abs = dir
			}
			fmt.Fprintf(o.stderr, "demo: %d tables written to %s, each as CSV and JSON\n", len(files)/2, abs)
			return o.emit(out...)
		},
	}
}

// A demoFile is one file of the demo folder.
type demoFile struct {
	name string
	data []byte
}

// demoReports runs the workflow on the example. It returns the summaries
// for standard output and the files of the demo folder: every report as CSV
// (the form one table can hold) and as JSON (in full).
func demoReports(o *options, st *study.Study) ([]*Report, []demoFile, error) {
	sys := o.sys
	var out []*Report
	var files []demoFile
	// add keeps r for standard output and writes full as JSON and csv as
	// CSV; full and csv may be r itself.
	add := func(r, full, csvForm *Report) error {
		out = append(out, r)
		for _, f := range []struct {
			format string
			r      *Report
		}{{formatCSV, csvForm}, {formatJSON, full}} {
			var b bytes.Buffer
			if err := render(&b, f.format, f.r); err != nil {
				return fmt.Errorf("demo: %s as %s: %w", r.Name, f.format, err)
			}
			files = append(files, demoFile{name: r.Name + "." + f.format, data: b.Bytes()})
		}
		return nil
	}

	fluid := fluidReport(st, sys)
	if err := add(fluid, fluid, fluid); err != nil {
		return nil, nil, err
	}
	sat, up, err := satpointReport(st, sys, st.Reservoir.Temperature)
	if err != nil {
		return nil, nil, err
	}
	if err := add(sat, sat, sat); err != nil {
		return nil, nil, err
	}
	noteMargin(o, st, up)
	env, warnings, err := envelopeReport(st, sys, true)
	if err != nil {
		return nil, nil, err
	}
	o.warn(warnings...)
	envSummary := *env
	envSummary.Tables = env.Tables[len(env.Tables)-1:] // the critical point and extremes
	if err := add(&envSummary, env, env); err != nil {
		return nil, nil, err
	}

	tr := trainOf(st, sys)
	d, err := cvd.Deplete(st.Fluid, st.Z, st.Reservoir.Temperature, cvd.DepletionOptions{Pressures: st.Depletion, Train: &tr})
	if err != nil {
		return nil, nil, fmt.Errorf("constant-volume depletion at %s: %w", temperatureText(sys, st.Reservoir.Temperature), err)
	}
	dep := depletionReport(st, sys, tr, d, false)
	depSummary := *dep
	depSummary.Tables = dep.Tables[:1] // the steps, without the compositions
	if err := add(&depSummary, dep, depletionReport(st, sys, tr, d, true)); err != nil {
		return nil, nil, err
	}
	sep, err := separateReport(st, sys, false)
	if err != nil {
		return nil, nil, err
	}
	sepCSV, err := separateReport(st, sys, true)
	if err != nil {
		return nil, nil, err
	}
	if err := add(sepCSV, sep, sepCSV); err != nil {
		return nil, nil, err
	}

	ip, err := inplaceReport(o, st)
	if err != nil {
		return nil, nil, err
	}
	if err := add(ip, ip, ip); err != nil {
		return nil, nil, err
	}
	rec, err := recoverReport(o, st, mbal.RecoverOptions{Steps: defaultRecoverySteps})
	if err != nil {
		return nil, nil, err
	}
	if err := add(rec, rec, rec); err != nil {
		return nil, nil, err
	}
	h, err := historyRun(o, st, mbal.DefaultConfidence)
	if err != nil {
		return nil, nil, err
	}
	if h.ho.WaterInfluxSuspected {
		o.warn("water influx suspected: " + h.ho.Reason)
	} else {
		fmt.Fprintln(o.stderr, "demo: history influx test: "+h.ho.Reason)
	}
	hist := historyReportOf(st, sys, h, o.format != formatTable)
	histFull := historyReportOf(st, sys, h, true)
	if err := add(hist, histFull, histFull); err != nil {
		return nil, nil, err
	}
	return out, files, nil
}

// A demoRefusal says why demo will not replace a folder.
type demoRefusal struct{ msg string }

func (e *demoRefusal) Error() string { return e.msg }

func refuse(format string, args ...any) error { return &demoRefusal{fmt.Sprintf(format, args...)} }

// checkDemoDir refuses a folder demo must not write into: an existing file,
// a symbolic link, a folder holding anything but an earlier demo's output as
// that demo wrote it (each file listed in the marker, a regular file of the
// recorded size and SHA-256 sum), or a folder whose parent does not exist.
// What is there is checked, not only the names.
func checkDemoDir(dir string) error {
	if strings.TrimSpace(dir) == "" {
		return refuse("empty folder name")
	}
	parent := filepath.Dir(filepath.Clean(dir))
	if fi, err := os.Stat(parent); err != nil || !fi.IsDir() {
		return refuse("the folder %s, in which %s would be made, does not exist", parent, dir)
	}
	fi, err := os.Lstat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return refuse("cannot use %s (%v)", dir, cause(err))
	case fi.Mode()&fs.ModeSymlink != 0:
		return refuse("%s is a symbolic link; refusing to replace it; give the folder it points to, or another folder, with --%s", dir, flagDir)
	case !fi.IsDir():
		return refuse("%s is a file, not a folder; refusing to replace it", dir)
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return refuse("cannot read the folder %s (%v)", dir, cause(err))
	}
	if len(entries) == 0 {
		return nil
	}
	if mi, err := os.Lstat(filepath.Join(dir, demoMarker)); err == nil && !mi.Mode().IsRegular() {
		kind := study.FileKind(mi.Mode())
		return refuse("%s holds %s, which is %s, not the file an earlier demo wrote; refusing to replace the folder; choose another with --%s",
			dir, demoMarker, kind, flagDir)
	}
	listed, ok := readDemoMarker(dir)
	if !ok {
		return refuse("%s is a folder that holds other files (%s); demo writes only to a new or empty folder, or to one an earlier demo wrote; choose another with --%s",
			dir, entries[0].Name(), flagDir)
	}
	for _, e := range entries {
		name := e.Name()
		if name == demoMarker {
			continue // readDemoMarker checked it is a regular file
		}
		want, isListed := listed[name]
		if !isListed {
			return refuse("%s was written by an earlier demo, but %s has been added to it since; refusing to replace the folder; move that file, or choose another folder with --%s",
				dir, name, flagDir)
		}
		if !want.known {
			return refuse("%s was written by an earlier demo whose %s does not record the files' contents, so demo cannot tell whether %s is still its own; refusing to replace the folder; delete it yourself, or choose another with --%s",
				dir, demoMarker, name, flagDir)
		}
		if what := demoFileChange(filepath.Join(dir, name), want); what != "" {
			return refuse("%s was written by an earlier demo, but %s %s; refusing to replace the folder; move it, or choose another folder with --%s",
				dir, name, what, flagDir)
		}
	}
	return nil
}

// A demoEntry is what the marker records of one file.
type demoEntry struct {
	size  int64
	sum   string // SHA-256, lower-case hex
	known bool   // size and sum recorded
}

func entryOf(data []byte) demoEntry {
	s := sha256.Sum256(data)
	return demoEntry{size: int64(len(data)), sum: hex.EncodeToString(s[:]), known: true}
}

// demoFileChange says how the file at path differs from what demo wrote
// ("is now a folder", "has been changed"), or "" if it does not.
func demoFileChange(path string, want demoEntry) string {
	fi, err := os.Lstat(path)
	switch {
	case err != nil:
		return fmt.Sprintf("cannot be read (%v)", cause(err))
	case !fi.Mode().IsRegular():
		return "is now " + study.FileKind(fi.Mode())
	case fi.Size() != want.size:
		return "has been changed since"
	}
	data, err := os.ReadFile(path)
	if err != nil {
		return fmt.Sprintf("cannot be read (%v)", cause(err))
	}
	if entryOf(data).sum != want.sum {
		return "has been changed since"
	}
	return ""
}

// readDemoMarker reads the marker of an earlier demo in dir, which must be a
// regular file that starts with demoSignature: what it records of each
// file, and whether there is such a marker. A line "  NAME SIZE SHA256"
// records a file; a line "  NAME" (an older marker) names one without its
// contents.
func readDemoMarker(dir string) (map[string]demoEntry, bool) {
	path := filepath.Join(dir, demoMarker)
	if fi, err := os.Lstat(path); err != nil || !fi.Mode().IsRegular() {
		return nil, false
	}
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, false
	}
	sc := bufio.NewScanner(bytes.NewReader(data))
	if !sc.Scan() || sc.Text() != demoSignature {
		return nil, false
	}
	listed := map[string]demoEntry{}
	for sc.Scan() {
		line, ok := strings.CutPrefix(sc.Text(), "  ")
		if !ok {
			continue
		}
		f := strings.Fields(line)
		switch {
		case len(f) == 1:
			listed[f[0]] = demoEntry{}
		case len(f) == 3:
			size, err := strconv.ParseInt(f[1], 10, 64)
			if err != nil || len(f[2]) != 2*sha256.Size {
				listed[f[0]] = demoEntry{}
				continue
			}
			listed[f[0]] = demoEntry{size: size, sum: f[2], known: true}
		}
	}
	return listed, true
}

// demoMarkerText is the content of the marker for files.
func demoMarkerText(files []demoFile) []byte {
	var b bytes.Buffer
	fmt.Fprintln(&b, demoSignature)
	fmt.Fprintf(&b, "\nThese tables were written by `dewcell demo` from the bundled example study, examples/%s\n", examples.StudyName)
	fmt.Fprintln(&b, "(an invented field). Each table is given as CSV and as JSON, with the unit at the end of")
	fmt.Fprintln(&b, "every column name. The next `dewcell demo` into this folder replaces it, as long as it")
	fmt.Fprintln(&b, "holds only these files, unchanged (name, size in bytes, SHA-256):")
	fmt.Fprintln(&b)
	for _, f := range files {
		e := entryOf(f.data)
		fmt.Fprintf(&b, "  %s %d %s\n", f.name, e.size, e.sum)
	}
	return b.Bytes()
}

// writeDemoDir writes files and the marker into a temporary folder beside
// dir, then puts it in dir's place, so that dir holds either the previous
// content or the whole new one. checkDemoDir is repeated just before the
// swap (an error it gives is a *demoRefusal). The previous folder is
// emptied afterwards of the files its marker lists, and removed if that
// leaves it empty; anything else that appeared in it meanwhile is kept, and
// note says where.
func writeDemoDir(dir string, files []demoFile) (note string, err error) {
	dir = filepath.Clean(dir)
	parent, base := filepath.Split(dir)
	if parent == "" {
		parent = "."
	}
	tmp, err := os.MkdirTemp(parent, "."+base+".*.tmp")
	if err != nil {
		return "", err
	}
	defer func() {
		if err != nil {
			os.RemoveAll(tmp) // the folder demo made, with what demo wrote
		}
	}()
	write := func(name string, data []byte) error {
		f, err := os.OpenFile(filepath.Join(tmp, name), os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err != nil {
			return err
		}
		if _, err := f.Write(data); err != nil {
			f.Close()
			return err
		}
		if err := f.Sync(); err != nil {
			f.Close()
			return err
		}
		return f.Close()
	}
	for _, f := range files {
		if f.name == demoMarker || f.name == "" || strings.ContainsAny(f.name, "/\\ \t\n\x00") {
			return "", fmt.Errorf("internal error: demo file name %q", f.name)
		}
		if err = write(f.name, f.data); err != nil {
			return "", err
		}
	}
	if err = write(demoMarker, demoMarkerText(files)); err != nil {
		return "", err
	}
	if err = os.Chmod(tmp, 0o755); err != nil {
		return "", err
	}

	if err = checkDemoDir(dir); err != nil { // it may have changed while demo ran
		return "", err
	}
	listed, _ := readDemoMarker(dir) // what the previous demo wrote, checked just now
	if _, statErr := os.Lstat(dir); errors.Is(statErr, fs.ErrNotExist) {
		return "", os.Rename(tmp, dir)
	}
	old := tmp + ".old"
	if err = os.Rename(dir, old); err != nil {
		return "", err
	}
	if err = os.Rename(tmp, dir); err != nil {
		if back := os.Rename(old, dir); back != nil {
			return "", fmt.Errorf("%w; the previous folder is now %s (%v)", err, old, back)
		}
		return "", err
	}
	// Remove what the previous demo wrote, and nothing else.
	for name := range listed {
		p := filepath.Join(old, name)
		if fi, err := os.Lstat(p); err == nil && fi.Mode().IsRegular() {
			os.Remove(p)
		}
	}
	os.Remove(filepath.Join(old, demoMarker))
	if err := os.Remove(old); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return fmt.Sprintf("the previous demo folder, moved to %s, was kept: it holds files demo did not write", old), nil
	}
	return "", nil
}

// noteMargin says on standard error how far the initial pressure lies above
// the computed saturation pressure.
func noteMargin(o *options, st *study.Study, up eos.Saturation) {
	pi := st.Reservoir.InitialPressure
	if pi == 0 {
		return
	}
	pU := o.sys.Unit(units.Pressure)
	d := pU.FromSI(pi) - pU.FromSI(up.P)
	if d >= 0 {
		fmt.Fprintf(o.stderr, "demo: the initial pressure is %.4g %s above the computed %s point\n", d, pU.Symbol, up.Type)
		return
	}
	o.warn(fmt.Sprintf("the initial pressure of %s is %.4g %s below the computed %s point: the reservoir would be two-phase at discovery",
		st.File, -d, pU.Symbol, up.Type))
}
