package main

import (
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestWorkbooks: --format xlsx on every command writes a workbook that
// excelize (a general-purpose reader of the format, the outside check)
// opens, with a cover holding the title and the caution, and with every
// cell that reads as a number stored as a number, not as text; only a
// sheet's first column, the labels of its rows, may hold text that looks
// like a number (a stage "1", a history row "2").
func TestWorkbooks(t *testing.T) {
	dir := t.TempDir()
	cases := [][]string{
		{"fluid", exampleStudy}, {"flash", exampleStudy, "--pressure", "3000 psia"}, {"satpoint", exampleStudy},
		{"envelope", exampleStudy}, {"expand", exampleStudy}, {"deplete", exampleStudy}, {"separate", exampleStudy},
		{"inplace", exampleStudy}, {"recover", exampleStudy}, {"history", exampleStudy, "--units", "metric"},
		{"demo", "--dir", filepath.Join(dir, "demo")},
	}
	for i, c := range cases {
		out := filepath.Join(dir, strconv.Itoa(i)+".xlsx")
		args := append(append([]string(nil), c...), "--format", "xlsx", "--output", out)
		if code, _, stderr := dewcell(args...); code != 0 {
			t.Errorf("%q: exit %d: %s", args, code, stderr)
			continue
		}
		checkWorkbook(t, strings.Join(c, " "), out)
	}
	checkWorkbook(t, "demo folder", filepath.Join(dir, "demo", demoWorkbook))
	// A workbook needs a file.
	if code, _, stderr := dewcell("fluid", exampleStudy, "--format", "xlsx"); code != 2 || !strings.Contains(stderr, "--output") {
		t.Errorf("--format xlsx without --output: exit %d, %q; want 2 and a word on --output", code, stderr)
	}
}

func checkWorkbook(t *testing.T, what, path string) {
	t.Helper()
	f, err := excelize.OpenFile(path)
	if err != nil {
		t.Errorf("%s: excelize cannot open %s: %v", what, path, err)
		return
	}
	defer f.Close()
	sheets := f.GetSheetList()
	if len(sheets) < 2 || sheets[0] != "Cover" {
		t.Errorf("%s: sheets %q, want a cover and the results", what, sheets)
		return
	}
	cover, _ := f.GetRows("Cover")
	var text strings.Builder
	for _, r := range cover {
		text.WriteString(strings.Join(r, " ") + "\n")
	}
	if !strings.Contains(text.String(), "qualified, licensed professionals") {
		t.Errorf("%s: the cover lacks the caution:\n%s", what, text.String())
	}
	numbers := 0
	for _, sh := range sheets[1:] {
		rows, err := f.GetRows(sh)
		if err != nil {
			t.Fatal(err)
		}
		for i, r := range rows {
			for j, v := range r {
				if i < 2 || j == 0 || v == "" { // the title, the header, the labels
					continue
				}
				ref, _ := excelize.CoordinatesToCellName(j+1, i+1)
				typ, err := f.GetCellType(sh, ref)
				if err != nil {
					t.Fatal(err)
				}
				_, isNum := strconv.ParseFloat(strings.ReplaceAll(v, ",", ""), 64)
				if isNum == nil && typ != excelize.CellTypeNumber && typ != excelize.CellTypeUnset {
					t.Errorf("%s: sheet %q cell %s holds %q as %v, not as a number", what, sh, ref, v, typ)
				}
				if typ == excelize.CellTypeNumber || typ == excelize.CellTypeUnset && isNum == nil {
					numbers++
				}
			}
		}
	}
	if numbers == 0 {
		t.Errorf("%s: no numbers in the workbook", what)
	}
}
