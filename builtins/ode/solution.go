package ode

import (
	"fmt"
	"math"
	"sort"
)

// Solution is the result of Solve: the accepted steps and, for each, the
// collocation polynomial that gives y anywhere inside it.
//
// Internally time runs forwards: s = dir·t, with dir = −1 when t1 < t0.
type Solution struct {
	n     int
	dir   float64
	start []float64 // s at the start of each accepted step, then s at the end of the last
	h     []float64 // the step size of each accepted step (in s)
	y0    []float64 // y at t0
	// data holds, per accepted step, 4n numbers: y at the start of the
	// step and the stage increments Z1, Z2, Z3 (y at s + c_i h minus y at s).
	data  []float64
	stats Stats
}

// Dim is the number of equations.
func (s *Solution) Dim() int { return s.n }

// Times returns the ends of the accepted steps, t0 first. After an error
// during integration the last entry is where the accepted part ends.
func (s *Solution) Times() []float64 {
	out := make([]float64, len(s.start))
	for i, v := range s.start {
		out[i] = s.dir * v
	}
	return out
}

// Stats reports the work done: steps, rejections, f evaluations,
// Jacobians and LU factorisations.
func (s *Solution) Stats() Stats { return s.stats }

// At writes y(t) into y, which must have length Dim(). Inside a step the
// value is the step's collocation polynomial (of degree 3, accurate to
// order 3 between the step ends and to order 5 at them; Hairer and
// Wanner 1996, §IV.8); at the ends of steps it is exactly the accepted
// value. A t outside the integrated range is moved to its nearer end; a
// NaN t gives NaN.
func (s *Solution) At(t float64, y []float64) {
	if len(y) != s.n {
		panic(fmt.Sprintf("ode: At given a slice of length %d for %d equations", len(y), s.n))
	}
	if math.IsNaN(t) {
		for i := range y {
			y[i] = math.NaN()
		}
		return
	}
	m := len(s.h)
	if m == 0 {
		copy(y, s.y0)
		return
	}
	u := s.dir * t
	first, last := s.start[0], s.start[m]
	switch {
	case u <= first:
		copy(y, s.y0)
		return
	case u >= last:
		k := m - 1
		s.eval(k, 1, y)
		return
	}
	// The step k with start[k] < u <= start[k+1].
	k := sort.SearchFloat64s(s.start, u) - 1
	if k < 0 {
		k = 0
	}
	if k > m-1 {
		k = m - 1
	}
	theta := (u - s.start[k]) / s.h[k]
	if u == s.start[k+1] {
		theta = 1
	}
	s.eval(k, theta, y)
}

// eval writes the collocation polynomial of step k at θ = (s−start)/h.
func (s *Solution) eval(k int, theta float64, y []float64) {
	n := s.n
	d := s.data[4*n*k : 4*n*(k+1)]
	l1, l2, l3 := lagrange(theta)
	for i := range y {
		y[i] = d[i] + l1*d[n+i] + l2*d[2*n+i] + l3*d[3*n+i]
	}
}

// lagrange returns the weights of Z1, Z2, Z3 in the cubic through
// (0, y0), (c1, y0+Z1), (c2, y0+Z2), (1, y0+Z3), evaluated at θ. The
// weight of y0 is 1 because the four Lagrange weights sum to 1.
func lagrange(theta float64) (l1, l2, l3 float64) {
	l1 = theta * (theta - c2) * (theta - 1) / (c1 * (c1 - c2) * (c1 - 1))
	l2 = theta * (theta - c1) * (theta - 1) / (c2 * (c2 - c1) * (c2 - 1))
	l3 = theta * (theta - c1) * (theta - c2) / ((1 - c1) * (1 - c2))
	return
}
