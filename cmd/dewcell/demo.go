package main

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
	"dewcell/examples"
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
		Usage: "run the whole workflow on the bundled example field, or on STUDY.toml: fluid, dew point, phase envelope, constant-volume depletion, " +
			"constant-composition expansion, separator, gas and condensate in place, depletion recovery and the production-history material balance; " +
			"prints the summaries and writes to a folder every result as JSON, its tables as CSV, its figures as SVG and PNG, the workbook and the study report",
		ArgsUsage: "[STUDY.toml]",
		Flags: append(sharedFlags(), &cli.StringFlag{
			Name:  flagDir,
			Value: defaultDemoDir,
			Usage: "write the files to the folder `DIR`: a new folder, an empty one, or one an earlier demo wrote, which is replaced; any other folder is refused",
		}, startAtDewPointFlag()),
		Action: func(c *cli.Context) error {
			o, err := commonOptions(c, c.Args().Len() > 0)
			if err != nil {
				return err
			}
			if o.format == formatCSV {
				return cli.Exit("--format: demo gives several tables, which CSV cannot hold on standard output; use table, json or xlsx (the folder gets a CSV file per table)", exitUsage)
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
			var st *study.Study
			var source []byte
			if o.study == "" {
				if st, err = study.ParseFS(examples.Files, examples.StudyName); err != nil {
					return fmt.Errorf("the bundled example: %w", err) // a defect, not the user's input
				}
				o.warn(st.Warnings...)
				o.title = fluidName(st)
				source = examples.Study
				fmt.Fprintf(o.stderr, "demo: %s (examples/%s, an invented field)\n", st.Title, examples.StudyName)
			} else {
				if st, err = o.loadStudy(); err != nil {
					return err
				}
				if source, err = os.ReadFile(o.study); err != nil {
					return cli.Exit(fmt.Sprintf("cannot read %s (%v)", o.study, cause(err)), exitUsage)
				}
				fmt.Fprintf(o.stderr, "demo: %s\n", fluidName(st))
			}
			out, err := workflow(o, st, c.Bool(flagStartAtDew))
			if err != nil {
				o.flush()
				return userError(err, o.sys)
			}
			files, err := demoFiles(out)
			if err != nil {
				return err
			}
			figures, err := figureFiles(out...)
			if err != nil {
				return err
			}
			withInputs := append([]*Report{inputsReport(st, o.sys)}, out...)
			var book bytes.Buffer
			if err := writeWorkbook(&book, o, withInputs...); err != nil {
				return fmt.Errorf("demo: the workbook: %w", err)
			}
			page, err := studyReport(o, st, source, o.command, out)
			if err != nil {
				return fmt.Errorf("demo: the study report: %w", err)
			}
			files = append(append(files, figures...), demoFile{demoWorkbook, book.Bytes()}, demoFile{demoReport, page})
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
			fmt.Fprintf(o.stderr, "demo: %d results written to %s: each as JSON and its tables as CSV, %s as SVG and PNG, the workbook %s and the study report %s\n",
				len(out), abs, count(len(figures)/2, "figure", "figures"), demoWorkbook, demoReport)
			o.brief = true
			if o.format == formatXLSX { // the workbook of the folder
				return o.emit(withInputs...)
			}
			return o.emit(out...)
		},
	}
}

// The workbook and the study report in the demo folder.
const (
	demoWorkbook = "results.xlsx"
	demoReport   = "report.html"
)

// A demoFile is one file of the demo folder.
type demoFile struct {
	name string
	data []byte
}

// demoFiles are the files of the demo folder: every report as JSON (in
// full) and each of its tables as CSV (name.csv for the first,
// name-part.csv for the others).
func demoFiles(reports []*Report) ([]demoFile, error) {
	var files []demoFile
	for _, r := range reports {
		for i, part := range r.Parts() {
			var b bytes.Buffer
			if err := report.WriteCSV(&b, r, part); err != nil {
				return nil, fmt.Errorf("internal error: demo: %s as CSV: %w", r.Name, err)
			}
			name := r.Name + ".csv"
			if i > 0 {
				name = r.Name + "-" + strings.ReplaceAll(part, "_", "-") + ".csv"
			}
			files = append(files, demoFile{name: name, data: b.Bytes()})
		}
		var b bytes.Buffer
		if err := report.WriteJSON(&b, r); err != nil {
			return nil, fmt.Errorf("internal error: demo: %s as JSON: %w", r.Name, err)
		}
		files = append(files, demoFile{name: r.Name + ".json", data: b.Bytes()})
	}
	return files, nil
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
	fmt.Fprintln(&b, "\nThese files were written by `dewcell demo`: every result as JSON, its tables as CSV (the")
	fmt.Fprintln(&b, "unit at the end of every column name), its figures as SVG and PNG, all of them in the")
	fmt.Fprintf(&b, "workbook %s, and the study report %s. The next `dewcell demo` into this folder\n", demoWorkbook, demoReport)
	fmt.Fprintln(&b, "replaces it, as long as it holds only these files, unchanged (name, size in bytes, SHA-256):")
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

// noteMargin says how far the initial pressure lies above the computed
// saturation pressure: a note, or a warning when it lies below, by more
// than a study copying the saturation pressure to its printed digits can.
func noteMargin(o *options, st *study.Study, up eos.Saturation) {
	pi := st.Reservoir.InitialPressure
	if pi == 0 {
		return
	}
	pU := o.sys.Unit(units.Pressure)
	d := pU.FromSI(pi) - pU.FromSI(up.P)
	gap := report.Quantity(math.Abs(d), pU)
	switch {
	case math.Abs(pi-up.P) <= atDewTolerance*up.P:
		o.note(fmt.Sprintf("the initial pressure is the computed %s point (%s) within %s", up.Type, pressureNote(o.sys, up.P), atDewToleranceText))
	case d > 0:
		o.note(fmt.Sprintf("the initial pressure is %s above the computed %s point", gap, up.Type))
	default:
		o.warn(fmt.Sprintf("the initial pressure of %s is %s below the computed %s point: the reservoir would be two-phase at discovery",
			st.File, gap, up.Type))
	}
}
