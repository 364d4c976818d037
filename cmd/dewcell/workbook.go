package main

import (
	"io"
	"strings"

	"dewcell/cmd/dewcell/internal/report/workbook"
)

// writeWorkbook writes the reports as an xlsx workbook: a cover with the
// study, the command and the caution, then a sheet per table.
func writeWorkbook(w io.Writer, o *options, reports ...*Report) error {
	return workbook.Write(w, workbook.Options{
		Title:      o.title,
		Caution:    strings.Join(cautions, " "),
		Command:    o.command,
		UnitSystem: o.sys.String(),
		Verbose:    o.verbose,
	}, reports...)
}
