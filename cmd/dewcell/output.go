package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/report"
	"dewcell/cmd/dewcell/internal/report/figure"
)

// The report model: the commands build these, the encoders of
// internal/report render them.
type (
	Report = report.Report
	Column = report.Column
	Field  = report.Field
	Vector = report.Vector
	Table  = report.Table
	Matrix = report.Matrix
)

// Output formats.
const (
	formatTable = "table"
	formatCSV   = "csv"
	formatJSON  = "json"
	formatXLSX  = "xlsx"
	formatHTML  = "html" // the study report's, not a --format
)

var formats = []string{formatTable, formatCSV, formatJSON, formatXLSX}

// encode renders the reports in o's format; o.brief leaves their detail
// tables out of the text and the JSON (demo's standard output), never out
// of a workbook.
func (o *options) encode(w io.Writer, reports ...*Report) error {
	if o.brief && o.format != formatXLSX {
		short := make([]*Report, len(reports))
		for i, r := range reports {
			short[i] = r.Brief()
		}
		reports = short
	}
	switch o.format {
	case formatTable:
		return report.WriteText(w, report.TextOptions{Verbose: o.verbose}, reports...)
	case formatCSV:
		if len(reports) != 1 {
			return fmt.Errorf("CSV holds one table, and this command gives %d results; use --format table, json or xlsx", len(reports))
		}
		if o.part != "" && !slices.Contains(reports[0].Parts(), o.part) {
			return cli.Exit(fmt.Sprintf("--%s: the result has no table %q; it has %s", flagTable, o.part, partsText(reports[0])), exitUsage)
		}
		return report.WriteCSV(w, reports[0], o.part)
	case formatJSON:
		return report.WriteJSON(w, reports...)
	case formatXLSX:
		return writeWorkbook(w, o, reports...)
	}
	return fmt.Errorf("unknown format %q", o.format)
}

// warn queues warnings for the result being built: they go to standard
// error and into the result's files when it is written (emit), or to
// standard error alone when the run fails (flush).
func (o *options) warn(msgs ...string) { o.warnings = append(o.warnings, msgs...) }

// warnOnce queues a warning unless one of the same kind was queued in this
// run: the steps of a workflow that all miss the same input say so once.
func (o *options) warnOnce(kind, msg string) {
	if o.warned == nil {
		o.warned = map[string]bool{}
	}
	if !o.warned[kind] {
		o.warned[kind] = true
		o.warn(msg)
	}
}

// note queues notes, as warn queues warnings.
func (o *options) note(msgs ...string) { o.notes = append(o.notes, msgs...) }

// attach moves the queued warnings and notes into r.
func (o *options) attach(r *Report) {
	r.Warnings = append(o.warnings, r.Warnings...)
	r.Notes = append(o.notes, r.Notes...)
	o.warnings, o.notes = nil, nil
}

// flush writes the queued warnings and notes to standard error: the run
// failed, and they may say why.
func (o *options) flush() {
	for _, m := range o.warnings {
		fmt.Fprintln(o.stderr, "warning:", m)
	}
	for _, m := range o.notes {
		fmt.Fprintln(o.stderr, "note:", m)
	}
	o.warnings, o.notes = nil, nil
}

// tell writes the warnings and notes of the reports to standard error.
func (o *options) tell(reports ...*Report) {
	for _, r := range reports {
		for _, m := range r.Notes {
			fmt.Fprintln(o.stderr, "note:", m)
		}
		for _, m := range r.Warnings {
			fmt.Fprintln(o.stderr, "warning:", m)
		}
	}
}

// emit renders the reports and writes them to standard output or, with
// --output, to the file: a temporary file in the same directory, renamed
// into place once complete, so that the file is written in full or not at
// all. The queued warnings and notes join the first report; all of them go
// to standard error too, then the caution.
func (o *options) emit(reports ...*Report) error { return o.emitWith(nil, reports...) }

// emitWith is emit, writing the files of before (figures) once the result
// has been rendered without error and before it is written: a run that
// fails writes nothing.
func (o *options) emitWith(before []demoFile, reports ...*Report) error {
	if len(reports) > 0 {
		o.attach(reports[0])
	}
	var buf bytes.Buffer
	if err := o.encode(&buf, reports...); err != nil {
		return err
	}
	if len(before) > 0 {
		if err := o.writeFigures(before); err != nil {
			return err
		}
		reports[0].Note(fmt.Sprintf("%s drawn into %s, as SVG and PNG", count(len(before)/2, "figure", "figures"), o.plot))
	}
	o.tell(reports...)
	if err := o.write(buf.Bytes()); err != nil {
		return err
	}
	fmt.Fprintln(o.stderr, caution)
	return nil
}

// write puts data on standard output or into --output.
func (o *options) write(data []byte) error {
	switch {
	case o.output == "":
		_, err := o.stdout.Write(data)
		return err
	case o.direct:
		if err := writeInPlace(o.target, data); err != nil {
			return fmt.Errorf("--output: cannot write %s: %v", o.output, cause(err))
		}
	default:
		if err := writeAtomic(o.target, data); err != nil {
			return fmt.Errorf("--output: cannot write %s: %v", o.output, cause(err))
		}
	}
	return nil
}

// partsText lists the CSV parts of r for a message.
func partsText(r *Report) string { return strings.Join(r.Parts(), ", ") }

// flagPlot is the flag of the commands that draw figures.
const flagPlot = "plot"

func plotFlag() cli.Flag {
	return &cli.StringFlag{
		Name:  flagPlot,
		Usage: "also draw the result's figures into the folder `DIR`, each as SVG and PNG (the folder is made if it does not exist; figures of the same name are replaced)",
	}
}

// checkPlotDir refuses, before anything is computed, a --plot folder that
// is a file or cannot be made or written.
func checkPlotDir(dir string) error {
	if strings.TrimSpace(dir) == "" {
		return errors.New("empty folder name")
	}
	fi, err := os.Stat(dir)
	switch {
	case err == nil && !fi.IsDir():
		return fmt.Errorf("%s is a file, not a folder", dir)
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return fmt.Errorf("cannot use %s (%v)", dir, cause(err))
	case err != nil:
		parent := filepath.Dir(filepath.Clean(dir))
		if pi, err := os.Stat(parent); err != nil || !pi.IsDir() {
			return fmt.Errorf("the folder %s, in which %s would be made, does not exist", parent, dir)
		}
		probe, err := os.MkdirTemp(parent, ".dewcell-*.tmp")
		if err != nil {
			return fmt.Errorf("no folder can be made in %s (%v)", parent, cause(err))
		}
		os.Remove(probe)
		return nil
	}
	probe, err := os.CreateTemp(dir, ".dewcell-*.tmp")
	if err != nil {
		return fmt.Errorf("no file can be made in %s (%v)", dir, cause(err))
	}
	probe.Close()
	os.Remove(probe.Name())
	return nil
}

// figureFiles renders every figure of the reports as SVG and PNG.
func figureFiles(reports ...*Report) ([]demoFile, error) {
	var files []demoFile
	for _, r := range reports {
		for _, f := range r.Figures {
			svg, err := figure.SVG(f)
			if err != nil {
				return nil, fmt.Errorf("figure %q: %w", f.Title, err)
			}
			png, err := figure.PNG(f, figureDPI)
			if err != nil {
				return nil, fmt.Errorf("figure %q: %w", f.Title, err)
			}
			files = append(files, demoFile{f.Name + ".svg", svg}, demoFile{f.Name + ".png", png})
		}
	}
	return files, nil
}

// figureDPI is the resolution of the PNG figures.
const figureDPI = 150

// emitPlots is emit, drawing the figures of the reports into the --plot
// folder when it is given: every figure is rendered, and the result, before
// any file is written, and each file is written in full or not at all.
func (o *options) emitPlots(c *cli.Context, reports ...*Report) error {
	o.plot = c.String(flagPlot)
	if o.plot == "" {
		return o.emit(reports...)
	}
	files, err := figureFiles(reports...)
	if err != nil {
		return err
	}
	return o.emitWith(files, reports...)
}

// writeFigures writes the figure files into the --plot folder, making it
// when it does not exist.
func (o *options) writeFigures(files []demoFile) error {
	if err := os.MkdirAll(o.plot, 0o755); err != nil {
		return fmt.Errorf("--%s: cannot make %s: %v", flagPlot, o.plot, cause(err))
	}
	for _, f := range files {
		path := filepath.Join(o.plot, f.name)
		if err := writeAtomic(path, f.data); err != nil {
			return fmt.Errorf("--%s: cannot write %s: %v", flagPlot, path, cause(err))
		}
	}
	return nil
}

// count writes n with its noun: "1 figure", "3 figures".
func count(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// noSeparator is the kind of the warning that the study gives no separator
// stages.
const noSeparator = "no separator"
