package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
)

// Exit codes (DESIGN.md).
const (
	exitFailed = 1 // a computation failed
	exitUsage  = 2 // bad input or usage
)

// caution is printed to standard error after every result.
const caution = "caution: " + cautionText

// cautionText is the caution itself, for the files that carry it.
const cautionText = "screening estimates; reserves and development decisions need review by qualified, licensed professionals under local regulations"

// Flag names shared by the commands.
const (
	flagUnits       = "units"
	flagFormat      = "format"
	flagOutput      = "output"
	flagVerbose     = "verbose"
	flagTable       = "table"
	flagPressure    = "pressure"
	flagTemperature = "temperature"
)

// run runs the command line args and returns the exit code.
func run(args []string, stdout, stderr io.Writer) int {
	app := newApp(stdout, stderr)
	err := app.Run(flagsFirst(app, args))
	if err == nil {
		return 0
	}
	if msg := err.Error(); msg != "" {
		fmt.Fprintln(stderr, "dewcell:", msg)
	}
	var ec cli.ExitCoder
	if errors.As(err, &ec) {
		return ec.ExitCode()
	}
	return exitFailed // the computation failed, e.g. errors.Is(err, eos.ErrNoConvergence)
}

// flagsFirst moves the flags of a command, with their values, ahead of its
// arguments, so that flags may follow the study file as well as precede it:
// the command-line parser stops reading flags at the first argument.
// "dewcell flash study.toml --pressure 3000psia" becomes
// "dewcell flash --pressure 3000psia -- study.toml". A flag is a word that
// starts with "-" and is longer than "-"; its value is the next word unless
// the flag is written --name=value or takes no value (a boolean flag).
// Everything after "--" is an argument. A flag the command does not have
// is moved too, and the parser reports it. With --help (or -h) the
// arguments are dropped: the command's help is shown whatever follows.
func flagsFirst(app *cli.App, args []string) []string {
	if len(args) < 3 {
		return args
	}
	cmd := app.Command(args[1])
	if cmd == nil || cmd.Name == "help" {
		return args
	}
	takesValue := map[string]bool{}
	for _, f := range cmd.Flags {
		tv, ok := f.(interface{ TakesValue() bool })
		for _, name := range f.Names() {
			takesValue[name] = ok && tv.TakesValue()
		}
	}
	var flags, params []string
	rest := args[2:]
	for i := 0; i < len(rest); i++ {
		a := rest[i]
		switch {
		case a == "--":
			params = append(params, rest[i+1:]...)
			i = len(rest)
		case len(a) < 2 || a[0] != '-':
			params = append(params, a)
		default:
			flags = append(flags, a)
			name := strings.TrimLeft(a, "-")
			if name == "help" || name == "h" {
				return []string{args[0], args[1], "--help"}
			}
			if !strings.Contains(name, "=") && takesValue[name] && i+1 < len(rest) {
				flags = append(flags, rest[i+1])
				i++
			}
		}
	}
	out := append(append([]string(nil), args[:2]...), flags...)
	if len(params) > 0 {
		out = append(append(out, "--"), params...)
	}
	return out
}

func newApp(stdout, stderr io.Writer) *cli.App {
	app := &cli.App{
		Name:      "dewcell",
		Usage:     "Peng–Robinson fluid model for gas-condensate reservoirs",
		UsageText: "dewcell COMMAND [flags] STUDY.toml",
		Description: "Flags may come before or after the study file; after \"--\" every word is an argument. " +
			"Temperatures and pressures carry their unit, as in the study file: " +
			`--pressure "3000 psia", --temperature "220 degF" (also °F or F, degC, °C or C, K, degR, °R or R).`,
		HideVersion:    true,
		Writer:         stdout,
		ErrWriter:      stderr,
		ExitErrHandler: func(*cli.Context, error) {}, // run chooses the exit code
		OnUsageError:   usageError,
		Action: func(c *cli.Context) error {
			if c.Args().Present() {
				return cli.Exit(fmt.Sprintf("unknown command %q; run dewcell help for the list", c.Args().First()), exitUsage)
			}
			c.App.Writer = c.App.ErrWriter // usage, not a result
			_ = cli.ShowAppHelp(c)
			return cli.Exit("", exitUsage)
		},
		Commands: []*cli.Command{
			fluidCommand(),
			flashCommand(),
			satpointCommand(),
			envelopeCommand(),
			expandCommand(),
			depleteCommand(),
			separateCommand(),
			inplaceCommand(),
			recoverCommand(),
			historyCommand(),
			compareCommand(),
			checkCommand(),
			forecastCommand(),
			maintainCommand(),
			uncertaintyCommand(),
			tuneCommand(),
			reportCommand(),
			demoCommand(),
		},
	}
	for _, c := range app.Commands {
		c.OnUsageError = usageError
	}
	return app
}

// usageError turns a flag-parsing error into exit code 2, without printing
// help on standard output.
func usageError(c *cli.Context, err error, _ bool) error {
	name := "dewcell"
	if c.Command != nil && c.Command.Name != "" {
		name += " " + c.Command.Name
	}
	return cli.Exit(fmt.Sprintf("%v (see %s --help)", err, name), exitUsage)
}

// sharedFlags are the flags of every command.
func sharedFlags() []cli.Flag {
	return []cli.Flag{
		&cli.StringFlag{
			Name:  flagUnits,
			Value: units.Field.String(),
			Usage: "unit system of the output: `SYSTEM` is field or metric",
			Action: func(_ *cli.Context, s string) error {
				if _, err := units.ParseSystem(s); err != nil {
					return cli.Exit("--units: "+err.Error(), exitUsage)
				}
				return nil
			},
		},
		&cli.StringFlag{
			Name:  flagFormat,
			Value: formatTable,
			Usage: "output `FORMAT`: table (for people), csv (one table in full precision; see --table), json (everything) or xlsx (a workbook, with --output FILE.xlsx)",
			Action: func(_ *cli.Context, s string) error {
				for _, f := range formats {
					if s == f {
						return nil
					}
				}
				return cli.Exit(fmt.Sprintf("--format: unknown format %q, want table, csv, json or xlsx", s), exitUsage)
			},
		},
		&cli.StringFlag{
			Name:  flagOutput,
			Usage: "write the result to `FILE`, in full or not at all, instead of standard output (\"-\": standard output)",
		},
		&cli.StringFlag{
			Name:  flagTable,
			Usage: "with --format csv, write the table `NAME` of the result (the first by default; \"summary\" for the summary as one row); a wrong name lists the tables",
		},
		&cli.BoolFlag{
			Name:  flagVerbose,
			Usage: "show the solvers' iterations and residuals in the tables for people",
		},
	}
}

// options are the settings every command shares.
type options struct {
	sys     units.System
	format  string
	output  string // --output as given; "" for standard output
	target  string // the file written: output, its symbolic links resolved
	direct  bool   // target is a device or a named pipe, written in place
	study   string // path of the study file, "" for commands without one
	verbose bool   // --verbose: solver diagnostics in the tables for people
	brief   bool   // leave the detail tables out of the tables for people (demo)
	part    string // --table: the table CSV writes
	stdout  io.Writer
	stderr  io.Writer

	plot    string // --plot: the folder of the figures, "" for none
	title   string // the study's title, or its file name, for the files that carry it
	command string // the command line, as the user could type it again

	// Warnings and notes of the result being built (warn, note), and the
	// kinds of warning given once in the run (warnOnce).
	warnings, notes []string
	warned          map[string]bool
}

// commonOptions reads the shared flags and, when wantStudy, the one study
// file argument.
func commonOptions(c *cli.Context, wantStudy bool) (*options, error) {
	o := &options{format: c.String(flagFormat), output: c.String(flagOutput), verbose: c.Bool(flagVerbose), part: c.String(flagTable),
		stdout: c.App.Writer, stderr: c.App.ErrWriter, command: commandLine(c)}
	if o.part != "" && o.format != formatCSV {
		return nil, cli.Exit(fmt.Sprintf("--%s chooses the table of --format csv; the %s format holds every table", flagTable, o.format), exitUsage)
	}
	var err error
	if o.sys, err = units.ParseSystem(c.String(flagUnits)); err != nil {
		return nil, cli.Exit("--units: "+err.Error(), exitUsage)
	}
	args := c.Args().Slice()
	usage := fmt.Sprintf("usage: dewcell %s %s", c.Command.Name, c.Command.ArgsUsage)
	switch {
	case !wantStudy && len(args) > 0:
		return nil, cli.Exit(fmt.Sprintf("%s takes no arguments, got %q; %s", c.Command.Name, args[0], usage), exitUsage)
	case wantStudy && len(args) == 0:
		return nil, cli.Exit(fmt.Sprintf("%s needs a study file; %s", c.Command.Name, usage), exitUsage)
	case wantStudy && len(args) > 1:
		return nil, cli.Exit(fmt.Sprintf("%s takes one study file, got %d arguments (%s); %s",
			c.Command.Name, len(args), strings.Join(args, " "), usage), exitUsage)
	case wantStudy:
		o.study = args[0]
	}
	if o.output == "-" { // the usual name of standard output
		o.output = ""
	}
	if dir := c.String(flagPlot); dir != "" {
		if err := checkPlotDir(dir); err != nil {
			return nil, cli.Exit("--"+flagPlot+": "+err.Error(), exitUsage)
		}
	}
	if o.format == formatXLSX && o.output == "" {
		return nil, cli.Exit(fmt.Sprintf("--format xlsx writes a workbook file: give its name with --output, such as --output %s.xlsx", c.Command.Name), exitUsage)
	}
	if o.output != "" {
		var err error
		if o.target, o.direct, err = checkOutput(o.output, o.study); err != nil {
			return nil, cli.Exit("--output: "+err.Error(), exitUsage)
		}
	}
	return o, nil
}

// checkOutput refuses, before anything is computed, an output path that is
// the study file, a folder, a symbolic link to nowhere, or in a folder that
// does not exist or where no file can be created (a file is created there
// and removed). It returns the file to write, the path with its symbolic
// links resolved, and whether that is a device or a named pipe, which is
// written in place rather than replaced.
func checkOutput(out, studyPath string) (target string, direct bool, err error) {
	if studyPath != "" {
		a, errA := filepath.Abs(out)
		b, errB := filepath.Abs(studyPath)
		if errA == nil && errB == nil && a == b {
			return "", false, fmt.Errorf("%s is the study file; refusing to overwrite it", out)
		}
		fo, errO := os.Stat(out)
		fst, errS := os.Stat(studyPath)
		if errO == nil && errS == nil && os.SameFile(fo, fst) {
			return "", false, fmt.Errorf("%s is the study file; refusing to overwrite it", out)
		}
	}
	target = out
	if li, err := os.Lstat(out); err == nil && li.Mode()&fs.ModeSymlink != 0 {
		if target, err = filepath.EvalSymlinks(out); err != nil {
			return "", false, fmt.Errorf("%s is a symbolic link that cannot be followed (%v)", out, cause(err))
		}
	}
	fi, err := os.Stat(target)
	switch {
	case err == nil && fi.IsDir():
		return "", false, fmt.Errorf("%s is a folder; give a file name", out)
	case err == nil && !fi.Mode().IsRegular():
		return target, true, nil // a device (/dev/null) or a named pipe: written as it is
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return "", false, fmt.Errorf("cannot use %s (%v)", out, cause(err))
	}
	dir := filepath.Dir(target)
	if di, err := os.Stat(dir); err != nil || !di.IsDir() {
		return "", false, fmt.Errorf("the folder %s does not exist", dir)
	}
	probe, err := os.CreateTemp(dir, ".dewcell-*.tmp")
	if err != nil {
		return "", false, fmt.Errorf("cannot create %s: no file can be made in the folder %s (%v); choose another --output", out, dir, cause(err))
	}
	probe.Close()
	os.Remove(probe.Name())
	return target, false, nil
}

// cause is the reason of a file-system error without the operation and the
// path it repeats: "permission denied" for "open /x/.y.tmp: permission
// denied", so that no message names a temporary file.
func cause(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	var le *os.LinkError
	if errors.As(err, &le) {
		return le.Err
	}
	return err
}

// loadStudy reads the study file, printing its warnings to standard error;
// a bad study is a usage error.
// studyCommand builds a command that reads one study file, given as its
// argument, and hands it with the parsed shared options to act.
func studyCommand(name, usage string, extra []cli.Flag, act func(c *cli.Context, o *options, st *study.Study) error) *cli.Command {
	return &cli.Command{
		Name:      name,
		Usage:     usage,
		ArgsUsage: "STUDY.toml",
		Flags:     append(sharedFlags(), extra...),
		Action: func(c *cli.Context) error {
			o, err := commonOptions(c, true)
			if err != nil {
				return err
			}
			st, err := o.loadStudy()
			if err != nil {
				return err
			}
			if err := act(c, o, st); err != nil {
				o.flush()
				return userError(err, o.sys)
			}
			return nil
		},
	}
}

// temperatureOrReservoir reads --temperature, which defaults to the
// reservoir temperature of the study.
func temperatureOrReservoir(c *cli.Context, st *study.Study) (float64, error) {
	t, set, err := quantityFlag(c, flagTemperature, units.Temperature, st.Atmospheric)
	if err != nil || set {
		return t, err
	}
	return st.Reservoir.Temperature, nil
}

func (o *options) loadStudy() (*study.Study, error) {
	st, err := study.Read(o.study)
	if err != nil {
		return nil, cli.Exit(err, exitUsage)
	}
	o.warn(st.Warnings...)
	o.title = fluidName(st)
	return st, nil
}

// quantityFlag reads a flag holding the pressure or temperature of a state
// with its unit (units.ParseState: out of range is an error); ok is false
// when the flag was not given.
func quantityFlag(c *cli.Context, name string, kind units.Kind, atm float64) (v float64, ok bool, err error) {
	if !c.IsSet(name) {
		return 0, false, nil
	}
	v, err = units.ParseState(c.String(name), kind, atm)
	if err != nil {
		return 0, false, cli.Exit(fmt.Sprintf("--%s: %v", name, err), exitUsage)
	}
	return v, true, nil
}

// writeInPlace writes data to an existing device or named pipe.
func writeInPlace(path string, data []byte) error {
	f, err := os.OpenFile(path, os.O_WRONLY, 0)
	if err != nil {
		return err
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// writeAtomic writes data to a temporary file beside path and renames it
// into place. Its errors come from the file system and may name the
// temporary file; callers report cause(err) with the path.
func writeAtomic(path string, data []byte) (err error) {
	dir, base := filepath.Split(path)
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, "."+base+".*.tmp")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
		}
	}()
	if _, err = f.Write(data); err != nil {
		return err
	}
	if err = f.Chmod(0o644); err != nil {
		return err
	}
	if err = f.Sync(); err != nil {
		return err
	}
	if err = f.Close(); err != nil {
		return err
	}
	return os.Rename(f.Name(), path)
}
