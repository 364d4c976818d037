package main

import (
	"encoding/csv"
	"encoding/json"
	"io/fs"
	"maps"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
)

// demoTables are the results demo writes, each as JSON and its first
// table as CSV.
var demoTables = []string{"fluid", "saturation", "envelope", "check", "comparison", "tuning", "comparison_after", "depletion", "expansion", "separator", "in_place", "recovery", "forecast", "maintain", "history"}

// demoFigures are the figures demo draws, each as SVG and PNG.
var demoFigures = []string{"phase-envelope",
	"check-hoffman", "check-liquid-density", "check-two-phase-z",
	"lab-liquid-dropout", "lab-produced", "lab-z-factors", "lab-relative-volume",
	"tune-liquid-dropout", "tune-produced", "tune-z-factors", "tune-relative-volume", "tune-objective",
	"cvd-liquid-dropout", "cvd-gas-composition", "cce-relative-volume", "cce-liquid-volume",
	"recovery", "condensate-saturation",
	"forecast-gas-rate", "forecast-condensate-rate", "forecast-pressure", "forecast-cumulative-gas", "forecast-cumulative-liquid", "forecast-cash-flow",
	"maintain-condensate-rate", "maintain-condensate-cumulative", "maintain-pressure", "maintain-cgr", "maintain-npv", "maintain-sensitivity-cycling", "maintain-sensitivity-water-injection",
	"history-p-over-z"}

// demoParts are the further tables demo writes as CSV, by result.
var demoParts = map[string][]string{
	"fluid":      {"summary", "kij"},
	"envelope":   {"extremes", "summary"},
	"depletion":  {"gas-composition", "liquid-composition", "summary"},
	"separator":  {"compositions", "summary"},
	"in_place":   {"summary"},
	"recovery":   {"summary"},
	"forecast":   {"steps", "summary", "cash-flow"},
	"maintain":   {"summary", "years-depletion", "years-cycling", "years-water-injection", "sensitivity"},
	"history":    {"summary"},
	"expansion":  {"summary"},
	"saturation": nil, // the summary is its only table
	"check":      {"findings", "k-values", "summary"},
	// The laboratory quantities of the example's report, one table each.
	"comparison":       {"gas-composition", "liquid-dropout", "liquid-volume", "produced", "relative-volume", "summary", "z-gas", "z-two-phase", "z", "density"},
	"comparison_after": {"gas-composition", "liquid-dropout", "liquid-volume", "produced", "relative-volume", "summary", "z-gas", "z-two-phase", "z", "density"},
	"tuning":           {"correlation", "objective-history", "parameters", "summary", "tuned-components"},
}

// demoFileNames lists the files demo writes, besides its marker.
func demoFileNames() []string {
	var want []string
	for _, name := range demoTables {
		want = append(want, name+".csv", name+".json")
		for _, p := range demoParts[name] {
			want = append(want, name+"-"+p+".csv")
		}
	}
	for _, f := range demoFigures {
		want = append(want, f+".svg", f+".png")
	}
	return append(want, demoWorkbook, demoReport)
}

func TestDemoFolder(t *testing.T) {
	parent := t.TempDir()
	dir := filepath.Join(parent, "out")
	code, stdout, stderr := dewcell("demo", "--dir", dir)
	if code != 0 {
		t.Fatalf("demo: exit %d: %s", code, stderr)
	}
	for _, want := range []string{`\nComponents\n`, `\| Upper dew pressure +\| +[0-9]+ \| psia +\|`, "cricondentherm", `\nDepletion steps`,
		`\| Wet gas in place +\| +[0-9.]+ \| Bscf +\|`, `\| Condensate recovery at abandonment +\| +[0-9.]+ \| % +\|`,
		`\| Volumetric wet gas in place +\| +[0-9.]+ \| Bscf +\|`} {
		if !regexp.MustCompile(want).MatchString(stdout) {
			t.Errorf("demo output lacks %q", want)
		}
	}
	if !strings.Contains(stderr, dir) || !strings.Contains(stderr, "caution: screening estimates") {
		t.Errorf("standard error %q does not name the folder %s and give the caution", stderr, dir)
	}
	want := demoFileNames()
	checkDemoFiles(t, dir, want)
	// Every CSV file is one rectangular table with a header of unique keys;
	// every JSON file one object.
	for _, name := range want {
		data, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		switch filepath.Ext(name) {
		case ".json":
			decodeJSON(t, string(data))
			continue
		case ".svg", ".png", ".xlsx", ".html":
			if len(data) < 1000 {
				t.Errorf("%s: %d bytes", name, len(data))
			}
			continue
		}
		recs, err := csv.NewReader(strings.NewReader(string(data))).ReadAll()
		// A list of findings may be empty: the header alone says so.
		if err != nil || len(recs) < 2 && !(name == "check-findings.csv" && len(recs) == 1) {
			t.Errorf("%s: %d records, %v", name, len(recs), err)
			continue
		}
		checkHeader(t, name, recs[0])
	}
	// The files hold what the commands give: in place as inplace does.
	data, _ := os.ReadFile(filepath.Join(dir, "in_place.json"))
	ip, direct := decodeJSON(t, string(data)), runJSON(t, "inplace", exampleStudy)
	checkRel(t, "in_place.json wet gas", num(t, ip, "wet_gas_in_place_mmscf"), num(t, direct, "wet_gas_in_place_mmscf"), 1e-15, "dewcell inplace on the example")
	data, _ = os.ReadFile(filepath.Join(dir, "envelope.json"))
	if env := decodeJSON(t, string(data)); len(rows(t, env, "points")) < 10 {
		t.Error("envelope.json lacks the envelope points")
	}

	// A second run replaces the folder of the first.
	if code, _, stderr = dewcell("demo", "--units", "metric", "--format", "json", "--dir", dir); code != 0 {
		t.Fatalf("second demo into %s: exit %d: %s", dir, code, stderr)
	}
	if data, _ := os.ReadFile(filepath.Join(dir, "in_place.csv")); !strings.Contains(string(data), "_1e6sm3") {
		t.Error("the second demo, in metric units, did not replace in_place.csv")
	}
	checkDemoFiles(t, dir, want)
	onlyFile(t, parent, "out") // no temporary folders left beside it

	// One of demo's files replaced by a folder of the user's: refused, and
	// the folder and what it holds stay.
	hist := filepath.Join(dir, "history.csv")
	if err := os.Remove(hist); err != nil {
		t.Fatal(err)
	}
	if err := os.Mkdir(hist, 0o755); err != nil {
		t.Fatal(err)
	}
	mine := filepath.Join(hist, "mine.txt")
	if err := os.WriteFile(mine, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr = dewcell("demo", "--dir", dir)
	if code != 2 || stdout != "" || !strings.Contains(stderr, "history.csv") || !strings.Contains(stderr, "folder") {
		t.Errorf("demo into a demo folder whose history.csv is now a folder: exit %d, stderr %q; want 2 and a refusal naming history.csv", code, stderr)
	}
	if data, err := os.ReadFile(mine); err != nil || string(data) != "mine" {
		t.Errorf("the user's %s: %q, %v; want it untouched", mine, data, err)
	}
	onlyFile(t, parent, "out")
	if err := os.RemoveAll(hist); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(hist, []byte("restored"), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, stderr = dewcell("demo", "--dir", dir); code != 2 || !strings.Contains(stderr, "history.csv") || !strings.Contains(stderr, "changed") {
		t.Errorf("demo into a demo folder whose history.csv was rewritten: exit %d, stderr %q; want 2 and a refusal naming history.csv", code, stderr)
	}
	if data, _ := os.ReadFile(hist); string(data) != "restored" {
		t.Error("the rewritten history.csv changed")
	}
	if err := os.Remove(hist); err != nil {
		t.Fatal(err)
	}
	want = slices.DeleteFunc(want, func(s string) bool { return s == "history.csv" })

	// A file the user added: the folder is no longer the demo's alone.
	notes := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(notes, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr = dewcell("demo", "--dir", dir)
	if code != 2 || stdout != "" || !strings.Contains(stderr, "notes.txt") {
		t.Errorf("demo into a demo folder with notes.txt: exit %d, stderr %q; want 2 and a refusal naming notes.txt", code, stderr)
	}
	if data, _ := os.ReadFile(notes); string(data) != "mine" {
		t.Error("notes.txt changed")
	}
	checkDemoFiles(t, dir, append(want, "notes.txt"))
}

// checkDemoFiles checks that dir holds the marker and exactly the files
// want.
func checkDemoFiles(t *testing.T, dir string, want []string) {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	want = append(slices.Clone(want), demoMarker)
	slices.Sort(got)
	slices.Sort(want)
	if !slices.Equal(got, want) {
		t.Errorf("%s holds %q, want %q", dir, got, want)
	}
}

// TestDemoRefuses: demo writes into no folder but a new or empty one, or an
// earlier demo's, and leaves nothing behind when it refuses.
func TestDemoRefuses(t *testing.T) {
	parent := t.TempDir()
	busy := filepath.Join(parent, "busy")
	if err := os.Mkdir(busy, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(busy, "report.docx"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(parent, "file")
	if err := os.WriteFile(file, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	// A marker that is not the demo's does not count.
	fake := filepath.Join(parent, "fake")
	if err := os.Mkdir(fake, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(fake, demoMarker), []byte("my own notes\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ dir, msg string }{
		{busy, "report.docx"},
		{file, "is a file"},
		{fake, demoMarker},
		{filepath.Join(parent, "no", "such"), "does not exist"},
		{"", "empty"},
	} {
		code, stdout, stderr := dewcell("demo", "--dir", c.dir)
		if code != 2 || stdout != "" || !strings.Contains(stderr, "--dir") || !strings.Contains(stderr, c.msg) {
			t.Errorf("demo --dir %q: exit %d, stderr %q; want 2 and a refusal mentioning %q", c.dir, code, stderr, c.msg)
		}
	}
	onlyFile(t, parent, "busy", "file", "fake")
	onlyFile(t, busy, "report.docx")

	// An empty folder is fine.
	empty := filepath.Join(parent, "empty")
	if err := os.Mkdir(empty, 0o755); err != nil {
		t.Fatal(err)
	}
	if code, _, stderr := dewcell("demo", "--dir", empty); code != 0 {
		t.Errorf("demo into an empty folder: exit %d: %s", code, stderr)
	}
	onlyFile(t, parent, "busy", "file", "fake", "empty")
}

// TestDemoWriteFails: a write that fails half-way leaves neither the
// temporary folder nor a half-written one, and an earlier demo's folder as
// it was.
func TestDemoWriteFails(t *testing.T) {
	parent := t.TempDir()
	dir := filepath.Join(parent, "out")
	good := []demoFile{{"a.csv", []byte("x\n1\n")}, {"a.json", []byte("{}\n")}}
	if _, err := writeDemoDir(dir, good); err != nil {
		t.Fatal(err)
	}
	bad := []demoFile{{"b.csv", []byte("y\n2\n")}, {"sub/b.json", []byte("{}\n")}}
	if _, err := writeDemoDir(dir, bad); err == nil {
		t.Fatal("a file name with a slash was written")
	}
	onlyFile(t, parent, "out")
	checkDemoFiles(t, dir, []string{"a.csv", "a.json"})
	if _, err := writeDemoDir(filepath.Join(parent, "new"), []demoFile{{"c.csv", nil}, {"bad\x00name.json", nil}}); err == nil {
		t.Fatal("a file name with a NUL byte was written")
	}
	onlyFile(t, parent, "out")

	// The marker lists the files with their sizes and SHA-256 sums (of
	// "x\n1\n" and "{}\n", as GNU coreutils sha256sum prints them), and a folder of them
	// is the demo's.
	listed, ok := readDemoMarker(dir)
	wantSums := map[string]demoEntry{
		"a.csv":  {size: 4, sum: "daff832f802000e645771a60983c76c963f6ee602a6230e45237bd360e91cc1a", known: true},
		"a.json": {size: 3, sum: "ca3d163bab055381827226140568f3bef7eaac187cebd76878e0b63e9e442356", known: true},
	}
	if !ok || !maps.Equal(listed, wantSums) {
		t.Errorf("marker lists %v (%v), want %v", listed, ok, wantSums)
	}
}

// TestDemoUserFiles: demo replaces a folder only when everything in it is
// what an earlier demo wrote, checked by kind, size and SHA-256 against its
// marker; a file replaced by a folder, a symbolic link, a changed file, a
// marker that is a link or that records no contents, and a folder that is
// itself a symbolic link are refused, and nothing of the user's is removed.
func TestDemoUserFiles(t *testing.T) {
	good := []demoFile{{"a.csv", []byte("x\n1\n")}, {"a.json", []byte("{}\n")}}
	setup := func(t *testing.T) (parent, dir string) {
		parent = t.TempDir()
		dir = filepath.Join(parent, "out")
		if _, err := writeDemoDir(dir, good); err != nil {
			t.Fatal(err)
		}
		if err := checkDemoDir(dir); err != nil {
			t.Fatalf("a folder demo wrote is refused: %v", err)
		}
		return parent, dir
	}
	elsewhere := filepath.Join(t.TempDir(), "mine.txt")
	if err := os.WriteFile(elsewhere, []byte("x\n1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name   string
		change func(t *testing.T, dir string)
		msg    string
	}{
		{"file replaced by a folder", func(t *testing.T, dir string) {
			must(t, os.Remove(filepath.Join(dir, "a.csv")))
			must(t, os.Mkdir(filepath.Join(dir, "a.csv"), 0o755))
			must(t, os.WriteFile(filepath.Join(dir, "a.csv", "keep.txt"), []byte("mine"), 0o644))
		}, "a.csv is now a folder"},
		{"file replaced by a symbolic link", func(t *testing.T, dir string) {
			must(t, os.Remove(filepath.Join(dir, "a.csv")))
			must(t, os.Symlink(elsewhere, filepath.Join(dir, "a.csv")))
		}, "a.csv is now a symbolic link"},
		{"file changed, same size", func(t *testing.T, dir string) {
			must(t, os.WriteFile(filepath.Join(dir, "a.csv"), []byte("x\n2\n"), 0o644))
		}, "a.csv has been changed"},
		{"file changed, other size", func(t *testing.T, dir string) {
			must(t, os.WriteFile(filepath.Join(dir, "a.json"), []byte("{\"mine\": 1}\n"), 0o644))
		}, "a.json has been changed"},
		{"marker replaced by a symbolic link", func(t *testing.T, dir string) {
			m := filepath.Join(dir, demoMarker)
			data, err := os.ReadFile(m)
			must(t, err)
			other := filepath.Join(t.TempDir(), "marker")
			must(t, os.WriteFile(other, data, 0o644))
			must(t, os.Remove(m))
			must(t, os.Symlink(other, m))
		}, demoMarker},
		{"marker without contents", func(t *testing.T, dir string) {
			must(t, os.WriteFile(filepath.Join(dir, demoMarker), []byte(demoSignature+"\n\n  a.csv\n  a.json\n"), 0o644))
		}, "does not record"},
	} {
		t.Run(c.name, func(t *testing.T) {
			parent, dir := setup(t)
			c.change(t, dir)
			before := snapshot(t, dir)
			err := checkDemoDir(dir)
			if err == nil || !strings.Contains(err.Error(), c.msg) {
				t.Errorf("checkDemoDir: %v; want a refusal mentioning %q", err, c.msg)
			}
			if _, werr := writeDemoDir(dir, good); werr == nil {
				t.Error("writeDemoDir replaced the folder")
			}
			if after := snapshot(t, dir); !maps.Equal(before, after) {
				t.Errorf("the folder changed: %v, now %v", before, after)
			}
			onlyFile(t, parent, "out")
		})
	}
	if data, err := os.ReadFile(elsewhere); err != nil || string(data) != "x\n1\n" {
		t.Errorf("the file a link pointed to: %q, %v", data, err)
	}

	// The folder itself a symbolic link to a demo folder: refused, the link stays.
	parent, dir := setup(t)
	link := filepath.Join(parent, "link")
	must(t, os.Symlink(dir, link))
	if err := checkDemoDir(link); err == nil || !strings.Contains(err.Error(), "symbolic link") {
		t.Errorf("checkDemoDir(a link to a demo folder): %v; want a refusal", err)
	}
	if li, err := os.Lstat(link); err != nil || li.Mode()&os.ModeSymlink == 0 {
		t.Error("the symbolic link was replaced")
	}
}

func must(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}

// snapshot maps every path under dir to its kind and content.
func snapshot(t *testing.T, dir string) map[string]string {
	t.Helper()
	m := map[string]string{}
	err := filepath.WalkDir(dir, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		switch {
		case d.Type()&fs.ModeSymlink != 0:
			target, err := os.Readlink(path)
			m[path] = "link " + target
			return err
		case d.IsDir():
			m[path] = "folder"
		default:
			data, err := os.ReadFile(path)
			m[path] = "file " + string(data)
			return err
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// TestDemoJSON: with --format json the summaries come as one object keyed by
// report name.
func TestDemoJSON(t *testing.T) {
	code, out, stderr := dewcell("demo", "--format", "json", "--dir", filepath.Join(t.TempDir(), "d"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var doc map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range demoTables {
		if _, ok := doc[k]; !ok {
			t.Errorf("demo JSON lacks %q", k)
		}
	}
}
