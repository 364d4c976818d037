package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// demoTables are the files demo writes, besides its marker.
var demoTables = []string{"fluid", "saturation", "envelope", "depletion", "separator", "in_place", "recovery", "history"}

func TestDemoFolder(t *testing.T) {
	parent := t.TempDir()
	dir := filepath.Join(parent, "out")
	code, stdout, stderr := dewcell("demo", "--dir", dir)
	if code != 0 {
		t.Fatalf("demo: exit %d: %s", code, stderr)
	}
	for _, want := range []string{"components", "upper dew pressure [psia]", "cricondentherm", "depletion steps",
		"wet gas in place [MMscf]", "condensate recovery at abandonment [%]", "volumetric wet gas in place [MMscf]"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("demo output lacks %q", want)
		}
	}
	if !strings.Contains(stderr, dir) || !strings.Contains(stderr, "caution: screening estimates") {
		t.Errorf("standard error %q does not name the folder %s and give the caution", stderr, dir)
	}
	var want []string
	for _, name := range demoTables {
		want = append(want, name+".csv", name+".json")
	}
	checkDemoFiles(t, dir, want)
	// Every CSV file is one rectangular table with a header of unique keys;
	// every JSON file one object.
	for _, name := range demoTables {
		data, err := os.ReadFile(filepath.Join(dir, name+".csv"))
		if err != nil {
			t.Fatal(err)
		}
		recs, err := csv.NewReader(strings.NewReader(string(data))).ReadAll()
		if err != nil || len(recs) < 2 {
			t.Errorf("%s.csv: %d records, %v", name, len(recs), err)
			continue
		}
		checkHeader(t, name+".csv", recs[0])
		data, err = os.ReadFile(filepath.Join(dir, name+".json"))
		if err != nil {
			t.Fatal(err)
		}
		decodeJSON(t, string(data))
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
	stale := filepath.Join(dir, "history.csv")
	if err := os.WriteFile(stale, []byte("stale"), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, stderr = dewcell("demo", "--units", "metric", "--format", "json", "--dir", dir); code != 0 {
		t.Fatalf("second demo into %s: exit %d: %s", dir, code, stderr)
	}
	if data, _ := os.ReadFile(stale); string(data) == "stale" {
		t.Error("the second demo did not replace history.csv")
	}
	checkDemoFiles(t, dir, want)
	onlyFile(t, parent, "out") // no temporary folders left beside it

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
	if err := writeDemoDir(dir, good); err != nil {
		t.Fatal(err)
	}
	bad := []demoFile{{"b.csv", []byte("y\n2\n")}, {"sub/b.json", []byte("{}\n")}}
	if err := writeDemoDir(dir, bad); err == nil {
		t.Fatal("a file name with a slash was written")
	}
	onlyFile(t, parent, "out")
	checkDemoFiles(t, dir, []string{"a.csv", "a.json"})
	if err := writeDemoDir(filepath.Join(parent, "new"), []demoFile{{"c.csv", nil}, {"bad\x00name.json", nil}}); err == nil {
		t.Fatal("a file name with a NUL byte was written")
	}
	onlyFile(t, parent, "out")

	// The marker lists the files, and a folder of them is the demo's.
	listed, ok := readDemoMarker(dir)
	if !ok || !listed["a.csv"] || !listed["a.json"] || len(listed) != 2 {
		t.Errorf("marker lists %v (%v), want a.csv and a.json", listed, ok)
	}
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
