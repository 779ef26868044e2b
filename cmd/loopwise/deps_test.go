package main

import (
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// allowedImports is a statement of policy: which Loopwise packages and
// which outside modules each package may import (non-test files). Imports
// flow one way: cmd → builtins → runtime → lang; the numerical core
// builtins/em, the wire-loss numerics builtins/wire, the circuit solver
// builtins/circuit and the ODE integrator builtins/ode know nothing of the
// language; the drawing package builtins/draw takes plain data and knows
// nothing of it either; builtins/em reads the CPU's features (x/sys/cpu)
// to choose its vector kernels; only cmd
// touches the terminal (liner).
var allowedImports = map[string][]string{
	"lang":          {},
	"runtime":       {"loopwise/lang", "github.com/expr-lang/expr", "gonum.org/v1/gonum"},
	"builtins":      {"loopwise/runtime", "loopwise/lang", "loopwise/builtins/em", "loopwise/builtins/draw", "loopwise/builtins/wire", "loopwise/builtins/circuit", "loopwise/builtins/ode", "gonum.org/v1/gonum"},
	"builtins/em":   {"gonum.org/v1/gonum", "golang.org/x/sys/cpu"}, // cpu: which vector kernels run
	"builtins/wire": {"gonum.org/v1/gonum"},
	"builtins/ode":  {"gonum.org/v1/gonum"},
	"builtins/draw": {"gonum.org/v1/plot"},
	"cmd/loopwise":  {"loopwise/runtime", "loopwise/lang", "loopwise/builtins", "github.com/peterh/liner", "golang.org/x/term", "github.com/yuin/goldmark"},

	// The linear circuit solver knows nothing of the language either.
	"builtins/circuit": {"gonum.org/v1/gonum"},
}

func TestImportPolicy(t *testing.T) {
	root := filepath.Join("..", "..")
	for pkg, allowed := range allowedImports {
		dir := filepath.Join(root, filepath.FromSlash(pkg))
		entries, err := os.ReadDir(dir)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range entries {
			name := e.Name()
			if !strings.HasSuffix(name, ".go") || strings.HasSuffix(name, "_test.go") {
				continue
			}
			f, err := parser.ParseFile(token.NewFileSet(), filepath.Join(dir, name), nil, parser.ImportsOnly)
			if err != nil {
				t.Fatal(err)
			}
			for _, imp := range f.Imports {
				path, _ := strconv.Unquote(imp.Path.Value)
				if !strings.Contains(strings.Split(path, "/")[0], ".") && !strings.HasPrefix(path, "loopwise") {
					continue // standard library
				}
				ok := false
				for _, a := range allowed {
					if path == a || strings.HasPrefix(path, a+"/") {
						ok = true
					}
				}
				if !ok {
					t.Errorf("%s/%s imports %s, which the policy does not allow", pkg, name, path)
				}
			}
		}
	}
}
