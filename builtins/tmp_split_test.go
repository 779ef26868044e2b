package builtins_test

import (
	"testing"

	"loopwise/builtins"
	"loopwise/lang"
	"loopwise/runtime"
)

func BenchmarkTmpSplit(b *testing.B) {
	for i := range e2eStatements {
		b.Run(string(rune('0'+i)), func(b *testing.B) {
			s := runtime.NewSession(builtins.Standard())
			for j := 0; j < i; j++ {
				if _, err := s.Eval(lang.Pos{Line: j + 1, Col: 1}, e2eStatements[j]); err != nil {
					b.Fatal(err)
				}
			}
			for b.Loop() {
				if _, err := s.Eval(lang.Pos{Line: i + 1, Col: 1}, e2eStatements[i]); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkTmpPlaneOverhead(b *testing.B) {
	s := runtime.NewSession(builtins.Standard())
	if _, err := s.Eval(lang.Pos{Line: 1, Col: 1}, "coil = segment([0,0,0] m, [0,0,1] mm)"); err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := s.Eval(lang.Pos{Line: 3, Col: 1}, e2eStatements[2]); err != nil {
			b.Fatal(err)
		}
	}
}
