package circuit_test

import (
	"fmt"
	"math"
	"math/cmplx"

	"loopwise/builtins/circuit"
)

// A 10 V (peak) source drives a series RLC at its resonance
// f0 = 1/(2π√(LC)): the source sees Z = R, so the current is 10 V / 5 ohm
// = 2 A peak and the resistor takes ½·(2 A)²·5 ohm = 10 W.
func ExampleCircuit_AC() {
	c := &circuit.Circuit{Elements: []circuit.Element{
		{Name: "V1", Kind: circuit.VoltageSource, From: "in", To: "0", Phasor: 10},
		{Name: "R1", Kind: circuit.Resistor, From: "in", To: "a", Value: 5},
		{Name: "L1", Kind: circuit.Inductor, From: "a", To: "b", Value: 1e-3},
		{Name: "C1", Kind: circuit.Capacitor, From: "b", To: "0", Value: 1e-6},
	}}
	s, err := c.AC(1 / (2 * math.Pi * math.Sqrt(1e-3*1e-6)))
	if err != nil {
		fmt.Println(err)
		return
	}
	z, _ := s.InputImpedance("V1")
	i, _ := s.Current("R1")
	p, _ := s.Power("R1")
	ps, _ := s.Power("V1")
	fmt.Printf("Z = %.6f ohm, |I| = %.6f A, P(R1) = %.6f W, P(V1) = %.6f W\n", real(z), cmplx.Abs(i), p, ps)
	// Output: Z = 5.000000 ohm, |I| = 2.000000 A, P(R1) = 10.000000 W, P(V1) = -10.000000 W
}

// A series–series link at 100 kHz with k = 0.2 and coil Q of 100 and 80:
// k²Q1Q2 = 320, so η_max = 320/(1 + √321)² ≈ 0.8943 and the load that
// reaches it is R2·√321.
func ExampleLink_MaxEfficiency() {
	w := 2 * math.Pi * 100e3
	l := circuit.Link{Omega: w, L1: 24e-6, R1: w * 24e-6 / 100, L2: 9e-6, R2: w * 9e-6 / 80, K: 0.2}
	eta, _ := l.MaxEfficiency()
	rl, c2, _ := l.OptimalLoadSS()
	got, _ := l.EfficiencySS(rl, c2)
	fmt.Printf("η_max = %.4f, R_L/R2 = %.4f, η at that load = %.4f\n", eta, rl/l.R2, got)
	// Output: η_max = 0.8943, R_L/R2 = 17.9165, η at that load = 0.8943
}
