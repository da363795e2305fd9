package dea

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
)

// Tolerances for classifying results (on scores, and on slacks in data
// scaled by each measure's mean).
const (
	scoreTol  = 1e-9
	slackTol  = 1e-8
	lambdaTol = 1e-9
)

// Options control a run beyond the model.
type Options struct {
	// Units, when not nil, are the only units evaluated (against all units of
	// the data); Result.Units then holds them in this order. Splitting units
	// over several workers uses this.
	Units []int
	// Frontier, when not nil, is a candidate set computed earlier by
	// Frontier for the same data; it saves each worker from computing it.
	Frontier []int
	// Parts, when above 1, splits a run over several workers: this run
	// evaluates only the units of every Parts-th chunk, starting with chunk
	// Part, and Result.Units holds them in unit order. Units are cut into
	// chunks by the data alone, and each chunk is evaluated the same way
	// wherever it runs, so results put together with Merge are identical,
	// bit for bit, to one run's. Parts cannot be combined with Units.
	Part, Parts int
	// Progress is called now and then with the number of units done.
	Progress func(done, total int)
	// Workers is the number of goroutines (0: GOMAXPROCS).
	Workers int
}

// Run evaluates every unit of d under model m. It checks the data first and
// returns an error for data no model can use (shapes, NaN, negative values);
// a unit whose program fails gets Status NotSolved and a Problem, and the run
// goes on.
func Run(ctx context.Context, d *Data, m Model, progress func(done, total int)) (*Result, error) {
	return RunWith(ctx, d, m, Options{Progress: progress})
}

// CheckData reports data that no model can use.
func CheckData(d *Data) error {
	n := len(d.X)
	if n == 0 {
		return errors.New("dea: no units")
	}
	if len(d.Y) != n {
		return fmt.Errorf("dea: %d units have inputs but %d have outputs", n, len(d.Y))
	}
	if len(d.Units) != 0 && len(d.Units) != n {
		return fmt.Errorf("dea: %d unit names for %d units", len(d.Units), n)
	}
	m, s := len(d.X[0]), len(d.Y[0])
	if m == 0 || s == 0 {
		return errors.New("dea: a model needs at least one input and one output")
	}
	for j := 0; j < n; j++ {
		if len(d.X[j]) != m || len(d.Y[j]) != s {
			return fmt.Errorf("dea: unit %s has %d inputs and %d outputs, expected %d and %d", d.name(j), len(d.X[j]), len(d.Y[j]), m, s)
		}
		for i, v := range d.X[j] {
			if err := checkValue(v); err != nil {
				return fmt.Errorf("dea: unit %s, input %s: %w", d.name(j), d.measure(d.InputNames, i, "input"), err)
			}
		}
		for r, v := range d.Y[j] {
			if err := checkValue(v); err != nil {
				return fmt.Errorf("dea: unit %s, output %s: %w", d.name(j), d.measure(d.OutputNames, r, "output"), err)
			}
		}
		// Semipositive data (Cooper, Seiford & Tone 2007, ch. 2): without a
		// positive input and a positive output a radial score means nothing.
		if !anyPositive(d.X[j]) {
			return fmt.Errorf("dea: unit %s has no positive input; every unit needs one", d.name(j))
		}
		if !anyPositive(d.Y[j]) {
			return fmt.Errorf("dea: unit %s has no positive output; every unit needs one", d.name(j))
		}
	}
	if err := checkSpread(d.X, d.InputNames, "input"); err != nil {
		return err
	}
	return checkSpread(d.Y, d.OutputNames, "output")
}

// maxSpread is the largest ratio between the largest and the smallest
// positive value of one measure that double precision can hold apart: beyond
// it the small values vanish in rounding next to the large ones.
const maxSpread = 1e15

func checkSpread(rows [][]float64, names []string, kind string) error {
	if len(rows) == 0 {
		return nil
	}
	for i := range rows[0] {
		lo, hi := math.Inf(1), 0.0
		for _, r := range rows {
			if v := r[i]; v > 0 {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
		if hi > 0 && hi/lo > maxSpread {
			return fmt.Errorf("dea: %s %s runs from %g to %g, more than 15 orders of magnitude; the smallest values would be lost in rounding: check the data or change its units", kind, (&Data{}).measure(names, i, kind), lo, hi)
		}
	}
	return nil
}

func anyPositive(v []float64) bool {
	for _, x := range v {
		if x > 0 {
			return true
		}
	}
	return false
}

func checkValue(v float64) error {
	switch {
	case math.IsNaN(v):
		return errors.New("value is missing")
	case math.IsInf(v, 0):
		return errors.New("value is infinite")
	case v < 0:
		return fmt.Errorf("value %g is negative; radial models need values of zero or more", v)
	}
	return nil
}

func (d *Data) name(j int) string {
	if j < len(d.Units) {
		return fmt.Sprintf("%q", d.Units[j])
	}
	return fmt.Sprintf("%d", j+1)
}

func (d *Data) measure(names []string, i int, kind string) string {
	if i < len(names) {
		return fmt.Sprintf("%q", names[i])
	}
	return fmt.Sprintf("%s %d", kind, i+1)
}

// RunWith is Run with options.
func RunWith(ctx context.Context, d *Data, m Model, opt Options) (*Result, error) {
	if err := m.Validate(); err != nil {
		return nil, err
	}
	if err := CheckData(d); err != nil {
		return nil, err
	}
	sc := scaleData(d)
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	cand := opt.Frontier
	if cand == nil {
		var err error
		if cand, err = frontier(ctx, sc, workers); err != nil {
			return nil, err
		}
	}
	if opt.Parts > 1 && (opt.Units != nil || opt.Part < 0 || opt.Part >= opt.Parts) {
		return nil, fmt.Errorf("dea: part %d of %d (with a list of units: %v) is not a valid share of a run", opt.Part, opt.Parts, opt.Units != nil)
	}
	listed := make(map[int]bool, len(opt.Units))
	for _, j := range opt.Units {
		if j < 0 || j >= sc.n {
			return nil, fmt.Errorf("dea: unit index %d out of range", j)
		}
		if listed[j] {
			return nil, fmt.Errorf("dea: unit index %d is listed twice", j)
		}
		listed[j] = true
	}
	plan := planRun(sc, m, opt)
	ev := newEvaluator(sc, d, m, cand)
	res := &Result{Model: m, Units: make([]UnitResult, plan.count), Frontier: cand}
	workers = min(workers, max(1, plan.count/16), len(plan.chunks))
	var (
		mu   sync.Mutex
		done int
		next int
		wg   sync.WaitGroup
	)
	total := plan.count
	step := max(1, total/200)
	report := func(k int) {
		if opt.Progress == nil {
			return
		}
		mu.Lock()
		done += k
		dn := done
		mu.Unlock()
		if dn%step < k || dn == total {
			opt.Progress(dn, total)
		}
	}
	take := func() int {
		mu.Lock()
		defer mu.Unlock()
		c := next
		next++
		return c
	}
	var firstErr error
	work := func(ev *evaluator) {
		defer wg.Done()
		for {
			c := take()
			if c >= len(plan.chunks) {
				return
			}
			// Every chunk starts afresh, so its results do not depend on
			// which worker evaluated which chunk before.
			ev.reset()
			ch := plan.chunks[c]
			for _, t := range ch {
				if err := ctx.Err(); err != nil {
					mu.Lock()
					firstErr = err
					mu.Unlock()
					return
				}
				res.Units[t.slot] = ev.unit(t.unit)
			}
			report(len(ch))
		}
	}
	wg.Add(workers)
	for w := 0; w < workers; w++ {
		e := ev
		if w > 0 {
			e = ev.clone()
		}
		if workers == 1 {
			work(e)
		} else {
			go work(e)
		}
	}
	wg.Wait()
	if firstErr != nil {
		return nil, firstErr
	}
	countPeers(res)
	return res, nil
}

// countPeers sets PeerCount: how many other evaluated units name each unit.
func countPeers(res *Result) {
	pos := make(map[int]int, len(res.Units))
	for k, u := range res.Units {
		pos[u.Index] = k
	}
	for _, u := range res.Units {
		for _, p := range u.Peers {
			if p.Index == u.Index {
				continue
			}
			if k, ok := pos[p.Index]; ok {
				res.Units[k].PeerCount++
			}
		}
	}
}

// evaluator holds the envelopment programs a run needs.
type evaluator struct {
	sc   *scaled
	d    *Data
	m    Model
	cand []int
	main *envelope
	crs  *envelope // scale detail (nil when not asked)
	vrs  *envelope
	nirs *envelope
	all  []int // every unit, for full dual checks on small studies
	// wideEnv is the envelope over all units, for the rare unit whose
	// program over the candidate set fails (see unit); made on first use.
	wideEnv *envelope
	// checkBuf is checkSet's buffer (one per evaluator, so per goroutine).
	checkBuf []int
}

func newEvaluator(sc *scaled, d *Data, m Model, cand []int) *evaluator {
	ev := &evaluator{sc: sc, d: d, m: m, cand: cand}
	ev.main = newEnvelope(sc, cand, m)
	if m.ScaleDetail {
		radial := func(r Returns) *envelope {
			mm := Model{Returns: r, Orientation: m.Orientation}
			return newEnvelope(sc, cand, mm)
		}
		ev.crs, ev.vrs, ev.nirs = radial(Constant), radial(Variable), radial(NonIncreasing)
	}
	if sc.n <= fullCheckLimit {
		ev.all = make([]int, sc.n)
		for j := range ev.all {
			ev.all[j] = j
		}
	}
	return ev
}

// reset forgets the warm starts of the units evaluated so far.
func (ev *evaluator) reset() {
	for _, e := range [...]*envelope{ev.main, ev.crs, ev.vrs, ev.nirs, ev.wideEnv} {
		if e != nil {
			e.forget()
		}
	}
}

func (ev *evaluator) clone() *evaluator {
	c := *ev
	c.checkBuf, c.wideEnv = nil, nil
	c.main = ev.main.clone()
	if ev.crs != nil {
		c.crs, c.vrs, c.nirs = ev.crs.clone(), ev.vrs.clone(), ev.nirs.clone()
	}
	return &c
}

// checkSet is the set of units a certificate's dual check covers: every
// unit on small studies; otherwise the reference set (enough, by the
// argument in Frontier's doc comment) and the unit itself when it is not
// in it.
func (ev *evaluator) checkSet(e *envelope, self int) checks {
	if ev.all != nil {
		return checks{units: ev.all}
	}
	if _, in := e.inRef[self]; in || self < 0 {
		return checks{ref: true}
	}
	ev.checkBuf = append(ev.checkBuf[:0], self)
	return checks{ref: true, units: ev.checkBuf}
}

// radialScore reports a unit's score (theta, or 1/phi) under envelope e.
func (ev *evaluator) radialScore(e *envelope, o int) (float64, error) {
	p, err := e.solveOrRetry(ev.sc.x[o], ev.sc.y[o], o, false)
	if err != nil {
		return math.NaN(), err
	}
	holdAtOne(e.model, p)
	return scoreOf(e.model, p.score), nil
}

func scoreOf(m Model, v float64) float64 {
	if m.Orientation == Output {
		return 1 / v
	}
	return v
}

// unit evaluates unit o completely.
func (ev *evaluator) unit(o int) UnitResult {
	d, m := ev.d, ev.m
	u := UnitResult{Index: o, Name: unitName(d, o), Peers: []Peer{}}
	e := ev.main
	p, cert, err := ev.attempt(e, o)
	if (err != nil && !errors.Is(err, ErrNoFiniteScore)) || (err == nil && !cert.Verified) {
		// Rarer still, on data whose units differ in size by many orders
		// of magnitude: the program over the candidate set stays hard for
		// the solver while the one over all units (by column generation)
		// is not. Keep that answer if it checks out.
		if w := ev.wide(); w != nil {
			if q, c, err2 := ev.attempt(w, o); err2 == nil && c.Verified {
				e, p, cert, err = w, q, c, nil
			}
		}
	}
	if err != nil {
		u.Status = NotSolved
		u.Score = math.NaN()
		u.Problem = plainProblem(err, m)
		return u
	}
	u.Cert = cert
	u.Score = scoreOf(m, p.score)
	if m.Orientation == Output {
		u.Expansion = p.score
	}
	ev.fill(&u, e, p, o)
	if m.ScaleDetail {
		ev.scale(&u, o)
	}
	if m.Super {
		ev.super(&u, o)
	}
	return u
}

// attempt solves unit o's program under envelope e and certifies the
// answer; when the certificate fails it solves again with the solver's own
// scaling and a fresh phase 1, and keeps that answer if it checks out.
func (ev *evaluator) attempt(e *envelope, o int) (*point, Certificate, error) {
	m := ev.m
	x0, y0 := ev.sc.x[o], ev.sc.y[o]
	p, err := e.solveOrRetry(x0, y0, o, m.SecondStage)
	if err == nil && p.self > lambdaTol {
		if _, in := e.inRef[o]; !in {
			// The unit is not a candidate, so it is dominated by candidates and
			// never needed in its own combination: solve without it for clean peers.
			if q, err2 := e.solve(x0, y0, o, true, m.SecondStage); err2 == nil {
				p = q
			}
		}
	}
	if err != nil {
		return nil, Certificate{}, err
	}
	checks := ev.checkSet(e, o)
	holdAtOne(m, p)
	cert := e.certify(p, x0, y0, o, checks)
	if !cert.Verified {
		saved := append([]float64(nil), p.lambda...) // solve reuses the lambda buffer
		if q, err2 := e.solveCarefully(x0, y0, o, m.SecondStage); err2 == nil {
			holdAtOne(m, q)
			if c := e.certify(q, x0, y0, o, checks); c.Verified {
				return q, c, nil
			}
		}
		copy(p.lambda, saved)
	}
	return p, cert, nil
}

// wide returns the envelope over all units (made on first use), or nil when
// the candidate set already holds every unit.
func (ev *evaluator) wide() *envelope {
	if len(ev.cand) == ev.sc.n {
		return nil
	}
	if ev.wideEnv == nil {
		all := ev.all
		if all == nil {
			all = make([]int, ev.sc.n)
			for j := range all {
				all[j] = j
			}
		}
		ev.wideEnv = newEnvelope(ev.sc, all, ev.m)
	}
	return ev.wideEnv
}

// solveOrRetry solves a unit's program; when the solver runs into numerical
// trouble it tries once more with its own scaling and a fresh phase 1.
func (e *envelope) solveOrRetry(x, y []float64, o int, second bool) (*point, error) {
	p, err := e.solve(x, y, o, false, second)
	if err != nil && !errors.Is(err, ErrNoFiniteScore) {
		p, err = e.solveCarefully(x, y, o, second)
	}
	return p, err
}

// solveCarefully solves a unit's program whole, with the solver's own
// scaling and a fresh phase 1 (the second attempt after trouble).
func (e *envelope) solveCarefully(x, y []float64, o int, second bool) (*point, error) {
	e.careful = true
	defer func() { e.careful = false }()
	return e.solve(x, y, o, false, second)
}

// holdAtOne keeps a unit's own score at 1 or better: the unit itself is a
// feasible combination (score 1), so a score past 1 can only be rounding.
func holdAtOne(m Model, p *point) {
	if (m.Orientation == Input && p.score > 1) || (m.Orientation == Output && p.score < 1) {
		p.score = 1
	}
}

func unitName(d *Data, j int) string {
	if j < len(d.Units) {
		return d.Units[j]
	}
	return fmt.Sprintf("Unit %d", j+1)
}

func plainProblem(err error, m Model) string {
	switch {
	case errors.Is(err, ErrNoFiniteScore):
		if m.Orientation == Input {
			return "no combination of units produces this unit's outputs under the chosen returns to scale"
		}
		return "no combination of units uses no more than this unit's inputs under the chosen returns to scale"
	default:
		return "the linear program could not be solved reliably: " + err.Error()
	}
}

// fill sets peers, targets, weights and status from a solved point.
func (ev *evaluator) fill(u *UnitResult, e *envelope, p *point, o int) {
	sc, d, m := ev.sc, ev.d, ev.m
	for k, j := range e.ref {
		if l := p.lambda[k]; l > lambdaTol {
			u.Peers = append(u.Peers, Peer{Index: j, Name: unitName(d, j), Lambda: l})
		}
	}
	if p.self > lambdaTol {
		u.Peers = append(u.Peers, Peer{Index: o, Name: unitName(d, o), Lambda: p.self})
	}
	input := m.Orientation == Input
	slack := false
	u.Inputs = make([]Target, sc.m)
	for i := range u.Inputs {
		v := d.X[o][i]
		t := Target{Measure: nameAt(d.InputNames, i, "Input"), Value: v}
		if input {
			t.Radial = (1 - p.score) * v
		}
		if p.sIn[i] > slackTol {
			t.Slack = p.sIn[i] * sc.mx[i]
			slack = true
		}
		t.Target = v - t.Radial - t.Slack
		t.Change = change(v, t.Target)
		u.Inputs[i] = t
	}
	u.Outputs = make([]Target, sc.s)
	for r := range u.Outputs {
		v := d.Y[o][r]
		t := Target{Measure: nameAt(d.OutputNames, r, "Output"), Value: v}
		if !input {
			t.Radial = (p.score - 1) * v
		}
		if p.sOut[r] > slackTol {
			t.Slack = p.sOut[r] * sc.my[r]
			slack = true
		}
		t.Target = v + t.Radial + t.Slack
		t.Change = change(v, t.Target)
		u.Outputs[r] = t
	}
	// Weights in the data's own units.
	ms := sc.m + sc.s
	u.InputW = make([]Weight, sc.m)
	vx := 0.0
	for i := range u.InputW {
		w := cleanWeight(-p.y[i]) / sc.mx[i]
		u.InputW[i] = Weight{Measure: u.Inputs[i].Measure, Weight: w}
		vx += w * d.X[o][i]
	}
	u.OutputW = make([]Weight, sc.s)
	uy := 0.0
	for r := range u.OutputW {
		w := cleanWeight(p.y[sc.m+r]) / sc.my[r]
		u.OutputW[r] = Weight{Measure: u.Outputs[r].Measure, Weight: w}
		uy += w * d.Y[o][r]
	}
	for i := range u.InputW {
		if vx > 0 {
			u.InputW[i].Share = u.InputW[i].Weight * d.X[o][i] / vx
		}
	}
	for r := range u.OutputW {
		if uy > 0 {
			u.OutputW[r].Share = u.OutputW[r].Weight * d.Y[o][r] / uy
		}
	}
	for q := range e.rr {
		u.Free += p.y[ms+q]
	}
	u.Free += 0 // -0 becomes 0
	switch {
	case u.Score < 1-scoreTol:
		u.Status = Inefficient
	case slack && m.SecondStage:
		u.Status = WeaklyEfficient
	default:
		u.Status = Efficient
	}
}

// cleanWeight turns rounding noise around zero in a scaled multiplier
// weight (such as -2e-20, or -0) into zero; a clearly negative weight is
// kept so that the certificate reports it.
func cleanWeight(w float64) float64 {
	if w > -1e-12 && w < 1e-15 {
		return 0
	}
	return w
}

func nameAt(names []string, i int, kind string) string {
	if i < len(names) {
		return names[i]
	}
	return fmt.Sprintf("%s %d", kind, i+1)
}

func change(from, to float64) float64 {
	if from == 0 {
		if to == 0 {
			return 0
		}
		return math.NaN()
	}
	return (to - from) / from * 100
}

// scale fills the returns-to-scale detail: the constant, variable and
// non-increasing scores in the model's orientation, scale efficiency
// CRS / VRS, and the class by the test of Färe, Grosskopf & Lovell (1994,
// Production Frontiers): CRS = VRS means constant returns; otherwise the unit
// operates under decreasing returns when its NIRS score equals its VRS score
// and under increasing returns when it does not.
func (ev *evaluator) scale(u *UnitResult, o int) {
	c, err1 := ev.radialScore(ev.crs, o)
	v, err2 := ev.radialScore(ev.vrs, o)
	n, err3 := ev.radialScore(ev.nirs, o)
	if err1 != nil || err2 != nil || err3 != nil {
		return
	}
	u.ScoreCRS, u.ScoreVRS, u.ScoreNIRS = c, v, n
	u.ScaleEff = c / v
	switch {
	case math.Abs(c-v) <= 1e-7*v:
		u.ScaleClass = ScaleConstant
	case math.Abs(n-v) <= 1e-7*v:
		u.ScaleClass = ScaleDecreasing
	default:
		u.ScaleClass = ScaleIncreasing
	}
}

// Merge joins the results of runs over disjoint sets of units of the same
// data and model (RunWith with Options.Units, for example one run per
// worker) into one result in unit order, and counts peers over all of them.
func Merge(parts ...*Result) (*Result, error) {
	if len(parts) == 0 {
		return nil, errors.New("dea: nothing to merge")
	}
	out := &Result{Model: parts[0].Model, Frontier: parts[0].Frontier}
	seen := map[int]bool{}
	for _, p := range parts {
		if p.Model != out.Model {
			return nil, errors.New("dea: the results to merge come from different models")
		}
		for _, u := range p.Units {
			if seen[u.Index] {
				return nil, fmt.Errorf("dea: unit %d appears in two of the results to merge", u.Index)
			}
			seen[u.Index] = true
			u.PeerCount = 0
			out.Units = append(out.Units, u)
		}
	}
	slices.SortFunc(out.Units, func(a, b UnitResult) int { return a.Index - b.Index })
	countPeers(out)
	return out, nil
}
