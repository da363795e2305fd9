package dea

import (
	"errors"
	"fmt"
	"math"

	"peerlens/engine/lp"
)

// ErrNoFiniteScore means the envelopment program of a point has no feasible
// solution: no combination of the reference units can produce its outputs
// (input orientation) or use no more than its inputs (output orientation)
// under the returns to scale asked for. It happens for super-efficiency under
// variable returns (Seiford & Zhu 1999, JORS 50).
var ErrNoFiniteScore = errors.New("dea: no finite score exists for this unit against this reference set")

// scaled holds the data divided by each measure's mean, unit by unit.
type scaled struct {
	n, m, s int
	x, y    [][]float64 // x[unit][input], y[unit][output]
	xs, ys  []float64   // the same values in one array per side, unit after unit
	mx, my  []float64   // the divisors (the measures' means, 1 where the mean is 0)
}

func scaleData(d *Data) *scaled {
	n := len(d.X)
	sc := &scaled{n: n}
	if n > 0 {
		sc.m, sc.s = len(d.X[0]), len(d.Y[0])
	}
	sc.mx = means(d.X, sc.m)
	sc.my = means(d.Y, sc.s)
	sc.x = make([][]float64, n)
	sc.y = make([][]float64, n)
	// One backing array per side keeps the units next to each other in
	// memory, which the passes over all units profit from.
	xs := make([]float64, n*sc.m)
	ys := make([]float64, n*sc.s)
	sc.xs, sc.ys = xs, ys
	for j := 0; j < n; j++ {
		sc.x[j] = xs[j*sc.m : (j+1)*sc.m : (j+1)*sc.m]
		sc.y[j] = ys[j*sc.s : (j+1)*sc.s : (j+1)*sc.s]
		for i, v := range d.X[j] {
			sc.x[j][i] = v / sc.mx[i]
		}
		for r, v := range d.Y[j] {
			sc.y[j][r] = v / sc.my[r]
		}
	}
	return sc
}

func means(rows [][]float64, k int) []float64 {
	mu := make([]float64, k)
	for _, r := range rows {
		for i, v := range r {
			mu[i] += math.Abs(v)
		}
	}
	for i := range mu {
		mu[i] /= float64(max(len(rows), 1))
		if mu[i] == 0 || math.IsNaN(mu[i]) || math.IsInf(mu[i], 0) {
			mu[i] = 1
		}
	}
	return mu
}

func divide(v, by []float64) []float64 {
	out := make([]float64, len(v))
	for i := range v {
		out[i] = v[i] / by[i]
	}
	return out
}

// returnsRow is one constraint on sum(lambda): sum(lambda) + sign*slack = rhs
// (sign 0: an equality with no slack column).
type returnsRow struct {
	rhs  float64
	sign float64
}

func returnsRows(m Model) []returnsRow {
	switch m.Returns {
	case Variable:
		return []returnsRow{{1, 0}}
	case NonIncreasing:
		return []returnsRow{{1, 1}}
	case NonDecreasing:
		return []returnsRow{{1, -1}}
	case Bounded:
		var rows []returnsRow
		if m.Lower > 0 {
			rows = append(rows, returnsRow{m.Lower, -1})
		}
		if m.Upper > 0 && !math.IsInf(m.Upper, 1) {
			rows = append(rows, returnsRow{m.Upper, 1})
		}
		return rows
	}
	return nil
}

// envelope is the envelopment program of one model against one reference
// set, laid out once and reused for many evaluated points. Columns:
//
//	0            the score variable (theta, or phi in output orientation)
//	1..K         lambda for each reference unit
//	K+1          lambda for the evaluated point itself when it is not in the
//	             reference set (a zero column otherwise)
//	then         m input slacks, s output slacks, one slack per returns row
//	             that has one.
//
// Rows: m inputs, s outputs, then the returns rows.
type envelope struct {
	model  Model
	sc     *scaled
	ref    []int // reference units
	inRef  map[int]int
	rr     []returnsRow
	rows   int
	cols   int
	prob   lp.Problem
	extra  int           // column index of the extra (self) lambda
	slack0 int           // first slack column
	ws     *lp.Workspace // buffers of the radial stage
	// The second-stage program (one more row, one more column), laid out on
	// first use; columns that solve changes are copied into it per call.
	ws2   *lp.Workspace
	prob2 lp.Problem
	dirty int // a lambda column of prob2 that differs from prob (-1: none)
	// cutoff, when positive, stops the radial stage as soon as the score
	// (input orientation) is proven below it: screening needs no more.
	cutoff float64
	// k is the scale of the score column in the last solve (see solve).
	k float64
	// careful makes solve scale rows and columns and start from phase 1: the
	// second attempt for a result whose certificate failed.
	careful bool
	// lam holds the lambdas of the last solved point (one per reference
	// unit): reused, because a large reference set would otherwise make
	// every unit allocate a long slice that is read once.
	lam []float64
	// dots is the buffer of certify's pass over the reference units.
	dots []float64
	// Column generation (see restricted and restrictedMode): one
	// restricted program per stage, the columns always in it, and a ring
	// of lambda columns that were basic in recent solutions, which start
	// the next point's program.
	rs, rs2    *restricted
	init       []int
	noRestrict bool
	fixed      []int
	pool       []int
	poolNext   int
	inPool     []bool
}

func newEnvelope(sc *scaled, ref []int, m Model) *envelope {
	e := &envelope{model: m, sc: sc, ref: ref, rr: returnsRows(m)}
	e.inRef = make(map[int]int, len(ref))
	for k, j := range ref {
		e.inRef[j] = k
	}
	ms := sc.m + sc.s
	e.rows = ms + len(e.rr)
	nrs := 0
	for _, r := range e.rr {
		if r.sign != 0 {
			nrs++
		}
	}
	K := len(ref)
	e.extra = K + 1
	e.slack0 = K + 2
	e.cols = K + 2 + ms + nrs
	a := make([]float64, e.rows*e.cols)
	for k, j := range ref {
		e.fillLambda(a[(1+k)*e.rows:(2+k)*e.rows], sc.x[j], sc.y[j])
	}
	for i := 0; i < sc.m; i++ {
		a[(e.slack0+i)*e.rows+i] = 1
	}
	for r := 0; r < sc.s; r++ {
		a[(e.slack0+sc.m+r)*e.rows+sc.m+r] = -1
	}
	c := e.slack0 + ms
	for q, r := range e.rr {
		if r.sign != 0 {
			a[c*e.rows+ms+q] = r.sign
			c++
		}
	}
	e.prob = lp.Problem{Rows: e.rows, A: a, B: make([]float64, e.rows), C: make([]float64, e.cols)}
	e.ws, e.ws2, e.dirty = new(lp.Workspace), new(lp.Workspace), -1
	e.fixed = append(e.fixed, 0, e.extra)
	for j := e.slack0; j < e.cols; j++ {
		e.fixed = append(e.fixed, j)
	}
	return e
}

// restrictedMode says whether solve uses column generation.
func (e *envelope) restrictedMode() bool {
	return len(e.ref) > restrictAbove && !e.careful && !e.noRestrict
}

// forget empties the pool.
func (e *envelope) forget() {
	for _, j := range e.pool {
		e.inPool[j] = false
	}
	e.pool, e.poolNext = e.pool[:0], 0
}

// remember puts the basic lambda columns of a solution into the pool.
func (e *envelope) remember(basis []int) {
	if e.inPool == nil {
		e.inPool = make([]bool, e.cols)
	}
	K := len(e.ref)
	for _, j := range basis {
		if j < 1 || j > K || e.inPool[j] {
			continue
		}
		if len(e.pool) < poolSize {
			e.pool = append(e.pool, j)
		} else {
			e.inPool[e.pool[e.poolNext]] = false
			e.pool[e.poolNext] = j
			e.poolNext = (e.poolNext + 1) % poolSize
		}
		e.inPool[j] = true
	}
}

func (e *envelope) fillLambda(col, x, y []float64) {
	copy(col, x)
	copy(col[e.sc.m:], y)
	for q := range e.rr {
		col[e.sc.m+e.sc.s+q] = 1
	}
}

// clone gives a copy that can be used from another goroutine.
func (e *envelope) clone() *envelope {
	c := *e
	c.prob.A = append([]float64(nil), e.prob.A...)
	c.prob.B = make([]float64, e.rows)
	c.prob.C = make([]float64, e.cols)
	c.ws, c.ws2, c.prob2, c.dirty = new(lp.Workspace), new(lp.Workspace), lp.Problem{}, -1
	c.lam, c.dots = nil, nil
	c.rs, c.rs2, c.pool, c.poolNext, c.inPool = nil, nil, nil, 0, nil
	c.init = nil
	return &c
}

// point is the solution of one point's envelopment program, in scaled data.
type point struct {
	score  float64   // theta or phi
	lambda []float64 // per reference unit; the envelope's buffer, valid until its next solve
	self   float64   // lambda of the extra (self) column
	sIn    []float64 // input slacks
	sOut   []float64 // output slacks
	y      []float64 // duals of the radial stage, one per row
	iter   int
	phase1 bool
	basis  []int
}

// solve evaluates the point (x, y) in scaled data. self is the point's own
// unit index when it is a unit of the data (-1 otherwise); a unit that is not
// in the reference set gets the extra column, and any unit that is present
// gives the solver a feasible start (score 1, its own lambda 1). With
// exclude, the point's own unit is left out of the reference set
// (super-efficiency).
func (e *envelope) solve(x, y []float64, self int, exclude, second bool) (*point, error) {
	sc, rows := e.sc, e.rows
	a, b, c := e.prob.A, e.prob.B, e.prob.C
	input := e.model.Orientation == Input
	// Score column and right-hand side.
	col0 := a[0:rows]
	for i := range col0 {
		col0[i] = 0
	}
	for i := range b {
		b[i] = 0
	}
	for i := range c {
		c[i] = 0
	}
	// The score variable is carried as k*score, with k the power of two
	// nearest the largest entry of its column, so that the column's largest
	// entry is near 1 even for a unit far smaller or larger than the
	// measure's mean (otherwise its entries could fall below the solver's
	// pivot tolerance). The objective is unchanged: c[0]*(k*score) = score.
	if input {
		k := columnScale(x)
		for i := 0; i < sc.m; i++ {
			col0[i] = -x[i] / k
		}
		copy(b[sc.m:], y)
		c[0] = 1 / k
		e.k = k
	} else {
		k := columnScale(y)
		for r := 0; r < sc.s; r++ {
			col0[sc.m+r] = -y[r] / k
		}
		copy(b, x)
		c[0] = -1 / k
		e.k = k
	}
	for q, r := range e.rr {
		b[sc.m+sc.s+q] = r.rhs
	}
	extra := a[e.extra*rows : (e.extra+1)*rows]
	selfCol := -1
	k, inRef := e.inRef[self]
	if self < 0 {
		inRef = false
	}
	hidden := -1
	switch {
	case exclude && inRef:
		hidden = 1 + k
		// Hide the unit's own column: zero it and restore it afterwards.
		own := a[(1+k)*rows : (2+k)*rows]
		saved := append([]float64(nil), own...)
		for i := range own {
			own[i] = 0
		}
		defer copy(own, saved)
		zero(extra)
	case exclude || self < 0:
		zero(extra)
	case inRef:
		zero(extra)
		selfCol = 1 + k
	default:
		e.fillLambda(extra, sc.x[self], sc.y[self])
		selfCol = e.extra
	}
	opt := lp.Options{NoScale: !e.careful, Checked: true, NoReducedCosts: true}
	if e.cutoff > 0 && input {
		opt.HasCutoff, opt.Cutoff = true, e.cutoff
	}
	if selfCol >= 0 && !e.careful {
		opt.Basis = e.selfBasis(x, y, selfCol)
	}
	var sol *lp.Solution
	var err error
	if e.restrictedMode() {
		if e.rs == nil {
			e.rs = new(restricted)
		}
		// Start from the unit's own column and the pool: columns that
		// served the points evaluated just before (points come in an
		// order that puts similar ones together).
		init := e.init[:0]
		if selfCol >= 1 && selfCol <= len(e.ref) {
			init = append(init, selfCol)
		}
		init = append(init, e.pool...)
		e.init = init
		sol, err = e.rs.solve(&e.prob, e.fixed, 1, 1+len(e.ref), init, opt.Basis, opt)
		if err == nil {
			e.remember(sol.Basis)
		} else if !errors.Is(err, lp.ErrInfeasible) {
			sol, err = e.ws.Solve(&e.prob, &opt) // numerical trouble: the whole program
		}
	} else {
		sol, err = e.ws.Solve(&e.prob, &opt)
	}
	if err != nil {
		if errors.Is(err, lp.ErrInfeasible) {
			return &point{y: append([]float64(nil), sol.Y...)}, fmt.Errorf("%w (%v)", ErrNoFiniteScore, err)
		}
		return nil, err
	}
	p := &point{score: sol.X[0] / e.k, y: append([]float64(nil), sol.Y...), iter: sol.Iter, phase1: sol.Phase1, basis: append([]int(nil), sol.Basis...)}
	if second && e.slacksMayMove(sol.Y) {
		if sol2, err := e.secondStage(sol, hidden); err == nil {
			p.iter += sol2.Iter
			sol = sol2
		} else {
			return nil, fmt.Errorf("second stage: %w", err)
		}
	}
	K := len(e.ref)
	e.lam = append(e.lam[:0], sol.X[1:1+K]...)
	p.lambda = e.lam
	p.self = sol.X[e.extra]
	p.sIn = append([]float64(nil), sol.X[e.slack0:e.slack0+sc.m]...)
	p.sOut = append([]float64(nil), sol.X[e.slack0+sc.m:e.slack0+sc.m+sc.s]...)
	return p, nil
}

// slacksMayMove reports whether the second stage can find positive slacks.
// It cannot when every input and output row has a dual value clearly away
// from zero: the reduced cost of each slack column is then positive, so by
// complementary slackness every slack is zero in every optimal solution of
// the radial stage, and the radial stage's solution already has the
// largest slack sum (zero).
func (e *envelope) slacksMayMove(y []float64) bool {
	const margin = 1e-9
	for i := 0; i < e.sc.m; i++ {
		if -y[i] <= margin {
			return true
		}
	}
	for r := 0; r < e.sc.s; r++ {
		if y[e.sc.m+r] <= margin {
			return true
		}
	}
	return false
}

// columnScale is the power of two nearest the largest entry of v (1 when v
// has no positive entry).
func columnScale(v []float64) float64 {
	top := 0.0
	for _, x := range v {
		top = math.Max(top, x)
	}
	if top <= 0 || math.IsInf(top, 0) {
		return 1
	}
	return pow2(top)
}

func pow2(v float64) float64 {
	_, e := math.Frexp(v)
	return math.Ldexp(1, e-1)
}

func zero(v []float64) {
	for i := range v {
		v[i] = 0
	}
}

// selfBasis is the feasible starting basis at score 1 with the unit's own
// lambda 1: the score column, the unit's lambda, and every slack except one
// input slack (and one output slack under constant returns; one input and one
// output slack when the program has no returns row, and the mirror image in
// output orientation). The solver checks it and falls back to phase 1 when it
// is singular or infeasible.
func (e *envelope) selfBasis(x, y []float64, selfCol int) []int {
	sc := e.sc
	iStar, rStar := argmax(x), argmax(y)
	if iStar < 0 || rStar < 0 {
		return nil
	}
	basis := []int{0, selfCol}
	input := e.model.Orientation == Input
	noRow := len(e.rr) == 0
	for i := 0; i < sc.m; i++ {
		if i == iStar && (input || noRow) {
			continue
		}
		basis = append(basis, e.slack0+i)
	}
	for r := 0; r < sc.s; r++ {
		if r == rStar && (!input || noRow) {
			continue
		}
		basis = append(basis, e.slack0+sc.m+r)
	}
	// With two returns rows (bounds on both sides) the upper row's slack is basic.
	if len(e.rr) == 2 {
		basis = append(basis, e.cols-1)
	}
	if len(basis) != e.rows {
		return nil
	}
	return basis
}

func argmax(v []float64) int {
	k, best := -1, 0.0
	for i, x := range v {
		if x > best {
			k, best = i, x
		}
	}
	return k
}

// secondStage fixes the radial score at its optimum and maximises the sum of
// the slacks (in scaled data, so each slack is weighted by 1 / its measure's
// mean). It adds one row, score + t = score* (input) or score - t = score*
// (output), whose slack t starts basic at zero next to the optimal basis.
func (e *envelope) secondStage(first *lp.Solution, hidden int) (*lp.Solution, error) {
	rows, cols := e.rows+1, e.cols+1
	if e.prob2.A == nil {
		a := make([]float64, rows*cols)
		for j := 0; j < e.cols; j++ {
			copy(a[j*rows:j*rows+e.rows], e.prob.A[j*e.rows:(j+1)*e.rows])
		}
		a[0*rows+e.rows] = 1
		if e.model.Orientation == Input {
			a[e.cols*rows+e.rows] = 1
		} else {
			a[e.cols*rows+e.rows] = -1
		}
		c := make([]float64, cols)
		ms := e.sc.m + e.sc.s
		for j := e.slack0; j < e.slack0+ms; j++ {
			c[j] = -1
		}
		e.prob2 = lp.Problem{Rows: rows, A: a, B: make([]float64, rows), C: c}
	}
	// Bring the columns solve changes up to date: the score column, the
	// extra column, and a lambda column hidden now or the last time.
	a := e.prob2.A
	for _, j := range [...]int{0, e.extra, e.dirty, hidden} {
		if j >= 0 {
			copy(a[j*rows:j*rows+e.rows], e.prob.A[j*e.rows:(j+1)*e.rows])
		}
	}
	e.dirty = hidden
	copy(e.prob2.B, e.prob.B)
	e.prob2.B[e.rows] = first.X[0]
	basis := append(append([]int(nil), first.Basis...), e.cols)
	for _, j := range basis {
		if j < 0 {
			basis = nil // a redundant row: let phase 1 find a basis
			break
		}
	}
	opt := lp.Options{Basis: basis, NoScale: true, Checked: true, NoReducedCosts: true}
	if e.restrictedMode() && e.rs != nil {
		if e.rs2 == nil {
			e.rs2 = new(restricted)
		}
		// Start from the first stage's columns; the new row's slack t is
		// column e.cols.
		fixed := append(e.fixed[:len(e.fixed):len(e.fixed)], e.cols)
		sol, err := e.rs2.solve(&e.prob2, fixed, 1, 1+len(e.ref), e.rs.cols, basis, opt)
		if err == nil || errors.Is(err, lp.ErrInfeasible) {
			return sol, err
		}
	}
	return e.ws2.Solve(&e.prob2, &opt)
}
