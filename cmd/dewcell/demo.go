package main

import (
	"fmt"

	"github.com/urfave/cli/v2"

	"dewcell/cmd/dewcell/internal/study"
	"dewcell/cmd/dewcell/internal/units"
	"dewcell/eos"
	"dewcell/examples"
)

func demoCommand() *cli.Command {
	return &cli.Command{
		Name:      "demo",
		Usage:     "run on the bundled example field: the characterized fluid, its dew point and its phase envelope",
		ArgsUsage: " ",
		Flags:     sharedFlags(),
		Action: func(c *cli.Context) error {
			o, err := commonOptions(c, false)
			if err != nil {
				return err
			}
			if o.format == formatCSV {
				return cli.Exit("--format: demo gives several tables, which CSV cannot hold; use table or json", exitUsage)
			}
			st, err := study.Parse("examples/"+examples.StudyName, examples.Study)
			if err != nil {
				return fmt.Errorf("the bundled example: %w", err) // a defect, not the user's input
			}
			o.warn(st.Warnings...)
			fmt.Fprintf(o.stderr, "demo: %s (examples/%s, an invented field)\n", st.Title, examples.StudyName)
			fluid := fluidReport(st, o.sys)
			sat, up, err := satpointReport(st, o.sys, st.Reservoir.Temperature)
			if err != nil {
				return err
			}
			noteMargin(o, st, up)
			env, warnings, err := envelopeReport(st, o.sys, false)
			if err != nil {
				return err
			}
			o.warn(warnings...)
			return o.emit(fluid, sat, env)
		},
	}
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
