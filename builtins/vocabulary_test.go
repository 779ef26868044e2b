package builtins_test

import (
	"regexp"
	"slices"
	"strings"
	"testing"

	"loopwise/builtins"
)

// TestVocabulary holds the builtins to the naming rules in DEVELOPERS.md
// ("Naming rules for builtins"), so that a new builtin cannot quietly break
// them.
func TestVocabulary(t *testing.T) {
	lib := builtins.Standard()
	names := map[string]bool{}
	for _, f := range lib.Funcs {
		// one builtin per name: a second would silently hide the first
		if names[f.Name] {
			t.Errorf("two builtins are named %s", f.Name)
		}
		names[f.Name] = true
		// a source comes first wherever a builtin takes one
		for i, p := range f.Params {
			if (p == "source" || p == "source_or_region") && i != 0 {
				t.Errorf("%s: the source is argument %d, not the first", f.Name, i+1)
			}
		}
		// a table comes first wherever a builtin takes one
		if i := slices.Index(f.Params, "table"); i > 0 {
			t.Errorf("%s: the table is argument %d, not the first", f.Name, i+1)
		}
		// material properties last: nothing but the material's own
		// properties may follow a resistivity or a material
		for i, p := range f.Params {
			if p == "resistivity" || p == "material" {
				for _, q := range f.Params[i+1:] {
					if q != "relative_permeability" && q != "temperature" {
						t.Errorf("%s: %s comes after the material (%s)", f.Name, q, p)
					}
				}
			}
		}
		// pairs are not interleaved: path1, path2 before their radii
		if i, j := slices.Index(f.Params, "path2"), slices.Index(f.Params, "wire_radius1"); i >= 0 && j >= 0 && j < i {
			t.Errorf("%s interleaves its arguments: %v", f.Name, f.Params)
		}
		// coils are placed by their centre
		if slices.Contains(f.Params, "base") {
			t.Errorf("%s is placed by a base point; coils are placed by their centre", f.Name)
		}
		if f.Help != nil && strings.Contains(f.Help.Signature, "Ω·") {
			t.Errorf("%s: the signature writes a unit the language does not read: %s", f.Name, f.Help.Signature)
		}
		// peak or rms: a parameter or result that is an AC amplitude says which
		if f.Help != nil && regexp.MustCompile(`\b(B|V|I)_(amp|amplitude)\b`).MatchString(f.Help.Signature) {
			t.Errorf("%s: an amplitude must say peak or rms: %s", f.Name, f.Help.Signature)
		}
	}
	// one scheme for fields at a point and fields as values
	for _, n := range []string{"b_at", "a_at", "e_at", "b_field", "a_field", "e_field", "rectangle", "rectangle_surface", "dfluxdt_toroid"} {
		if !names[n] {
			t.Errorf("missing builtin %s", n)
		}
	}
	for _, n := range []string{"bfield", "vpot", "efield", "field_b", "field_a", "field_e", "rect_surface", "dbdt_toroid"} {
		if names[n] {
			t.Errorf("old name %s is still a builtin (no aliases are kept)", n)
		}
	}
}
