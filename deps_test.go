package dewcell

import (
	"bytes"
	"encoding/json"
	"errors"
	"io"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"
)

// The layering of the module (DEVELOPERS.md, "Architecture"), in the manner
// of the Go standard library's go/build dependency test: for each package of
// the module, what it may import directly. "std" is the standard library,
// "gonum" gonum.org/v1/gonum and its packages, "any" anything at all; other
// entries are packages of the module. A package of the module missing here
// fails the test: add it, with what it may import.
const (
	std      = "std"
	gonum    = "gonum"
	anything = "any"
)

var (
	physMay = []string{std}
	eosMay  = []string{std, gonum, "dewcell/internal/phys"}
	cvdMay  = append(slices.Clone(eosMay), "dewcell/eos")
	mbalMay = append(slices.Clone(cvdMay), "dewcell/cvd")
)

var layers = map[string][]string{
	"dewcell":               {std}, // this package: the layering test
	"dewcell/internal/phys": physMay,
	"dewcell/eos":           eosMay,
	"dewcell/cvd":           cvdMay,
	"dewcell/mbal":          mbalMay,
	"dewcell/uncertain":     {std, gonum}, // the statistics of probabilistic runs
	"dewcell/examples":      {std},
	// Helpers of the library's tests: the invented test fluids and the
	// reference data of testdata/.
	"dewcell/internal/testfluid": {std, "dewcell/internal/phys", "dewcell/eos"},
	"dewcell/internal/refdata":   {std, "dewcell/internal/phys", "dewcell/eos"},
	// The command line and its private helpers.
	"dewcell/cmd/dewcell":                {anything},
	"dewcell/cmd/dewcell/internal/units": {anything},
	"dewcell/cmd/dewcell/internal/study": {anything},
	// The output layer: the report model and its encoders, which know
	// nothing of the study, the solvers or the command line.
	"dewcell/cmd/dewcell/internal/report":          {std, "dewcell/cmd/dewcell/internal/units"},
	"dewcell/cmd/dewcell/internal/report/figure":   {std, "gonum.org/v1/plot", "golang.org/x/image", "dewcell/cmd/dewcell/internal/report", "dewcell/cmd/dewcell/internal/units"},
	"dewcell/cmd/dewcell/internal/report/workbook": {std, "github.com/xuri/excelize/v2", "dewcell/cmd/dewcell/internal/report", "dewcell/cmd/dewcell/internal/units"},
	"dewcell/cmd/dewcell/internal/report/html":     {std, "dewcell/cmd/dewcell/internal/report", "dewcell/cmd/dewcell/internal/report/figure", "dewcell/cmd/dewcell/internal/units"},
}

// testHelpers are the packages the tests of a library package may import
// beyond what the package itself may.
var testHelpers = []string{"dewcell/internal/testfluid", "dewcell/internal/refdata"}

// forbidden are the import paths, with everything below them, that no
// library package depends on, even indirectly: the command line, its output
// and progress libraries, and the command itself.
var forbidden = []string{
	"github.com/urfave/cli",
	"github.com/olekukonko/tablewriter",
	"gonum.org/v1/plot",
	"github.com/xuri/excelize",
	"github.com/chromedp",
	"github.com/schollz/progressbar",
	"dewcell/cmd",
}

// library says whether the rule on forbidden dependencies applies to pkg:
// every package of the module except the command line (under cmd/) and the
// invented test fluids.
func library(pkg string) bool {
	return !under(pkg, "dewcell/cmd") && pkg != "dewcell/internal/testfluid"
}

// under says whether path is root or a package below it.
func under(path, root string) bool { return path == root || strings.HasPrefix(path, root+"/") }

// goPackage is what the test reads of `go list -json`.
type goPackage struct {
	ImportPath   string
	Standard     bool
	ForTest      string
	Module       *struct{ Path string }
	Imports      []string
	TestImports  []string
	XTestImports []string
	Deps         []string
}

// listPackages runs `go list -e -deps -test -json ./...` in the module root
// (this package's folder) and returns the module's packages, the import
// paths of the standard library among all dependencies, and the imports of
// every package listed. With -e a package that does not build, for an
// import that cannot be found, still lists its imports, so the rules below
// name the offending one.
func listPackages(t *testing.T) (module []goPackage, standard map[string]bool, imports map[string][]string) {
	t.Helper()
	cmd := exec.Command("go", "list", "-e", "-deps", "-test", "-json", "./...")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, stderr.String())
	}
	standard, imports = map[string]bool{}, map[string][]string{}
	seen := map[string]bool{}
	dec := json.NewDecoder(bytes.NewReader(out))
	for {
		var p goPackage
		if err := dec.Decode(&p); errors.Is(err, io.EOF) {
			break
		} else if err != nil {
			t.Fatalf("go list output: %v", err)
		}
		path, _, variant := strings.Cut(p.ImportPath, " [") // "fmt [dewcell/eos.test]"
		if !variant && p.ForTest == "" {
			imports[path] = p.Imports
		}
		if p.Standard {
			standard[path] = true
			continue
		}
		if variant || p.ForTest != "" || strings.HasSuffix(path, ".test") || p.Module == nil || p.Module.Path != "dewcell" || seen[path] {
			continue
		}
		seen[path] = true
		module = append(module, p)
	}
	if len(module) == 0 {
		t.Fatal("go list found no package of the module dewcell")
	}
	return module, standard, imports
}

// chain is the shortest import chain from one package to another, as
// "a -> b -> c", found in imports breadth first.
func chain(imports map[string][]string, from, to string) string {
	prev := map[string]string{from: ""}
	queue := []string{from}
	for len(queue) > 0 {
		p := queue[0]
		queue = queue[1:]
		if p == to {
			var path []string
			for ; p != ""; p = prev[p] {
				path = append(path, p)
			}
			slices.Reverse(path)
			return strings.Join(path, " -> ")
		}
		for _, q := range imports[p] {
			if _, ok := prev[q]; !ok {
				prev[q] = p
				queue = append(queue, q)
			}
		}
	}
	return from + " -> … -> " + to
}

// touchSources looks at every Go file and go.mod of the module, so that
// the test cache, which knows the files a test reads but not what the go
// command it runs reads, reruns this test whenever an import may have
// changed.
func touchSources(t *testing.T) {
	t.Helper()
	err := filepath.WalkDir(".", func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && path != "." && (strings.HasPrefix(d.Name(), ".") || d.Name() == "testdata") {
			return filepath.SkipDir
		}
		if !d.IsDir() && (strings.HasSuffix(path, ".go") || path == "go.mod") {
			_, err = os.Stat(path)
		}
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
}

// allowed says whether a package whose rules are may may import imp.
func allowed(may []string, imp string, standard map[string]bool) bool {
	for _, m := range may {
		switch m {
		case anything:
			return true
		case std:
			if standard[imp] {
				return true
			}
		case gonum:
			if under(imp, "gonum.org/v1/gonum") {
				return true
			}
		default:
			// A package of the module by its path; a library outside
			// it with all its packages (gonum.org/v1/plot/vg).
			if imp == m || !under(m, "dewcell") && under(imp, m) {
				return true
			}
		}
	}
	return false
}

// TestDependencies enforces the layering: each package of the module
// imports only what the table above allows (its tests also the test
// helpers), and no library package depends, even indirectly, on anything
// forbidden.
func TestDependencies(t *testing.T) {
	touchSources(t)
	pkgs, standard, imports := listPackages(t)
	listed := map[string]bool{}
	for _, p := range pkgs {
		listed[p.ImportPath] = true
		may, ok := layers[p.ImportPath]
		if !ok {
			t.Errorf("%s is a package of the module that the layering table of deps_test.go does not list: add it to layers, with what it may import (see DEVELOPERS.md, Architecture)", p.ImportPath)
			continue
		}
		for _, imp := range p.Imports {
			if !allowed(may, imp, standard) {
				t.Errorf("%s imports %s, which the layering allows it not (it may import %s; deps_test.go, DEVELOPERS.md)", p.ImportPath, imp, strings.Join(may, ", "))
			}
		}
		testMay := append(append(slices.Clone(may), p.ImportPath), testHelpers...)
		for _, imp := range append(slices.Clone(p.TestImports), p.XTestImports...) {
			if !allowed(testMay, imp, standard) {
				t.Errorf("the tests of %s import %s, which the layering allows them not (they may import %s; deps_test.go)", p.ImportPath, imp, strings.Join(testMay, ", "))
			}
		}
		if !library(p.ImportPath) {
			continue
		}
		for _, f := range forbidden { // once per forbidden root, at its first package
			if i := slices.IndexFunc(p.Deps, func(dep string) bool { return under(dep, f) }); i >= 0 {
				dep := p.Deps[i]
				t.Errorf("%s depends on %s (%s): a library package must not depend on %s, even indirectly", p.ImportPath, dep, chain(imports, p.ImportPath, dep), f)
			}
		}
	}
	var stale []string
	for pkg := range layers {
		if !listed[pkg] {
			stale = append(stale, pkg)
		}
	}
	sort.Strings(stale)
	for _, pkg := range stale {
		t.Errorf("the layering table of deps_test.go lists %s, which is no package of the module: remove it", pkg)
	}
}

// TestDependencyRules checks the rules themselves on made-up import lists,
// so that a change to them that lets everything through fails.
func TestDependencyRules(t *testing.T) {
	standard := map[string]bool{"fmt": true, "math": true}
	for _, c := range []struct {
		pkg, imp string
		want     bool
	}{
		{"dewcell/eos", "math", true},
		{"dewcell/eos", "gonum.org/v1/gonum/mat", true},
		{"dewcell/eos", "dewcell/internal/phys", true},
		{"dewcell/eos", "dewcell/cvd", false},
		{"dewcell/eos", "gonum.org/v1/plot", false},
		{"dewcell/eos", "github.com/urfave/cli/v2", false},
		{"dewcell/internal/phys", "dewcell/eos", false},
		{"dewcell/cvd", "dewcell/eos", true},
		{"dewcell/cvd", "dewcell/mbal", false},
		{"dewcell/mbal", "dewcell/cvd", true},
		{"dewcell/mbal", "dewcell/cmd/dewcell/internal/units", false},
		{"dewcell/mbal", "github.com/BurntSushi/toml", false},
		{"dewcell/cmd/dewcell", "github.com/olekukonko/tablewriter", true},
	} {
		if got := allowed(layers[c.pkg], c.imp, standard); got != c.want {
			t.Errorf("%s importing %s: allowed %v, want %v (DEVELOPERS.md, Architecture)", c.pkg, c.imp, got, c.want)
		}
	}
	for _, c := range []struct {
		pkg  string
		want bool
	}{{"dewcell/eos", true}, {"dewcell/internal/phys", true}, {"dewcell/internal/refdata", true},
		{"dewcell/internal/testfluid", false}, {"dewcell/cmd/dewcell", false}, {"dewcell/cmd/dewcell/internal/units", false}} {
		if library(c.pkg) != c.want {
			t.Errorf("library(%s) = %v, want %v", c.pkg, !c.want, c.want)
		}
	}
	if !under("github.com/urfave/cli/v2", "github.com/urfave/cli") || under("github.com/urfave/clix", "github.com/urfave/cli") {
		t.Error("under does not match an import path and the paths below it only")
	}
}
