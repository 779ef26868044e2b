package ode

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// The Radau IIA method of order 5 (Hairer and Wanner 1996, §IV.5,
// Table 5.6): nodes c, coefficients a (b is the last row of a, the method
// being stiffly accurate).
var (
	sq6 = math.Sqrt(6)
	c1  = (4 - sq6) / 10
	c2  = (4 + sq6) / 10

	aRadau = [3][3]float64{
		{(88 - 7*sq6) / 360, (296 - 169*sq6) / 1800, (-2 + 3*sq6) / 225},
		{(296 + 169*sq6) / 1800, (88 + 7*sq6) / 360, (-2 - 3*sq6) / 225},
		{(16 - sq6) / 36, (16 + sq6) / 36, 1.0 / 9},
	}
	cRadau = [3]float64{c1, c2, 1}

	// γ0 is the inverse of the real eigenvalue of A⁻¹,
	// 30/(6 + 81^(1/3) − 9^(1/3)) ≈ 3.6378 (Hairer and Wanner 1996, §IV.8).
	gamma0 = (6 + math.Cbrt(81) - math.Cbrt(9)) / 30

	// The embedded error estimate is γ0 h f(t0, y0) + Σ e_i Z_i with
	// e = γ0 (−13 − 7√6, −13 + 7√6, −1)/3 (Hairer and Wanner 1996,
	// §IV.8, eq. (8.20) and the text before it).
	eRadau = [3]float64{
		gamma0 * (-13 - 7*sq6) / 3,
		gamma0 * (-13 + 7*sq6) / 3,
		gamma0 * -1 / 3,
	}
)

// Step-size and Newton parameters, as recommended in Hairer and Wanner
// 1996, §IV.8 (the values of their RADAU5 code, from memory).
const (
	maxNewton = 7         // Newton iterations per attempt
	safety    = 0.9       // safety factor of the step-size rule
	facMin    = 1.0 / 8.0 // a step grows by at most 8 ...
	facMax    = 5.0       // ... and shrinks by at most 5 after an error test
	thetaJac  = 0.001     // a Newton rate below this keeps the Jacobian
	keepLow   = 1.0       // a new step within [keepLow, keepHigh]·h keeps h
	keepHigh  = 1.2       // (and so the factorisation) when θ was small
)

var eps = math.Nextafter(1, 2) - 1 // unit round-off of float64 (2^-52)

// radau holds the state of one integration, in the forward time s = dir·t.
type radau struct {
	f        Func
	jac      Jac
	check    func() error
	n        int
	dir      float64
	t, tEnd  float64
	hmax     float64
	span     float64 // |t1 − t0|
	h0       float64 // requested first step, 0 for automatic
	maxSteps int
	rtol     float64 // mapped tolerances (package doc)
	atol     float64
	userRtol float64
	userAtol float64
	fnewt    float64 // Newton stopping tolerance

	y, f0, scal    []float64
	z, fz          [3][]float64
	ytmp, ftmp     []float64
	jm             []float64 // ∂f/∂y, row-major n×n
	m3, e1         *mat.Dense
	lu3, lu1       mat.LU
	rhs3, dz3      *mat.VecDense
	rhs1, err1     *mat.VecDense
	sol            *Solution
	stats          *Stats
	lastNonFinite  bool    // the last rejection was for a non-finite f
	nonFiniteAtT   float64 // where f gave it (in t)
	nonFiniteWhich int
}

func newRadau(f Func, t0, t1 float64, y0 []float64, opt Options) *radau {
	n := len(y0)
	dir := 1.0
	if t1 < t0 {
		dir = -1
	}
	r := &radau{
		f: f, jac: opt.Jac, check: opt.Check, n: n, dir: dir,
		t: dir * t0, tEnd: dir * t1,
		h0: opt.InitialStep, maxSteps: opt.MaxSteps,
		userRtol: opt.RelTol, userAtol: opt.AbsTol,
	}
	span := r.tEnd - r.t
	r.span = span
	r.hmax = span
	if opt.MaxStep > 0 && opt.MaxStep < span {
		r.hmax = opt.MaxStep
	}
	// Tolerance mapping of the RADAU5 code (package doc).
	r.rtol = 0.1 * math.Pow(opt.RelTol, 2.0/3.0)
	r.atol = r.rtol * (opt.AbsTol / opt.RelTol)
	r.fnewt = math.Max(10*eps/r.rtol, math.Min(0.03, math.Sqrt(r.rtol)))

	r.y = append([]float64(nil), y0...)
	r.f0 = make([]float64, n)
	r.scal = make([]float64, n)
	r.ytmp = make([]float64, n)
	r.ftmp = make([]float64, n)
	for i := range r.z {
		r.z[i] = make([]float64, n)
		r.fz[i] = make([]float64, n)
	}
	r.jm = make([]float64, n*n)
	r.m3 = mat.NewDense(3*n, 3*n, nil)
	r.e1 = mat.NewDense(n, n, nil)
	r.rhs3 = mat.NewVecDense(3*n, nil)
	r.dz3 = mat.NewVecDense(3*n, nil)
	r.rhs1 = mat.NewVecDense(n, nil)
	r.err1 = mat.NewVecDense(n, nil)
	r.sol = &Solution{
		n: n, dir: dir,
		start: []float64{r.t},
		y0:    append([]float64(nil), y0...),
	}
	r.stats = &r.sol.stats
	return r
}

// tOf converts the internal time back to the caller's.
func (r *radau) tOf(s float64) float64 { return r.dir * s }

// eval calls f at internal time s and reports whether dy is finite (and
// which component is not).
func (r *radau) eval(s float64, y, dy []float64) (finite bool, which int, err error) {
	r.stats.FEvals++
	if err := r.f(r.dir*s, y, dy); err != nil {
		return false, 0, err
	}
	if r.dir < 0 {
		for i := range dy {
			dy[i] = -dy[i]
		}
	}
	for i, v := range dy {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false, i, nil
		}
	}
	return true, 0, nil
}

// jacobian forms ∂f/∂y at (t, y) into r.jm; r.f0 must hold f(t, y).
func (r *radau) jacobian() error {
	r.stats.JacEvals++
	n := r.n
	if r.jac != nil {
		if err := r.jac(r.dir*r.t, r.y, r.jm); err != nil {
			return err
		}
		for i, v := range r.jm {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return &Error{Kind: ErrNonFinite, T: r.tOf(r.t),
					Detail: fmt.Sprintf("the Jacobian entry (%d, %d) is %g", i/n, i%n, v)}
			}
			if r.dir < 0 {
				r.jm[i] = -v
			}
		}
		return nil
	}
	// Forward differences with the increment of the RADAU5 code,
	// sqrt(eps·max(1e-5, |y_j|)) (from memory).
	for j := 0; j < n; j++ {
		yj := r.y[j]
		d := math.Sqrt(eps * math.Max(1e-5, math.Abs(yj)))
		r.y[j] = yj + d
		d = r.y[j] - yj // the increment actually represented
		ok, which, err := r.eval(r.t, r.y, r.ftmp)
		r.y[j] = yj
		if err != nil {
			return err
		}
		if !ok {
			return &Error{Kind: ErrNonFinite, T: r.tOf(r.t),
				Detail: fmt.Sprintf("f[%d] is not finite when y[%d] is moved by %g to form the Jacobian", which, j, d)}
		}
		for i := 0; i < n; i++ {
			r.jm[i*n+j] = (r.ftmp[i] - r.f0[i]) / d
		}
	}
	return nil
}

// factor builds and factorises I − h A⊗J and I − hγ0 J. It reports
// false when either is singular to working precision.
func (r *radau) factor(h float64) bool {
	r.stats.LUDecomps++
	n := r.n
	m := r.m3.RawMatrix()
	for bi := 0; bi < 3; bi++ {
		for bk := 0; bk < 3; bk++ {
			ha := h * aRadau[bi][bk]
			for a := 0; a < n; a++ {
				row := m.Data[(bi*n+a)*m.Stride+bk*n : (bi*n+a)*m.Stride+bk*n+n]
				for b := 0; b < n; b++ {
					row[b] = -ha * r.jm[a*n+b]
				}
				if bi == bk {
					row[a] += 1
				}
			}
		}
	}
	e := r.e1.RawMatrix()
	hg := h * gamma0
	for a := 0; a < n; a++ {
		for b := 0; b < n; b++ {
			e.Data[a*e.Stride+b] = -hg * r.jm[a*n+b]
		}
		e.Data[a*e.Stride+a] += 1
	}
	r.lu3.Factorize(r.m3)
	r.lu1.Factorize(r.e1)
	ok := func(c float64) bool { return !(c > 1/eps) && !math.IsNaN(c) }
	return ok(r.lu3.Cond()) && ok(r.lu1.Cond())
}

// setScale sets the error weights atol + rtol·|y| at the start of a step.
func (r *radau) setScale() {
	for i, v := range r.y {
		r.scal[i] = r.atol + r.rtol*math.Abs(v)
	}
}

// initialStep chooses the first step (Hairer, Nørsett and Wanner 1993,
// §II.4, "Starting step size", with p = 3, the order of the error
// estimate). It needs r.f0.
func (r *radau) initialStep() (float64, error) {
	span := r.tEnd - r.t
	if r.h0 > 0 {
		return math.Min(r.h0, r.hmax), nil
	}
	n := float64(r.n)
	var d0, d1 float64
	for i, v := range r.y {
		sc := r.userAtol + r.userRtol*math.Abs(v)
		d0 += (v / sc) * (v / sc)
		d1 += (r.f0[i] / sc) * (r.f0[i] / sc)
	}
	d0, d1 = math.Sqrt(d0/n), math.Sqrt(d1/n)
	h0 := 1e-6 * span
	if d0 >= 1e-5 && d1 >= 1e-5 {
		h0 = 0.01 * d0 / d1
	}
	h0 = math.Min(h0, r.hmax)
	for i := range r.y {
		r.ytmp[i] = r.y[i] + h0*r.f0[i]
	}
	ok, _, err := r.eval(r.t+h0, r.ytmp, r.ftmp)
	if err != nil {
		return 0, err
	}
	if !ok {
		return math.Min(h0, r.hmax) * 1e-3, nil
	}
	var d2 float64
	for i, v := range r.y {
		sc := r.userAtol + r.userRtol*math.Abs(v)
		q := (r.ftmp[i] - r.f0[i]) / sc
		d2 += q * q
	}
	d2 = math.Sqrt(d2/n) / h0
	var h1 float64
	if m := math.Max(d1, d2); m <= 1e-15 {
		h1 = math.Max(1e-6*span, h0*1e-3)
	} else {
		h1 = math.Pow(0.01/m, 1.0/4)
	}
	return math.Min(math.Min(100*h0, h1), r.hmax), nil
}

// run integrates from r.t to r.tEnd, storing accepted steps in r.sol.
func (r *radau) run() error {
	ok, which, err := r.eval(r.t, r.y, r.f0)
	if err != nil {
		return err
	}
	if !ok {
		return &Error{Kind: ErrNonFinite, T: r.tOf(r.t),
			Detail: fmt.Sprintf("f[%d] is not finite at the initial values", which)}
	}
	h, err := r.initialStep()
	if err != nil {
		return err
	}

	var (
		needJac  = true  // form a new Jacobian before the next attempt
		fresh    = false // the Jacobian was formed at the current t
		hLU      = 0.0   // the step size of the current factorisation
		first    = true  // no step accepted yet
		reject   = false // the previous attempt was rejected
		faccon   = 1.0
		theta    = thetaJac
		hacc     = 0.0 // step and error of the last accepted step (Gustafsson)
		erracc   = 0.0
		haveHacc = false
		hprev    = 0.0 // size of the last accepted step
		singular = 0   // consecutive singular factorisations
	)
	r.setScale()
	for {
		// Choose the step: within the maximum, and landing on tEnd.
		h = math.Min(h, r.hmax)
		last := false
		if r.t+1.0001*h >= r.tEnd {
			h = r.tEnd - r.t
			last = true
		}
		if err := r.checkStep(h); err != nil {
			return err
		}
		if needJac {
			if err := r.jacobian(); err != nil {
				return err
			}
			needJac, fresh = false, true
			hLU = 0
		}
		if h != hLU {
			if !r.factor(h) {
				singular++
				if singular >= 5 {
					return &Error{Kind: ErrSingular, T: r.tOf(r.t), H: h,
						Detail: "I − h·A⊗J stayed singular after halving the step five times"}
				}
				h *= 0.5
				hLU = 0
				reject = true
				continue
			}
			singular = 0
			hLU = h
		}

		// Starting values: zero for the first step, else the previous
		// collocation polynomial extrapolated.
		if first {
			for i := range r.z {
				clear(r.z[i])
			}
		} else {
			r.extrapolate(h, hprev)
		}

		// Simplified Newton iteration.
		faccon = math.Pow(math.Max(faccon, eps), 0.8)
		theta = thetaJac
		newt, conv, failure, qnewt, nerr := r.newton(h, &faccon, &theta)
		if nerr != nil {
			return nerr
		}
		r.stats.NewtonIters += newt
		if !conv {
			r.stats.Rejected++
			reject = true
			if failure {
				// Slow convergence foreseen: shrink by the predicted factor.
				h *= 0.8 * math.Pow(qnewt, -1/(4+float64(maxNewton-1-newt)))
			} else {
				// Divergence, too many iterations or a non-finite f.
				h *= 0.5
			}
			if !fresh {
				needJac = true
			}
			continue
		}
		r.lastNonFinite = false

		// Error estimate.
		errNorm, eerr := r.estimate(h, first || reject)
		if eerr != nil {
			return eerr
		}
		fac := math.Min(safety, safety*float64(1+2*maxNewton)/float64(newt+2*maxNewton))
		quot := math.Max(facMin, math.Min(facMax, math.Pow(errNorm, 0.25)/fac))
		hnew := h / quot

		if errNorm >= 1 || math.IsNaN(errNorm) {
			r.stats.Rejected++
			reject = true
			if first || math.IsNaN(errNorm) {
				h *= 0.1
			} else {
				h = hnew
			}
			if !fresh {
				needJac = true
			}
			continue
		}

		// Accepted.
		if haveHacc {
			facgus := (hacc / h) * math.Pow(errNorm*errNorm/erracc, 0.25) / safety
			facgus = math.Max(facMin, math.Min(facMax, facgus))
			quot = math.Max(quot, facgus)
			hnew = h / quot
		}
		hacc, erracc, haveHacc = h, math.Max(1e-2, errNorm), true

		tNew := r.t + h
		if last {
			tNew = r.tEnd
		}
		r.accept(h, tNew)
		hprev = h
		first = false
		ok, which, err := r.eval(r.t, r.y, r.f0)
		if err != nil {
			return err
		}
		if !ok {
			return &Error{Kind: ErrNonFinite, T: r.tOf(r.t),
				Detail: fmt.Sprintf("f[%d] is not finite at the values just accepted", which)}
		}
		if last {
			return nil
		}
		r.setScale()
		hnew = math.Min(hnew, r.hmax)
		if reject {
			hnew = math.Min(hnew, h)
		}
		reject = false
		fresh = false
		qt := hnew / h
		if theta <= thetaJac && qt >= keepLow && qt <= keepHigh {
			continue // keep h, the Jacobian and the factorisation
		}
		h = hnew
		if theta > thetaJac {
			needJac = true
		}
	}
}

// checkStep polls Check and refuses a step too small to advance t or a
// step count over the limit.
func (r *radau) checkStep(h float64) error {
	if c := r.check; c != nil {
		if err := c(); err != nil {
			return err
		}
	}
	if r.stats.Steps+r.stats.Rejected >= r.maxSteps {
		return &Error{Kind: ErrTooManySteps, T: r.tOf(r.t), H: h,
			Detail: fmt.Sprintf("%d steps (%d accepted) did not reach t = %.10g", r.maxSteps, r.stats.Steps, r.tOf(r.tEnd))}
	}
	// Like RADAU5, refuse a step below ten rounding units of t; near
	// t = 0 the unit is taken from the span instead.
	if !(0.1*h > eps*math.Max(math.Abs(r.t), 1e-5*r.span)) {
		if r.lastNonFinite {
			return &Error{Kind: ErrNonFinite, T: r.nonFiniteAtT, H: h,
				Detail: fmt.Sprintf("f[%d] is not finite there, and shorter steps did not avoid it", r.nonFiniteWhich)}
		}
		return &Error{Kind: ErrStepUnderflow, T: r.tOf(r.t), H: h,
			Detail: fmt.Sprintf("the step size fell to %.3g, below the resolution of t", h)}
	}
	return nil
}

// extrapolate sets the starting stage increments from the collocation
// polynomial of the last accepted step (of size hprev) at t + c_i h.
func (r *radau) extrapolate(h, hprev float64) {
	n := r.n
	k := len(r.sol.h) - 1
	d := r.sol.data[4*n*k : 4*n*(k+1)]
	for i := 0; i < 3; i++ {
		l1, l2, l3 := lagrange(1 + cRadau[i]*h/hprev)
		zi := r.z[i]
		for a := 0; a < n; a++ {
			zi[a] = l1*d[n+a] + l2*d[2*n+a] + (l3-1)*d[3*n+a]
		}
	}
}

// newton runs the simplified Newton iteration on the stage increments.
// It returns the iterations made; conv when converged; otherwise failure
// when the rate predicts that convergence would come too late (qnewt is
// then the predicted excess), or neither for divergence, too many
// iterations or a non-finite f (h should be halved).
func (r *radau) newton(h float64, faccon, theta *float64) (newt int, conv, failure bool, qnewt float64, err error) {
	n := r.n
	var dynold, thqold float64
	rhs, dz := r.rhs3.RawVector().Data, r.dz3.RawVector().Data
	for {
		if newt >= maxNewton {
			return newt, false, false, 0, nil
		}
		for i := 0; i < 3; i++ {
			for a := 0; a < n; a++ {
				r.ytmp[a] = r.y[a] + r.z[i][a]
			}
			ok, which, err := r.eval(r.t+cRadau[i]*h, r.ytmp, r.fz[i])
			if err != nil {
				return newt, false, false, 0, err
			}
			if !ok {
				r.lastNonFinite = true
				r.nonFiniteAtT = r.tOf(r.t + cRadau[i]*h)
				r.nonFiniteWhich = which
				return newt, false, false, 0, nil
			}
		}
		for i := 0; i < 3; i++ {
			for a := 0; a < n; a++ {
				s := aRadau[i][0]*r.fz[0][a] + aRadau[i][1]*r.fz[1][a] + aRadau[i][2]*r.fz[2][a]
				rhs[i*n+a] = -r.z[i][a] + h*s
			}
		}
		// The factorisation was checked for singularity when it was made;
		// a Condition error here only repeats that.
		_ = r.lu3.SolveVecTo(r.dz3, false, r.rhs3)
		newt++
		var dyno float64
		for i := 0; i < 3; i++ {
			for a := 0; a < n; a++ {
				q := dz[i*n+a] / r.scal[a]
				dyno += q * q
			}
		}
		dyno = math.Sqrt(dyno / float64(3*n))
		if math.IsNaN(dyno) || math.IsInf(dyno, 0) {
			return newt, false, false, 0, nil
		}
		if newt > 1 && newt < maxNewton {
			thq := dyno / dynold
			if newt == 2 {
				*theta = thq
			} else {
				*theta = math.Sqrt(thq * thqold)
			}
			thqold = thq
			if *theta < 0.99 {
				*faccon = *theta / (1 - *theta)
				dyth := *faccon * dyno * math.Pow(*theta, float64(maxNewton-1-newt)) / r.fnewt
				if dyth >= 1 {
					return newt, false, true, math.Max(1e-4, math.Min(20, dyth)), nil
				}
			} else {
				return newt, false, false, 0, nil
			}
		}
		dynold = math.Max(dyno, eps)
		for i := 0; i < 3; i++ {
			for a := 0; a < n; a++ {
				r.z[i][a] += dz[i*n+a]
			}
		}
		if *faccon*dyno <= r.fnewt {
			return newt, true, false, 0, nil
		}
	}
}

// estimate returns the scaled norm of the filtered embedded error
// estimate (Hairer and Wanner 1996, §IV.8, eqs. (8.19)–(8.20)); with
// refilter it applies the second filter when the first gives ≥ 1.
func (r *radau) estimate(h float64, refilter bool) (float64, error) {
	n := r.n
	g := r.ftmp // Σ e_i Z_i
	for a := 0; a < n; a++ {
		g[a] = eRadau[0]*r.z[0][a] + eRadau[1]*r.z[1][a] + eRadau[2]*r.z[2][a]
	}
	b, x := r.rhs1.RawVector().Data, r.err1.RawVector().Data
	hg := h * gamma0
	for a := 0; a < n; a++ {
		b[a] = hg*r.f0[a] + g[a]
	}
	_ = r.lu1.SolveVecTo(r.err1, false, r.rhs1)
	e := r.norm(x)
	if e < 1 || !refilter {
		return math.Max(e, 1e-10), nil
	}
	for a := 0; a < n; a++ {
		r.ytmp[a] = r.y[a] + x[a]
	}
	f1 := r.fz[0] // the stage values are no longer needed
	ok, _, err := r.eval(r.t, r.ytmp, f1)
	if err != nil {
		return 0, err
	}
	if !ok {
		return math.NaN(), nil
	}
	for a := 0; a < n; a++ {
		b[a] = hg*f1[a] + g[a]
	}
	_ = r.lu1.SolveVecTo(r.err1, false, r.rhs1)
	return math.Max(r.norm(x), 1e-10), nil
}

func (r *radau) norm(x []float64) float64 {
	var s float64
	for a, v := range x {
		q := v / r.scal[a]
		s += q * q
	}
	return math.Sqrt(s / float64(r.n))
}

// accept stores the step [t, t+h] and moves to its end.
func (r *radau) accept(h, tNew float64) {
	n := r.n
	s := r.sol
	s.data = append(s.data, r.y...)
	for i := 0; i < 3; i++ {
		s.data = append(s.data, r.z[i]...)
	}
	s.h = append(s.h, h)
	s.start = append(s.start, tNew)
	for a := 0; a < n; a++ {
		r.y[a] += r.z[2][a]
	}
	r.t = tNew
	r.stats.Steps++
}
