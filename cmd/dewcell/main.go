// Command dewcell models gas-condensate fluids with the Peng–Robinson equation
// of state: the characterized fluid, flashes, saturation points and the phase
// envelope of the fluid a study file describes.
//
// Usage:
//
//	dewcell COMMAND [flags] STUDY.toml [flags]
//
// Flags may come before or after the study file; after "--" every word is an
// argument.
// Run `dewcell help` for the commands and `dewcell help COMMAND` for the
// flags of one. Results go to standard output as a table, CSV or JSON;
// warnings and cautions go to standard error. The exit code is 0 on success,
// 1 when a computation fails and 2 for bad input or usage.
package main

import "os"

func main() { os.Exit(run(os.Args, os.Stdout, os.Stderr)) }
