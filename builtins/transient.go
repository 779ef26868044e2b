package builtins

import (
	"errors"
	"fmt"
	"math"

	"loopwise/builtins/circuit"
	"loopwise/builtins/ode"
	"loopwise/runtime"
)

// Circuits in time: the state equations of builtins/circuit integrated by
// the stiff solver of builtins/ode, sampled by its dense output into a
// table.

const refTransient = "state equations (inductor currents, capacitor voltages) by modified nodal analysis; Radau IIA of order 5 with error control and dense output (E. Hairer and G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, §IV.8)"

// Integration tolerances of transient and ring_launch: relative 1e-8 and
// absolute 1e-12 in the states' units (A, V, m, m/s). The tests find the
// results within 1e-7 relative of closed forms (RL step, RLC in three
// dampings) and the energy balance within 1e-7 of the initial energy.
const (
	transientRelTol = 1e-8
	transientAbsTol = 1e-12
)

// defaultSamples is how many rows transient gives unless told.
const defaultSamples = 201

// odeCost is about what one right-hand-side evaluation of n states costs,
// in elementary evaluations, for the work budget: a few solves of the
// factorised network.
func odeCost(n int) float64 { return 50 + 10*float64(n*n) }

// maxStates bounds a transient: the integrator's Newton matrix is dense,
// 3n×3n.
const maxStates = 200

func transientBuiltin(env runtime.Env, args []runtime.Value) (runtime.Value, error) {
	const fn = "transient"
	n, err := networkArg(fn, args, 0)
	if err != nil {
		return nil, err
	}
	tEnd, err := ofDim(fn, args, 1, dimTime)
	if err != nil {
		return nil, err
	}
	if !(tEnd > 0) {
		return nil, errorf("%s: the end time must be above zero, not %s", fn, runtime.Format(runtime.Quantity{V: tEnd, D: dimTime}, 6))
	}
	samples := defaultSamples
	if len(args) > 2 {
		if samples, err = count(fn, args, 2, 2, maxSweep); err != nil {
			return nil, err
		}
	}
	// the sources as functions of time; the first error a user function
	// gives stops the integration and is reported
	var srcErr error
	srcAt := func(name string, t float64) float64 {
		p := n.parts[name]
		switch x := p.src.(type) {
		case runtime.Quantity:
			return x.V
		case *runtime.Func:
			v, err := x.Invoke(env, []runtime.Value{runtime.Quantity{V: t, D: dimTime}})
			if err == nil {
				want := dimVolt
				if p.el.Kind == circuit.CurrentSource {
					want = dimCurrent
				}
				q, ok := v.(runtime.Quantity)
				if !ok || q.D != want {
					err = errorf("%s: the source %s's function %s must return %s, not %s", fn, name, x.Signature(), want.Describe(), runtime.TypeName(v))
				} else {
					return q.V
				}
			}
			if srcErr == nil {
				srcErr = err
			}
			return math.NaN()
		}
		return math.NaN()
	}
	for _, e := range n.c.Elements {
		if z, ok := n.parts[e.Name].src.(runtime.Complex); ok {
			return nil, errorf("%s: the source %s is a phasor (%s), which stands for a sinusoid in steady state; for transient give its value as a function of time, such as V(t) = 10 V * cos(2*pi*50 Hz*t), or use ac_solve", fn, e.Name, runtime.Format(z, 6))
		}
	}
	sys, err := n.c.StateEquations(srcAt)
	if err != nil {
		return nil, errorf("%s: %v", fn, err)
	}
	if sys.Dim() > maxStates {
		return nil, errorf("%s: %d inductors and capacitors is more than the limit of %d", fn, sys.Dim(), maxStates)
	}
	y0 := make([]float64, sys.Dim())
	for i, st := range sys.States {
		y0[i] = n.parts[st.Element].init
	}
	cost := odeCost(sys.Dim())
	f := func(t float64, y, dy []float64) error {
		if err := sys.F(t, y, dy); err != nil {
			if srcErr != nil {
				return srcErr
			}
			return errorf("%s: %v", fn, err)
		}
		if srcErr != nil {
			return srcErr
		}
		return charge(env, fn, cost)
	}
	var sol, fine *ode.Solution
	if sys.Dim() > 0 {
		sol, err = ode.Solve(f, 0, tEnd, y0, ode.Options{RelTol: transientRelTol, AbsTol: transientAbsTol, Check: checkFunc(env)})
		if err != nil {
			return nil, odeErr(fn, err)
		}
		// the same at a hundred times tighter tolerances: twice its
		// change is the error estimate of the result (the integrator's
		// own estimates are per step, not of the accumulated error; for
		// the underdamped discharge of the tests the tighter solve's
		// error is 40 times smaller than this one's, and the factor 2,
		// common practice, covers a ratio down to 2)
		fine, err = ode.Solve(f, 0, tEnd, y0, ode.Options{RelTol: transientRelTol / 100, AbsTol: transientAbsTol / 100, Check: checkFunc(env)})
		if err != nil {
			return nil, odeErr(fn, err)
		}
	}
	tab := &Table{Title: "transient of the circuit"}
	tab.Cols = append(tab.Cols, "t")
	tab.Dims = append(tab.Dims, dimTime)
	for _, e := range n.c.Elements {
		tab.Cols = append(tab.Cols, "I "+e.Name)
		tab.Dims = append(tab.Dims, dimCurrent)
	}
	for _, e := range n.c.Elements {
		if e.Kind == circuit.Inductor || e.Kind == circuit.Capacitor {
			tab.Cols = append(tab.Cols, "V "+e.Name)
			tab.Dims = append(tab.Dims, dimVolt)
		}
	}
	y := make([]float64, sys.Dim())
	rowAt := func(s *ode.Solution, t float64) ([]float64, error) {
		if s != nil {
			s.At(t, y)
		}
		in, err := sys.At(t, y)
		if err != nil {
			if srcErr != nil {
				return nil, srcErr
			}
			return nil, errorf("%s: %v", fn, err)
		}
		row := []float64{t}
		for _, e := range n.c.Elements {
			i, err := in.Current(e.Name)
			if err != nil {
				return nil, errorf("%s: %v", fn, err)
			}
			row = append(row, i)
		}
		for _, e := range n.c.Elements {
			if e.Kind == circuit.Inductor || e.Kind == circuit.Capacitor {
				v, err := in.ElementVoltage(e.Name)
				if err != nil {
					return nil, errorf("%s: %v", fn, err)
				}
				row = append(row, v)
			}
		}
		return row, nil
	}
	if fine != nil {
		tab.NumErr = make([]float64, len(tab.Cols))
	}
	for k := 0; k < samples; k++ {
		t := tEnd * float64(k) / float64(samples-1)
		row, err := rowAt(sol, t)
		if err != nil {
			return nil, err
		}
		tab.Rows = append(tab.Rows, row)
		if fine != nil {
			ref, err := rowAt(fine, t)
			if err != nil {
				return nil, err
			}
			for j := 1; j < len(row); j++ {
				// the change, and the rounding of the network's solve
				tab.NumErr[j] = math.Max(tab.NumErr[j], 2*math.Abs(row[j]-ref[j])+1e-13*math.Abs(row[j]))
			}
		}
	}
	if c := storedEnergyCaution(n); c != "" {
		tab.Caution = c
	}
	return tab, nil
}

// checkFunc is the integrator's poll of interrupts.
func checkFunc(env runtime.Env) func() error {
	if env == nil {
		return nil
	}
	return env.Err
}

// odeErr words an integrator error for the user.
func odeErr(fn string, err error) error {
	var ae *argError
	if stopping(err) || errors.As(err, &ae) {
		return err
	}
	var oe *ode.Error
	if errors.As(err, &oe) {
		switch {
		case errors.Is(err, ode.ErrTooManySteps):
			return errorf("%s: the integration took too many steps by t = %s (the circuit's fastest time constant may be far below the end time; shorten the run or check the values)", fn, runtime.Format(runtime.Quantity{V: oe.T, D: dimTime}, 6))
		case errors.Is(err, ode.ErrStepUnderflow):
			return errorf("%s: the step size fell to nothing at t = %s: the solution changes too fast there to follow (a source with a jump, or values out of scale)", fn, runtime.Format(runtime.Quantity{V: oe.T, D: dimTime}, 6))
		case errors.Is(err, ode.ErrNonFinite):
			return errorf("%s: the solution is no longer finite at t = %s", fn, runtime.Format(runtime.Quantity{V: oe.T, D: dimTime}, 6))
		}
		return errorf("%s: the integration failed at t = %s: %s", fn, runtime.Format(runtime.Quantity{V: oe.T, D: dimTime}, 6), oe.Detail)
	}
	return errorf("%s: %v", fn, err)
}

// storedEnergyThreshold is the stored energy above which a capacitor or
// inductor is treated as hazardous: 20 J, the "hazardous energy level" of
// IEC 60950-1 (§1.2.8.10, from memory; IEC 62368-1 classifies by energy
// in a similar way).
const storedEnergyThreshold = 20.0

// storedEnergyCaution warns of a circuit whose initial stored energy is
// above storedEnergyThreshold, or whose capacitors start above extra-low
// voltage (120 V DC).
func storedEnergyCaution(n *Network) string {
	w, vmax := 0.0, 0.0
	for _, e := range n.c.Elements {
		p := n.parts[e.Name]
		switch e.Kind {
		case circuit.Capacitor:
			w += 0.5 * e.Value * p.init * p.init
			vmax = math.Max(vmax, math.Abs(p.init))
		case circuit.Inductor:
			w += 0.5 * e.Value * p.init * p.init
		}
	}
	if w <= storedEnergyThreshold && vmax <= elvDC {
		return ""
	}
	return fmt.Sprintf("caution: the circuit starts with %s stored (capacitors up to %s): above %g J (the hazardous energy level of IEC 60950-1, from memory) or above 120 V DC, it can burn, shock or kill, and a charged capacitor stays dangerous after the power is off. %s",
		runtime.Format(runtime.Quantity{V: w, D: dimJoule}, 4), runtime.Format(runtime.Quantity{V: vmax, D: dimVolt}, 4), storedEnergyThreshold, deferText)
}
