package reduce

import (
	"go/ast"
	"go/parser"
	"go/token"
	"regexp"
	"strconv"
	"testing"
)

// Every flag code is kebab-case (the result document's contract) and
// unique, checked on the constants of flags.go.
func TestFlagCodes(t *testing.T) {
	f, err := parser.ParseFile(token.NewFileSet(), "flags.go", nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	kebab := regexp.MustCompile(`^[a-z0-9]+(-[a-z0-9]+)*$`)
	seen := map[string]string{}
	ast.Inspect(f, func(n ast.Node) bool {
		vs, ok := n.(*ast.ValueSpec)
		if !ok || len(vs.Values) != 1 {
			return true
		}
		lit, ok := vs.Values[0].(*ast.BasicLit)
		if !ok || lit.Kind != token.STRING {
			return true
		}
		code, _ := strconv.Unquote(lit.Value)
		name := vs.Names[0].Name
		if !kebab.MatchString(code) {
			t.Errorf("%s = %q is not kebab-case", name, code)
		}
		if other, dup := seen[code]; dup {
			t.Errorf("%s and %s share %q", name, other, code)
		}
		seen[code] = name
		return true
	})
	if len(seen) < 10 {
		t.Errorf("found only %d flag codes", len(seen))
	}
}
