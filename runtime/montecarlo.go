package runtime

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"unicode/utf8"

	"loopwise/lang"
)

// Monte Carlo propagation (JCGM 101:2008, GUM Supplement 1).
//
// Each uncertain input is given the Gaussian distribution its estimate and
// standard uncertainty determine (JCGM 101 §6.4.7, Table 1: the maximum
// entropy choice when only those are known). A trial draws every input
// at once and re-runs, in order, the assignments made since the first
// input was entered (chain, below), then the expression; M trials give the
// distribution of the result: its mean, standard deviation and the
// probabilistically symmetric 95 % coverage interval (JCGM 101 §7.7.2).
// The draws come from a PCG generator seeded by (seed, trial), so a
// replay gives the same numbers on every machine. The first-order result
// is validated against it as JCGM 101 §8.2 does: the ends of y ± 1.96·u
// must lie within δ of the Monte Carlo interval's, δ half a unit in the
// last of the two significant digits of u (§7.9.2).

// chainStep is one assignment made after the first uncertain input:
// either a program to re-run (it read inputs) or the value it gave.
type chainStep struct {
	name  string
	prog  *program
	pm    []int // the input ids of its ±, in order
	value Value // for an assignment that read no input
}

// recordChain keeps an assignment for later Monte Carlo trials.
func (s *Session) recordChain(st *lang.Statement, p *program, v Value, uncertain bool) {
	if len(s.unc.inputs) == 0 || st.Kind != lang.Assign {
		return
	}
	if sh, ok := v.(Shower); ok && sh.Kind() == "a plot" {
		uncertain = false // a picture: trials would only write it again
	}
	if uncertain {
		s.unc.chain = append(s.unc.chain, chainStep{name: st.Name, prog: p, pm: append([]int(nil), s.unc.stmtPM...)})
		return
	}
	s.unc.chain = append(s.unc.chain, chainStep{name: st.Name, value: v})
}

// MonteCarlo is the result of monte_carlo(): the distribution of a
// result, compared with the first-order one, and its histogram.
type MonteCarlo struct {
	Target        string
	Trials        int
	Seed          uint64
	D             Dim
	Mean, SD      float64
	Low, High     float64 // the 95 % coverage interval
	Y, U          float64 // first order
	Delta         float64 // the numerical tolerance of §7.9.2
	Agree         bool
	Centres, Freq []float64 // histogram: bin centres, counts
	Normal        []float64 // counts the first-order Gaussian expects
	Outside       int       // values beyond the histogram's span
	// Adaptive: the trials were chosen by JCGM 101 §7.9.4; Stable: the
	// procedure met its tolerance within MaxTrials
	Adaptive, Stable bool
}

func (m *MonteCarlo) Kind() string { return "a Monte Carlo result" }

func (m *MonteCarlo) q(v float64) string { return Format(Quantity{V: v, D: m.D}, 4) }

// Summary states the distribution and the comparison in one line.
func (m *MonteCarlo) Summary(digits int) string {
	mu, _ := FormatUncertain(Quantity{V: m.Mean, D: m.D}, []float64{m.SD}, "", digits, false)
	fo, _ := FormatUncertain(Quantity{V: m.Y, D: m.D}, []float64{m.U}, "", digits, false)
	verdict := fmt.Sprintf("first order %s agrees: its 95 %% interval ends are within %s of these", fo, m.q(m.Delta))
	if !m.Agree {
		verdict = fmt.Sprintf("first order %s DISAGREES: its 95 %% interval [%s, %s] differs from this one by more than %s; the result is not linear enough over the inputs' spread for first order, use this interval", fo, m.q(m.Y-1.96*m.U), m.q(m.Y+1.96*m.U), m.q(m.Delta))
	}
	how := ""
	switch {
	case m.Adaptive && m.Stable:
		how = ", adaptive: mean, u and interval ends stable to their last digit"
	case m.Adaptive:
		how = fmt.Sprintf(", adaptive: NOT stable to u's last digit after %d trials, the most allowed", MaxTrials)
	}
	return fmt.Sprintf("Monte Carlo of %s, %d trials (seed %d%s): %s, 95 %% interval [%s, %s]; %s", m.Target, m.Trials, m.Seed, how, mu, m.q(m.Low), m.q(m.High), verdict)
}

// Show is the summary and the histogram.
func (m *MonteCarlo) Show(digits int) string {
	unit, scale := BestUnit(m.D, math.Max(math.Abs(m.Low), math.Abs(m.High)), digits)
	var b strings.Builder
	b.WriteString(m.Summary(digits) + "\n")
	b.WriteString("histogram of the middle 99.8 % (plot(table, \"y\", \"count\", \"normal\") draws it):\n")
	top := 0.0
	for _, f := range m.Freq {
		top = math.Max(top, f)
	}
	for i, c := range m.Centres {
		bar := int(math.Round(40 * m.Freq[i] / top))
		b.WriteString(strings.TrimRight(fmt.Sprintf("%10s %s %s", FormatNumber(c/scale, 4), unit, strings.Repeat("█", bar)), " ") + "\n")
	}
	return strings.TrimRight(b.String(), "\n ")
}

// Tabulate gives the histogram: bin centre, count, and the count the
// first-order Gaussian expects.
func (m *MonteCarlo) Tabulate() ([]string, []Dim, [][]float64) {
	rows := make([][]float64, len(m.Centres))
	for i := range rows {
		rows[i] = []float64{m.Centres[i], m.Freq[i], m.Normal[i]}
	}
	return []string{"y", "count", "normal"}, []Dim{m.D, Dimensionless, Dimensionless}, rows
}

// MaxTrials bounds the trials of one monte_carlo statement.
const MaxTrials = 1_000_000

// monteCarloOf handles "monte_carlo(expr, trials[, seed])".
func (s *Session) monteCarloOf(st *lang.Statement) (*Result, bool, error) {
	call, ok := s.matchForm(st, "monte_carlo")
	if !ok {
		return nil, false, nil
	}
	whole := call.errorf
	args := call.args
	if len(args) < 2 || len(args) > 3 {
		return nil, true, whole("monte_carlo takes an expression and a number of trials (and a seed): monte_carlo(M, 10000)")
	}
	// the trial count and seed are plain numbers; the count may be
	// "adaptive"
	nums := make([]float64, len(args)-1)
	adaptive := false
	for i, a := range args[1:] {
		sub := call.sub(a)
		p, err := s.compile(sub, sub.Expr, sub.ExprOff, nil, nil)
		if err != nil {
			return nil, true, err
		}
		v, err := s.run(p)
		if err != nil {
			return nil, true, s.stopped(sub, err)
		}
		if str, ok := v.(string); ok && i == 0 {
			if str != "adaptive" {
				return nil, true, sub.Errorf(sub.ExprOff, max(1, utf8.RuneCountInString(a.text)), "the number of trials is a whole number or \"adaptive\", not %q", str)
			}
			adaptive = true
			nums[i] = adaptiveBatch
			continue
		}
		q, ok := v.(Quantity)
		if !ok || !q.D.IsZero() || q.V != math.Trunc(q.V) || q.V < 0 {
			return nil, true, sub.Errorf(sub.ExprOff, max(1, utf8.RuneCountInString(a.text)), "the number of trials and the seed are whole numbers ≥ 0, not %s", Format(v, 6))
		}
		nums[i] = q.V
	}
	trials := int(nums[0])
	seed := uint64(1)
	if len(nums) > 1 {
		seed = uint64(nums[1])
	}
	if trials < 1000 || trials > MaxTrials {
		return nil, true, whole("the number of trials must be from 1000 to %d; JCGM 101 suggests 10⁶ for a 95 %% interval good to two digits", MaxTrials)
	}
	// first order, and the compiled target
	inner := call.sub(args[0])
	res, err := s.Exec(inner)
	if err != nil {
		return nil, true, err
	}
	s.Transcript = s.Transcript[:len(s.Transcript)-1]
	q, ok := res.Value.(Quantity)
	if !ok {
		return nil, true, whole("monte_carlo needs a number; %s is %s (for a vector take a component, such as .z; for a complex value abs() or re())", strings.TrimSpace(inner.Expr), TypeName(res.Value))
	}
	if len(res.Contributions) == 0 {
		return nil, true, whole("%s reads no uncertain value (enter one as 12 mm ± 0.1 mm)", strings.TrimSpace(inner.Expr))
	}
	target, err := s.compile(inner, inner.Expr, inner.ExprOff, nil, nil)
	if err != nil {
		return nil, true, err
	}
	u := s.combined(res.Contributions)[0]
	var ys []float64
	stable := true
	if adaptive {
		ys, stable, err = s.adaptiveTrials(target, seed)
	} else {
		ys, err = s.trials(target, 0, trials, seed)
	}
	if err != nil {
		return nil, true, s.stopped(inner, err)
	}
	mc := summarise(ys, q, u)
	mc.Target, mc.Trials, mc.Seed = strings.TrimSpace(inner.Expr), len(ys), seed
	mc.Adaptive, mc.Stable = adaptive, stable
	return &Result{Stmt: st, Value: mc}, true, nil
}

// adaptiveBatch is the batch size of the adaptive procedure: M =
// max(J, 10⁴) with J = 100/(1 − p) = 2000 for the 95 % interval (JCGM 101
// §7.9.4 a)).
const adaptiveBatch = 10_000

// adaptiveTrials is JCGM 101 §7.9.4: batches of adaptiveBatch trials until
// twice the standard deviation of each of the batch means of y, u(y) and
// the interval's ends (the standard deviation of the h batch values over
// √h) is within δ, half a unit in the last of the two significant digits
// of u(y) from all trials so far (§7.9.2). It stops at MaxTrials and then
// reports stable false.
func (s *Session) adaptiveTrials(target *program, seed uint64) (ys []float64, stable bool, err error) {
	var means, sds, lows, highs []float64
	for h := 0; (h+1)*adaptiveBatch <= MaxTrials; h++ {
		batch, err := s.trials(target, h*adaptiveBatch, adaptiveBatch, seed)
		if err != nil {
			return nil, false, err
		}
		ys = append(ys, batch...)
		st := summarise(batch, Quantity{}, 0)
		means, sds = append(means, st.Mean), append(sds, st.SD)
		lows, highs = append(lows, st.Low), append(highs, st.High)
		if h == 0 {
			continue
		}
		delta := halfLastDigit(sdOf(ys))
		worst := 0.0
		for _, v := range [][]float64{means, sds, lows, highs} {
			worst = math.Max(worst, sdOf(v)/math.Sqrt(float64(len(v))))
		}
		if 2*worst <= delta {
			return ys, true, nil
		}
	}
	return ys, false, nil
}

// sdOf is the sample standard deviation of x.
func sdOf(x []float64) float64 {
	var mu, ss float64
	for _, v := range x {
		mu += v
	}
	mu /= float64(len(x))
	for _, v := range x {
		ss += (v - mu) * (v - mu)
	}
	return math.Sqrt(ss / float64(len(x)-1))
}

// trials runs the chain and the target once per trial, for the trials
// first to first+n-1 (each seeded by its number).
func (s *Session) trials(target *program, first, n int, seed uint64) ([]float64, error) {
	k := len(s.unc.inputs)
	z, tmp := make([]float64, k), make([]float64, k)
	ys := make([]float64, n)
	l, err := s.correlationFactor()
	if err != nil {
		return nil, err
	}
	defer func() { s.unc.cur, s.unc.env, s.unc.z = nil, nil, nil }()
	for k := range n {
		t := first + k
		rng := rand.New(rand.NewPCG(seed, uint64(t)))
		for i := range z {
			z[i] = rng.NormFloat64()
		}
		correlated(l, z, tmp)
		env := make(map[string]Value, len(s.vars))
		for name, v := range s.vars {
			env[name] = v
		}
		s.unc.cur, s.unc.env, s.unc.z = &world{id: -1}, env, z
		for _, c := range s.unc.chain {
			if c.prog == nil {
				env[c.name] = c.value
				continue
			}
			s.unc.stmtPM = c.pm
			v, err := s.run(c.prog)
			if err != nil {
				return nil, fmt.Errorf("trial %d, in %s: %w", t+1, c.prog.st.Text, err)
			}
			env[c.name] = v
		}
		s.unc.stmtPM = nil
		v, err := s.run(target)
		if err != nil {
			return nil, fmt.Errorf("trial %d: %w", t+1, err)
		}
		q, ok := v.(Quantity)
		if !ok {
			return nil, fmt.Errorf("trial %d gave %s", t+1, TypeName(v))
		}
		ys[k] = q.V
	}
	return ys, nil
}

// summarise computes the statistics, the validation and the histogram.
func summarise(ys []float64, y0 Quantity, u float64) *MonteCarlo {
	n := len(ys)
	var mean float64
	for _, y := range ys {
		mean += y
	}
	mean /= float64(n)
	var ss float64
	for _, y := range ys {
		ss += (y - mean) * (y - mean)
	}
	sorted := append([]float64(nil), ys...)
	sort.Float64s(sorted)
	// the probabilistically symmetric 95 % interval: the 0.025·M-th and
	// 0.975·M-th of the sorted values (JCGM 101 §7.7.2, with q = pM)
	lo := sorted[max(0, int(math.Round(0.025*float64(n)))-1)]
	hi := sorted[min(n-1, int(math.Round(0.975*float64(n)))-1)]
	mc := &MonteCarlo{D: y0.D, Mean: mean, SD: math.Sqrt(ss / float64(n-1)), Low: lo, High: hi, Y: y0.V, U: u}
	// the tolerance: δ of §7.9.2, or, when the trials are too few to
	// resolve δ, twice the standard deviation of the interval's ends over
	// ten batches of the trials divided by √10 (the precision of the
	// ends, estimated as the adaptive procedure of §7.9.4 does)
	mc.Delta = math.Max(halfLastDigit(u), 2*endSpread(ys))
	mc.Agree = math.Abs(y0.V-1.96*u-lo) <= mc.Delta && math.Abs(y0.V+1.96*u-hi) <= mc.Delta
	// the histogram spans the middle 99.8 % of the values; the rest are
	// counted in Outside
	bins := 30
	a, b := sorted[int(0.001*float64(n))], sorted[min(n-1, int(math.Ceil(0.999*float64(n))))]
	if b == a {
		b = a + math.Max(math.Abs(a)*1e-12, 1e-300)
	}
	w := (b - a) / float64(bins)
	mc.Centres = make([]float64, bins)
	mc.Freq = make([]float64, bins)
	mc.Normal = make([]float64, bins)
	for i := range bins {
		mc.Centres[i] = a + (float64(i)+0.5)*w
		if u > 0 {
			x0, x1 := (a+float64(i)*w-y0.V)/u, (a+float64(i+1)*w-y0.V)/u
			mc.Normal[i] = float64(n) * 0.5 * (math.Erf(x1/math.Sqrt2) - math.Erf(x0/math.Sqrt2))
		}
	}
	for _, y := range ys {
		if y < a || y > b {
			mc.Outside++
			continue
		}
		i := min(bins-1, int((y-a)/w))
		mc.Freq[i]++
	}
	return mc
}

// endSpread is the standard deviation of the 95 % interval's ends over
// ten batches of ys, divided by √10; the larger of the two ends.
func endSpread(ys []float64) float64 {
	const h = 10
	m := len(ys) / h
	var los, his []float64
	for j := range h {
		b := append([]float64(nil), ys[j*m:(j+1)*m]...)
		sort.Float64s(b)
		los = append(los, b[max(0, int(math.Round(0.025*float64(m)))-1)])
		his = append(his, b[min(m-1, int(math.Round(0.975*float64(m)))-1)])
	}
	return math.Max(sdOf(los), sdOf(his)) / math.Sqrt(h)
}

// halfLastDigit is δ of JCGM 101 §7.9.2: half a unit in the last of the
// two significant digits u is quoted with.
func halfLastDigit(u float64) float64 {
	if !(u > 0) {
		return 0
	}
	e := math.Floor(math.Log10(roundSig(u, 2)))
	return 0.5 * math.Pow10(int(e)-1)
}

// topArg is one argument of a call, with its offset in the argument text.
type topArg struct {
	text string
	off  int // runes
}

// splitTopLevel splits text at the commas outside brackets and strings.
func splitTopLevel(text string) []topArg {
	var out []topArg
	depth, start := 0, 0
	var quote rune
	r := []rune(text)
	for i, c := range r {
		switch {
		case quote != 0:
			if c == quote {
				quote = 0
			}
		case c == '"' || c == '\'' || c == '`':
			quote = c
		case c == '(' || c == '[' || c == '{':
			depth++
		case c == ')' || c == ']' || c == '}':
			depth--
		case c == ',' && depth == 0:
			out = append(out, topArg{string(r[start:i]), start})
			start = i + 1
		}
	}
	return append(out, topArg{string(r[start:]), start})
}
