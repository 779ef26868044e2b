package circuit

import (
	"fmt"
	"math"
)

// Link is two coupled coils at one angular frequency, with closed forms
// for the two-coil inductive link: a primary coil L1 with series
// resistance R1 driven by a source, coupled by M = k·√(L1·L2) to a
// secondary coil L2 with series resistance R2 that feeds a load R_L
// through a tuning capacitor C2, either in series with the load
// (series–series, "SS") or across it (series–parallel, "SP"). The primary
// is tuned by a series capacitor C1, which sets the current the source
// draws but not the efficiency.
//
// Efficiency is the power into the load over the power the source
// delivers into the primary's terminals (coil losses counted, the
// source's own internal resistance not, unless it is included in R1).
// For a secondary loop closed by a load network of impedance zl that
// passes all the power it takes to the load resistor (its reactive parts
// lossless):
//
//	η = Re(Zr)/(R1 + Re(Zr)) · Re(zl)/(R2 + Re(zl)),
//	Zr = ω²M²/Z2,  Z2 = R2 + jωL2 + zl.
//
// Derivation: the secondary current I2 flows through R2 and through zl, so
// the secondary passes the fraction Re(zl)/(R2 + Re(zl)) of its power to
// the load. The primary current I1 flows through R1 and through the
// reflected impedance Zr (see ReflectedImpedance), and the power reaching
// the secondary is ½|I1|²·Re(Zr), so the primary passes the fraction
// Re(Zr)/(R1 + Re(Zr)). The primary's tuning capacitor is lossless and
// changes neither fraction.
//
// Sources, from memory: M. Zargham and P. G. Gulak, "Maximum achievable
// efficiency in near-field coupled power-transfer systems", IEEE Trans.
// Biomedical Circuits and Systems 6(3), 2012 (the bound η_max and the
// load that reaches it); M. Kiani and M. Ghovanloo, "The circuit theory
// behind coupled-mode magnetic resonance-based wireless power
// transmission", IEEE Trans. Circuits and Systems I 59(9), 2012 (reflected
// impedance and the efficiency of tuned links). Every formula is derived
// in its comment from Kirchhoff's laws so that it can be checked without
// them; the tests compare each with the general solver (Circuit.AC) on
// the same circuit.
type Link struct {
	Omega  float64 // angular frequency ω = 2πf, s^-1
	L1, R1 float64 // primary inductance (H) and series resistance (ohm)
	L2, R2 float64 // secondary inductance (H) and series resistance (ohm)
	K      float64 // coupling coefficient, −1 ≤ k ≤ 1 (the sign only sets the phase)
}

// Check refuses a link whose numbers are out of range: ω, L1, L2, R1, R2
// finite and > 0, |k| ≤ 1.
func (l Link) Check() error {
	for _, p := range []struct {
		name, unit string
		v          float64
	}{{"omega", "s^-1", l.Omega}, {"L1", "H", l.L1}, {"R1", "ohm", l.R1}, {"L2", "H", l.L2}, {"R2", "ohm", l.R2}} {
		if !(p.v > 0) || math.IsInf(p.v, 0) {
			return fmt.Errorf("link: %s must be finite and > 0 %s, got %g", p.name, p.unit, p.v)
		}
	}
	if !(math.Abs(l.K) <= 1) {
		return fmt.Errorf("link: the coupling coefficient k must be between −1 and 1, got %g", l.K)
	}
	return nil
}

// M is the mutual inductance k·√(L1·L2), H.
func (l Link) M() float64 { return l.K * math.Sqrt(l.L1*l.L2) }

// Q1 is the primary coil's quality factor ω·L1/R1 (the ratio of peak
// stored energy to energy lost per radian).
func (l Link) Q1() float64 { return QualityFactor(l.Omega, l.L1, l.R1) }

// Q2 is the secondary coil's quality factor ω·L2/R2.
func (l Link) Q2() float64 { return QualityFactor(l.Omega, l.L2, l.R2) }

// QualityFactor is ω·L/R of a coil of inductance L and series resistance R.
func QualityFactor(omega, l, r float64) float64 { return omega * l / r }

// ReflectedImpedance is the impedance ω²M²/Z2 that a secondary loop of
// total series impedance Z2 adds in series with the primary.
//
// Derivation (Kirchhoff's voltage law in both loops, currents I1 and I2
// with the dots at the coils' From ends): V1 = Z1·I1 + jωM·I2 and
// 0 = jωM·I1 + Z2·I2, so I2 = −jωM·I1/Z2 and
// V1 = (Z1 + ω²M²/Z2)·I1.
func ReflectedImpedance(omega, m float64, z2 complex128) complex128 {
	return complex(omega*omega*m*m, 0) / z2
}

// SeriesTuning is the capacitance that resonates with L in series at ω:
// jωL + 1/(jωC) = 0 gives C = 1/(ω²L).
func SeriesTuning(omega, l float64) float64 { return 1 / (omega * omega * l) }

// ParallelTuning is the capacitance that, placed across a coil of
// inductance L and series resistance R, makes the admittance at the
// terminals real at ω (the zero-phase, or unity power factor, condition of
// a tank with a lossy coil):
//
//	Y = jωC + 1/(R + jωL) = jωC + (R − jωL)/(R² + ω²L²),
//	Im Y = 0  ⇒  C = L/(R² + ω²L²).
//
// For R → 0 it tends to the series value 1/(ω²L); it differs from it by
// the factor Q²/(1 + Q²), Q = ωL/R.
func ParallelTuning(omega, l, r float64) float64 {
	return l / (r*r + omega*omega*l*l)
}

// efficiency is η of the Link comment for the load network zl.
func (l Link) efficiency(zl complex128) float64 {
	z2 := complex(l.R2, l.Omega*l.L2) + zl
	rr := real(ReflectedImpedance(l.Omega, l.M(), z2))
	return rr / (l.R1 + rr) * real(zl) / (l.R2 + real(zl))
}

func checkLoad(rl, c2 float64) error {
	if !(rl > 0) || math.IsInf(rl, 0) {
		return fmt.Errorf("link: the load resistance must be finite and > 0 ohm, got %g", rl)
	}
	if !(c2 > 0) || math.IsInf(c2, 0) {
		return fmt.Errorf("link: the secondary capacitance must be finite and > 0 F, got %g", c2)
	}
	return nil
}

// SeriesLoad is the impedance of the load rl in series with c2 at ω:
// rl + 1/(jωC2).
func (l Link) SeriesLoad(rl, c2 float64) complex128 {
	return complex(rl, -1/(l.Omega*c2))
}

// ParallelLoad is the impedance of the load rl with c2 across it at ω:
// rl/(1 + jωC2·rl).
func (l Link) ParallelLoad(rl, c2 float64) complex128 {
	return complex(rl, 0) / complex(1, l.Omega*c2*rl)
}

// EfficiencySS is the efficiency of a series–series link: the secondary
// coil, c2 and the load rl in one series loop. With c2 = SeriesTuning(ω,
// L2) it is
//
//	η = ω²M²·R_L / [(R1·(R2 + R_L) + ω²M²)·(R2 + R_L)],
//
// and for any c2 it is the general form of the Link comment with
// zl = R_L + 1/(jωC2).
func (l Link) EfficiencySS(rl, c2 float64) (float64, error) {
	if err := l.Check(); err != nil {
		return 0, err
	}
	if err := checkLoad(rl, c2); err != nil {
		return 0, err
	}
	return l.efficiency(l.SeriesLoad(rl, c2)), nil
}

// EfficiencySP is the efficiency of a series–parallel link: the secondary
// coil feeds the load rl with c2 across it, zl = R_L/(1 + jωC2·R_L). All
// of the power zl takes reaches R_L, since c2 is lossless:
// Re(zl) = R_L/(1 + (ωC2·R_L)²).
func (l Link) EfficiencySP(rl, c2 float64) (float64, error) {
	if err := l.Check(); err != nil {
		return 0, err
	}
	if err := checkLoad(rl, c2); err != nil {
		return 0, err
	}
	return l.efficiency(l.ParallelLoad(rl, c2)), nil
}

// InputImpedance is the impedance a source sees at the primary: the
// primary coil in series with c1 (c1 ≤ 0: no capacitor) and the reflected
// impedance of the secondary loop closed by the load network zl:
// R1 + jωL1 + 1/(jωC1) + ω²M²/(R2 + jωL2 + zl).
func (l Link) InputImpedance(c1 float64, zl complex128) complex128 {
	z1 := complex(l.R1, l.Omega*l.L1)
	if c1 > 0 {
		z1 += complex(0, -1/(l.Omega*c1))
	}
	return z1 + ReflectedImpedance(l.Omega, l.M(), complex(l.R2, l.Omega*l.L2)+zl)
}

// MaxEfficiency is the largest efficiency any passive load network can
// reach with these coils:
//
//	η_max = k²Q1Q2 / (1 + √(1 + k²Q1Q2))²
//
// (Zargham and Gulak 2012, from memory). Derivation for the series–series
// link, which reaches it: with U² = k²Q1Q2, ω²M² = U²·R1·R2; write
// x = R2 + R_L and a = ω²M²/R1 = U²·R2, so η = a(x − R2)/(x(x + a)).
// dη/dx = 0 gives x² − 2R2·x − a·R2 = 0, x = R2(1 + s) with
// s = √(1 + U²); then η = (s² − 1)/(1 + s)² = U²/(1 + s)². It bounds
// every passive load network zl = R + jX: for a fixed R the secondary's
// share R/(R2 + R) does not depend on X, and the primary's share grows
// with Re(Zr) = ω²M²·(R2 + R)/|Z2|², largest when Im(Z2) = 0, i.e.
// X = −ωL2 — the tuned series–series link, whose best R gives η_max.
func (l Link) MaxEfficiency() (float64, error) {
	if err := l.Check(); err != nil {
		return 0, err
	}
	u2 := l.K * l.K * l.Q1() * l.Q2()
	s := math.Sqrt(1 + u2)
	return u2 / ((1 + s) * (1 + s)), nil
}

// OptimalLoadSS is the series–series load that reaches MaxEfficiency:
// R_L = R2·√(1 + k²Q1Q2) with c2 = SeriesTuning(ω, L2) (derivation in
// MaxEfficiency: R_L = x − R2 = R2·s).
func (l Link) OptimalLoadSS() (rl, c2 float64, err error) {
	if err := l.Check(); err != nil {
		return 0, 0, err
	}
	s := math.Sqrt(1 + l.K*l.K*l.Q1()*l.Q2())
	return l.R2 * s, SeriesTuning(l.Omega, l.L2), nil
}

// OptimalLoadSP is the series–parallel load (R_L with c2 across it) that
// reaches MaxEfficiency. The series–series optimum shows that the load
// network must present zl = R2·s − jωL2 (s = √(1 + k²Q1Q2)): its real part
// is the optimal R_L and its reactance cancels the coil's. A parallel
// pair has 1/zl = 1/R_L + jωC2, and
// 1/(R2·s − jωL2) = (R2·s + jωL2)/((R2·s)² + ω²L2²), so
//
//	R_L = ((R2·s)² + ω²L2²)/(R2·s),   C2 = L2/((R2·s)² + ω²L2²),
//
// which is ParallelTuning with the coil's resistance R2 replaced by R2·s.
func (l Link) OptimalLoadSP() (rl, c2 float64, err error) {
	if err := l.Check(); err != nil {
		return 0, 0, err
	}
	rs := l.R2 * math.Sqrt(1+l.K*l.K*l.Q1()*l.Q2())
	d := rs*rs + l.Omega*l.Omega*l.L2*l.L2
	return d / rs, l.L2 / d, nil
}
