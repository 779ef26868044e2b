// Package circuit solves linear lumped circuits of resistors, inductors
// (optionally magnetically coupled), capacitors and independent sources:
// in sinusoidal steady state (AC) and, as state equations for an ODE
// integrator, in the time domain. It also holds closed forms for the
// two-coil inductive link (reflected impedance, tuning capacitors, quality
// factors, link efficiency and its maximum).
//
// It is pure Go on float64 and complex128 in coherent SI units (V, A, ohm,
// H, F, Hz, W) and knows nothing of the Loopwise language; builtins/ wraps
// it.
//
// # Conventions
//
//   - Every element has two nodes, From and To. Its current is the current
//     flowing through it from From to To and its voltage is
//     V(From) − V(To) (the passive sign convention), so the average power
//     ½·Re(V·I*) is the power it absorbs: a source that delivers power has
//     a negative power.
//   - A voltage source holds V(From) − V(To) = Phasor: From is its +
//     terminal. A current source drives Phasor through itself from From to
//     To, so it pushes current into its To node.
//   - Phasors are peak amplitudes: a source phasor 10·e^{j30°} V is the
//     waveform 10·cos(ωt + 30°) V, and average power is ½·Re(V·I*).
//   - The reference node is Circuit.Ground, "0" when empty.
//   - Coupled inductors obey V_k = jω·L_k·I_k + Σ jω·M_kj·I_j, with each
//     voltage and current taken From→To (a dot at each From node).
//
// # Method
//
// Modified nodal analysis: Ho, Ruehli and Brennan, "The modified nodal
// approach to network analysis", IEEE Trans. Circuits and Systems 22(6),
// 1975. The unknowns are the node voltages plus the currents of the
// elements that are not admittances (voltage sources, 0-ohm resistors,
// and for AC every inductor, whose branch equation carries the mutual
// terms). gonum has no complex LU, so the complex system A + jB is solved
// as the equivalent real system [[A −B],[B A]] of twice the size with
// gonum's mat.LU, after scaling rows and columns to unit largest entry;
// the LU's condition estimate decides whether the circuit is singular.
//
// In the time domain the state is the inductor currents and the capacitor
// voltages. At each instant the resistive network, with inductors as
// current sources and capacitors as voltage sources at their state values,
// is solved by the same modified nodal analysis; it gives the inductor
// voltages v_L and capacitor currents i_C, and then di_L/dt = L⁻¹·v_L (L
// the inductance matrix with the mutual inductances, by Cholesky) and
// dv_C/dt = i_C / C. The network matrix does not change with time and is
// factorised once.
//
// # Errors and limits
//
// Every error is a plain error whose text is written for the user (it
// names elements, nodes and values, never Go names); a caller adds the
// statement's position. Nothing here panics on any Circuit, whatever its
// values (a test feeds random circuits with extreme and non-finite
// values). A system whose condition estimate exceeds 1e13 is refused as
// singular; ACSolution.Cond and StateSystem.Cond report the estimate of an
// accepted one (relative error about Cond·1.1e-16), and results that
// overflow float64 are refused. The solver is dense: memory and time grow
// as the square and the cube of (nodes + branch currents), twice that in
// AC, which suits circuits of tens of elements.
//
// # For the language
//
// Arguments in SI: ohm, H, F, Hz (AC takes f; Link takes ω = 2πf in s^-1),
// peak V and A. Results: Voltage, ElementVoltage (V), Current (A),
// InputImpedance (ohm), all peak phasors; Power (W, average); link
// efficiencies are plain fractions. LargestVoltage gives what a caution
// about dangerous voltages needs (resonant circuits magnify the sources'
// voltages by their Q).
package circuit
