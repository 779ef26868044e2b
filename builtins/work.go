package builtins

import (
	"errors"
	"math"
	"runtime"

	"loopwise/builtins/em"
	lw "loopwise/runtime"
)

// Cost estimates, in elementary evaluations (one straight segment's field
// at one point; see runtime.EvalsPerSecond). They are rough — within a
// factor of a few of the work done — and are there to refuse, before it
// starts, work that would take minutes or hours.
const (
	// lineNodes is about how many integrand calls the adaptive line
	// integrals make per quarter turn of an arc or helix, or per straight
	// piece: one 15-point rule and, on average, one bisection.
	lineNodes = 45
	// surfaceNodes is about how many integrand calls the adaptive surface
	// integral makes (a 225-point rule and a few bisections; the flux of a
	// 20-turn helix through a disk inside it makes about 1000).
	surfaceNodes = 2000
	// pairEvals is the cost of one pair of pieces in the inductance loops
	// (the coaxial test).
	pairEvals = 3
	// segmentJointEvals is the cost, per straight piece, of its terms with
	// the straight pieces it meets at an angle (adaptive 2-D quadrature of
	// the kernel averaged over the wire's section): a 400-sided polygon
	// takes about 1.2 s more than with the plain reduced kernel on two
	// cores, about 3 ms of one core a straight piece, i.e. 2.5e5
	// evaluations a piece at 11 ns; rounded up.
	segmentJointEvals = 3e5
	// coaxialEvals is the cost of one pair of coaxial circles (Maxwell's
	// formula and the test): the inductance of a stack of 10 000 rings
	// (1e8 pairs) takes about 6 s on two busy cores, about 120 ns a pair;
	// 3000 rings about 1 s, about 220 ns a pair.
	coaxialEvals = 20
	// coaxialHelixEvals is the cost per integrand call of the single
	// integral of two coaxial helices or arcs (a cosine, a root and an
	// inverse hyperbolic sine: a few segment fields' worth).
	coaxialHelixEvals = 4
)

// coaxialHelixCost is about the cost of the single integral of two
// coaxial helical pieces: its calls follow the quarter turns of both.
func coaxialHelixCost(p, q em.Prim) float64 {
	return coaxialHelixEvals * (nodes(em.Path{Prims: []em.Prim{p}}) + nodes(em.Path{Prims: []em.Prim{q}}))
}

// fncEnv is fnc for a builtin that needs the session (budget, interrupt,
// progress).
func fncEnv(name string, params []string, lo, hi int, help *lw.Help, call func(env lw.Env, args []lw.Value) (lw.Value, error)) *lw.Func {
	return &lw.Func{Name: name, Params: params, MinArgs: lo, MaxArgs: hi, CallEnv: call, Help: help}
}

// mutualCost is about the cost of mutual(p1, p2): path 1's field along
// path 2 (Maxwell's formula for circles coaxial with a single circle).
func mutualCost(p1, p2 em.Path) float64 {
	w := pathWeight(p1)
	c := 0.0
	for _, q := range p2.Prims {
		if len(p1.Prims) == 1 && em.CoaxialCircles(p1.Prims[0], q) {
			c += coaxialEvals
			continue
		}
		rest := w
		if (len(p1.Prims) <= em.MaxCoaxialPieces || q.IsCircle()) && q.Kind != em.Segment {
			// coaxial helical pairs by single integrals, the rest of
			// path 1 along q
			for _, p := range p1.Prims {
				switch {
				case em.CoaxialCircles(p, q):
					c += coaxialEvals
					rest -= primWeight(p)
				case em.CoaxialHelical(p, q):
					c += coaxialHelixCost(p, q)
					rest -= primWeight(p)
				}
			}
		}
		c += math.Max(rest, 0) * nodes(em.Path{Prims: []em.Prim{q}})
	}
	return c
}

// inductanceCost is about the cost of inductance(p, a): each piece's
// share is its own term (a 1-D integral), the field of all the other
// pieces along it (Maxwell's formula for coaxial circles) and a test of
// every pair; the pieces are shared among all cores.
func inductanceCost(p em.Path) float64 {
	n := float64(len(p.Prims))
	if coaxialStack(p) {
		return (n*nodes(em.Path{Prims: p.Prims[:1]}) + coaxialEvals*n*n) / min(cores(), n)
	}
	w := pathWeight(p)
	c := pairEvals * n * n
	for i, q := range p.Prims {
		qn := nodes(em.Path{Prims: []em.Prim{q}})
		rest := w - primWeight(q)
		if q.Kind != em.Segment {
			// coaxial helical pieces take a single integral each
			for j, r := range p.Prims {
				if j != i && em.CoaxialHelical(q, r) {
					rest -= primWeight(r)
					c += coaxialHelixCost(q, r)
				}
			}
		}
		c += qn * (math.Max(rest, 0) + 3)
		if q.Kind == em.Segment {
			c += segmentJointEvals
		}
	}
	return c / min(cores(), n)
}

// coaxialStack reports whether a path is circles on one axis (a ring
// stack), whose pairs take Maxwell's formula.
func coaxialStack(p em.Path) bool {
	if len(p.Prims) < 2 {
		return false
	}
	for _, q := range p.Prims[1:] {
		if !em.CoaxialCircles(p.Prims[0], q) {
			return false
		}
	}
	return true
}

// cores is how many goroutines the parallel loops use.
func cores() float64 { return float64(runtime.GOMAXPROCS(0)) }

// charge counts work against the statement's budget (nothing without an
// environment: a builtin called from a test).
func charge(env lw.Env, fn string, evals float64) error {
	if env == nil {
		return nil
	}
	return env.Charge(fn, evals)
}

// control returns tol with env's interrupt and a progress report labelled
// fn; without an environment, tol unchanged.
func control(env lw.Env, fn string, tol em.Tol) em.Tol {
	if env == nil {
		return tol
	}
	tol.Stop = env.Err
	tol.Progress = func(done, total int) { env.Progress(fn, done, total) }
	return tol
}

// stopping reports whether err says the statement is to stop (interrupted
// or over its budget); such errors are passed on unchanged.
func stopping(err error) bool {
	return errors.Is(err, lw.ErrInterrupted) || errors.Is(err, lw.ErrBudget)
}

// nodes is about how many integrand calls the line integrals make along a
// path.
func nodes(p em.Path) float64 {
	n := 0.0
	for _, q := range p.Prims {
		if q.Kind == em.Segment {
			n += lineNodes
			continue
		}
		n += lineNodes * (math.Floor(math.Abs(q.Span)/(math.Pi/2)) + 1) // quarter turns
	}
	return n
}

// fieldCost is about the cost of the field of sources at one point.
func fieldCost(srcs []em.Source) float64 {
	w := 0.0
	for _, s := range srcs {
		w += pathWeight(s.Path)
		if s.Shape != nil {
			w += s.Shape.Weight()
		}
	}
	return w
}
