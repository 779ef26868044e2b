// Package ode integrates systems of ordinary differential equations
// y' = f(t, y) that may be stiff: circuits whose time constants span
// decades (a capacitor discharging into a coil, coupled secondaries, RLC
// tanks) and electromechanical models. gonum has no ODE solver, so this
// one is written here; it uses gonum/mat for its linear algebra (LU
// factorisation) and imports nothing else outside the standard library.
//
// # Method
//
// The three-stage Radau IIA method of order 5, an implicit Runge–Kutta
// method that is L-stable (its stability function tends to zero as
// hλ → −∞, so stiff components decay in one step instead of ringing), as
// described in E. Hairer and G. Wanner, Solving Ordinary Differential
// Equations II: Stiff and Differential-Algebraic Problems, 2nd ed.,
// Springer, 1996, §IV.8:
//
//   - the stage equations are solved by simplified Newton iteration with
//     one Jacobian ∂f/∂y per step (reused while the iteration converges
//     fast), its convergence rate θ monitored and the step cut when the
//     iteration would not converge in time (§IV.8, "Stopping criterion");
//   - the local error is estimated by the embedded formula of order 3
//     filtered through (I − hγ0 J)⁻¹, which keeps the estimate bounded for
//     stiff components (§IV.8, eqs. (8.19)–(8.20)), with the second filter
//     after a rejected or first step;
//   - the step size is chosen from the error estimate with a safety factor
//     that falls with the number of Newton iterations, and with the
//     predictive (Gustafsson) controller after accepted steps;
//   - the collocation polynomial of each step (degree 3 through y0 and the
//     three stage values) is the dense output, and also gives the Newton
//     starting values for the next step.
//
// The book solves the 3n×3n Newton system by transforming A⁻¹ to its one
// real and two complex eigenvalues, which costs one real and one complex
// n×n factorisation. Here the 3n×3n system (I − h A⊗J) ΔZ = r is
// factorised directly with gonum's LU: the systems Loopwise builds are
// small (a few to a few dozen states), where the transformation saves
// little, and the direct form has no complex arithmetic to get wrong. The
// price is about 18n³ flops a factorisation instead of about 10n³/3 (one
// real and one complex n×n LU); BenchmarkCircuit measures the whole.
//
// The tolerances are mapped before use as the authors' RADAU5 code does
// (from memory): the error estimate is of order 3 but steers a method of
// order 5, so the relative tolerance r becomes 0.1·r^(2/3) and the
// absolute tolerance keeps its ratio to it. With that mapping the global
// error at the end of an integration is usually of the size of the
// requested tolerance; it is not a guarantee.
//
// # Defaults
//
// RelTol 1e-6, AbsTol 1e-9 (in the units of y), MaxSteps 100000 (accepted
// and rejected steps together), no limit on the step size. The first step
// is chosen by the starting step algorithm of E. Hairer, S. P. Nørsett and
// G. Wanner, Solving Ordinary Differential Equations I, 2nd ed., Springer,
// 1993, §II.4, unless Options.InitialStep is given; where that algorithm
// falls back to an absolute 1e-6, this package takes 1e-6 of |t1 − t0|,
// so that the choice does not depend on the unit of time. Options.Check
// is polled before every attempted step.
//
// # Errors
//
// Bad input (no equations, t1 == t0, non-finite t0, t1 or y0, negative
// or unusable options) is refused before any work. During integration
// the errors are *Error values naming t, wrapping ErrStepUnderflow,
// ErrTooManySteps, ErrNonFinite or ErrSingular; errors returned by f, by
// the Jacobian function or by Options.Check are returned unchanged. After
// an error during integration Solve also returns the part of the
// solution it had accepted, from t0 to the last entry of Times.
//
// Integration may run backwards (t1 < t0).
//
// # Size
//
// The Newton matrix is dense and 3n×3n: memory grows as 9n² floats and
// each factorisation as 18n³ flops, which suits the tens of states of a
// circuit, not a discretised field. Callers that take n from users should
// bound it.
package ode
