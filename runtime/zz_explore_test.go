package runtime_test

import (
	"fmt"
	"os"
	"strings"
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func TestZZExplore(t *testing.T) {
	data, _ := os.ReadFile("/tmp/explore/in.txt")
	for _, block := range strings.Split(strings.TrimSpace(string(data)), "\n") {
		parts := strings.Split(block, " ;; ")
		s := runtime.NewSession(builtins.Standard())
		for i, p := range parts {
			line := 1
			if i == len(parts)-1 {
				line = 3
			}
			res, err := s.Eval(lang.Pos{File: "t.lw", Line: line, Col: 1}, p)
			if i == len(parts)-1 {
				if err != nil {
					le, ok := lang.AsError(err)
					fmt.Printf("IN %q\n%T ok=%v col=%v\n%s\n\n", p, err, ok, func() int { if ok { return le.Pos.Col }; return -1 }(), err)
				} else {
					fmt.Printf("IN %q\nOK %s\n\n", p, res.Text)
				}
			} else if err != nil {
				fmt.Printf("SETUP ERR %q: %v\n", p, err)
			}
		}
	}
}
