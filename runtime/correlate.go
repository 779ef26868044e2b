package runtime

import (
	"fmt"
	"strings"
	"unicode/utf8"

	"gonum.org/v1/gonum/mat"

	"loopwise/lang"
)

// correlateOf handles "correlate(a, b, r)": the inputs named a and b (the
// names their ± values were assigned to) get correlation coefficient r
// (GUM §5.2.2), used by first order (eq. (16)) and by Monte Carlo draws.
func (s *Session) correlateOf(st *lang.Statement) (*Result, bool, error) {
	call, ok := s.matchForm(st, "correlate")
	if !ok {
		return nil, false, nil
	}
	whole := call.errorf
	if st.Kind != lang.Expr {
		return nil, true, whole("correlate(a, b, r) is a statement of its own; it gives no value to assign")
	}
	args := call.args
	if len(args) != 3 {
		return nil, true, whole("correlate takes the names of two uncertain inputs and a correlation coefficient: correlate(V, I, -0.36)")
	}
	argOff := func(a topArg) int { return st.ExprOff + a.off }
	var ids [2]int
	for k, a := range args[:2] {
		name := strings.TrimSpace(a.text)
		id := -1
		for _, in := range s.unc.inputs {
			if in.Label == name {
				id = in.ID // the latest input of that name
			}
		}
		if id < 0 || s.unc.worlds[name] == nil {
			return nil, true, st.Errorf(argOff(a), max(1, utf8.RuneCountInString(a.text)), "%q is not a name assigned an uncertain value (x = 12 mm ± 0.1 mm); correlate takes those names", name)
		}
		if _, ok := s.unc.worlds[name][id]; !ok || len(s.unc.worlds[name]) != 1 {
			return nil, true, st.Errorf(argOff(a), max(1, utf8.RuneCountInString(a.text)), "%s no longer holds the uncertain value it was given; correlate the inputs before using them", name)
		}
		ids[k] = id
	}
	if ids[0] == ids[1] {
		return nil, true, whole("an input is fully correlated with itself; name two different inputs")
	}
	sub := call.sub(args[2])
	p, err := s.compile(sub, sub.Expr, sub.ExprOff, nil, nil)
	if err != nil {
		return nil, true, err
	}
	v, err := s.run(p)
	if err != nil {
		return nil, true, s.stopped(sub, err)
	}
	q, ok := v.(Quantity)
	if !ok || !q.D.IsZero() || !(q.V >= -1 && q.V <= 1) {
		return nil, true, sub.Errorf(sub.ExprOff, max(1, utf8.RuneCountInString(sub.Expr)), "a correlation coefficient is a plain number from -1 to 1, not %s", Format(v, 6))
	}
	if s.unc.corr == nil {
		s.unc.corr = map[[2]int]float64{}
	}
	key := corrKey(ids[0], ids[1])
	old, had := s.unc.corr[key]
	s.unc.corr[key] = q.V
	if _, err := s.correlationFactor(); err != nil {
		if had {
			s.unc.corr[key] = old
		} else {
			delete(s.unc.corr, key)
		}
		return nil, true, whole("%v", err)
	}
	text := fmt.Sprintf("correlation of %s and %s: %s", s.unc.inputs[ids[0]].Label, s.unc.inputs[ids[1]].Label, FormatNumber(q.V, 6))
	s.Transcript = append(s.Transcript, Entry{Line: st.Text, Record: text})
	return &Result{Stmt: st, Value: q, Text: text, Record: text}, true, nil
}

// correlationFactor returns the lower Cholesky factor L of the inputs'
// correlation matrix (R = L·Lᵀ), nil when no correlation is given, and
// an error when the coefficients are inconsistent (R not positive
// definite). Monte Carlo draws z' = L·z for independent standard normal z
// (JCGM 101:2008 §6.4.8, the multivariate Gaussian).
func (s *Session) correlationFactor() (*mat.TriDense, error) {
	if len(s.unc.corr) == 0 {
		return nil, nil
	}
	k := len(s.unc.inputs)
	r := mat.NewSymDense(k, nil)
	for i := range k {
		r.SetSym(i, i, 1)
	}
	for key, c := range s.unc.corr {
		r.SetSym(key[0], key[1], c)
	}
	var ch mat.Cholesky
	if ok := ch.Factorize(r); !ok {
		return nil, fmt.Errorf("the correlation coefficients given are not consistent with each other (their matrix is not positive definite); check their signs and sizes")
	}
	var l mat.TriDense
	ch.LTo(&l)
	return &l, nil
}

// correlated turns independent draws z into correlated ones in place.
func correlated(l *mat.TriDense, z, tmp []float64) {
	if l == nil {
		return
	}
	for i := range z {
		var sum float64
		for j := 0; j <= i; j++ {
			sum += l.At(i, j) * z[j]
		}
		tmp[i] = sum
	}
	copy(z, tmp)
}
