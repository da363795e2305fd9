package lp

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"

	"peerlens/engine/internal/kernel"
)

// Errors returned by Solve. They are wrapped with detail; test with errors.Is.
var (
	ErrInfeasible     = errors.New("lp: no feasible solution")
	ErrUnbounded      = errors.New("lp: objective unbounded below")
	ErrNumerical      = errors.New("lp: numerical trouble")
	ErrIterationLimit = errors.New("lp: iteration limit reached")
	ErrShape          = errors.New("lp: malformed problem")
)

// Problem is a linear program in standard form: minimise C'x subject to
// A x = B and x >= 0. A holds the Rows x len(C) matrix column by column:
// column j is A[j*Rows : (j+1)*Rows].
type Problem struct {
	Rows int
	A    []float64
	B    []float64
	C    []float64
}

// Cols is the number of columns (variables).
func (p *Problem) Cols() int { return len(p.C) }

// Column returns column j of A (a view, not a copy).
func (p *Problem) Column(j int) []float64 { return p.A[j*p.Rows : (j+1)*p.Rows] }

// Options tune a solve. The zero value is ready to use.
type Options struct {
	// Basis, when it has Rows entries, names the columns of a starting basis
	// that the caller believes primal feasible. If it is singular or
	// infeasible the solver falls back to phase 1.
	Basis []int
	// MaxIter bounds the number of pivots (0: 50*(Rows+Cols)+1000).
	MaxIter int
	// NoScale turns off row and column scaling (for callers that scale
	// their data themselves).
	NoScale bool
	// Checked says the caller has made sure every value of A and C is
	// finite, which saves passes over them.
	Checked bool
	// NoReducedCosts leaves Solution.D empty, which saves a pass over the
	// matrix for callers that do not read it.
	NoReducedCosts bool
	// HasCutoff makes phase 2 stop as soon as the objective falls below
	// Cutoff: the Solution is then feasible but not optimal, Stopped is
	// true and the error is nil. Screening callers that only need to know
	// whether the optimum is below a value use it.
	HasCutoff bool
	Cutoff    float64
}

// Solution is an optimal basic solution, or on ErrInfeasible a Farkas
// certificate in Y.
type Solution struct {
	X      []float64 // primal values, one per column
	Y      []float64 // dual values, one per row: C - A'Y >= 0 at optimality
	D      []float64 // reduced costs C - A'Y, one per column
	Obj    float64   // C'X
	Basis  []int     // the optimal basis (column per row position); -1 marks a redundant row
	Iter   int       // pivots made, both phases
	Phase1 bool      // whether phase 1 ran
	Bland  int       // pivots made under Bland's rule
	// Stopped says phase 2 stopped at Options.Cutoff before optimality.
	Stopped bool
}

// Workspace keeps the buffers of a solver between solves, so that a caller
// solving many programs of similar shape allocates (almost) nothing per
// solve. Its zero value is ready to use; it must not be used by two
// goroutines at once. The Solution returned by Workspace.Solve, and every
// slice in it, belongs to the workspace and is overwritten by the next solve.
type Workspace struct {
	sv  solver
	sol Solution
}

// Solve solves p like the package-level Solve, reusing w's buffers.
func (w *Workspace) Solve(p *Problem, opt *Options) (*Solution, error) {
	w.sol = Solution{X: w.sol.X, Y: w.sol.Y, D: w.sol.D, Basis: w.sol.Basis}
	return w.sv.solve(p, opt, &w.sol)
}

// Tolerances, in the scaled problem.
const (
	tolPivot    = 1e-9  // smallest pivot element accepted
	tolOpt      = 1e-9  // reduced cost below -tolOpt is a candidate to enter
	tolFeas     = 1e-9  // basic values above -tolFeas count as feasible
	harrisDelta = 1e-10 // Harris relaxation of the ratio test
	// RefactorEvery is the number of pivots between fresh factorisations.
	RefactorEvery = 50
	// StallLimit is the number of pivots without strict progress after
	// which Bland's rule takes over.
	StallLimit = 30
)

type solver struct {
	m, n                 int // rows, structural columns
	p                    *Problem
	r, s                 []float64 // row and column scale factors
	b                    []float64 // scaled right-hand side
	cost                 []float64 // current phase costs, length n+m (artificials after n)
	basis                []int     // column per row position
	pos                  []int     // position in basis per column, -1 if nonbasic
	binv                 []float64 // m x m row-major inverse of the basis
	xb                   []float64 // basic values
	y                    []float64 // duals (scaled)
	alpha                []float64
	col                  []float64
	barred               []bool // columns that may not enter (artificials in phase 2)
	artSign              []float64
	iter, bland, maxIter int
	sinceRefactor        int
	priceStart           int  // where partial pricing resumes
	plain                bool // no scaling: columns are used as stored
	cutoff               float64
	hasCutoff, stopped   bool
	// LU factorisation buffers (row-major m x m) and pivots.
	lu, work []float64
	ipiv     []int
	rmax     []float64
	yOld     []float64
	// installed counts the entries of basis whose pos is set.
	installed int
	// ones is how many leading column factors in s are known to be 1.
	ones int
	dots []float64 // pricing's buffer
}

// grow returns v resized to n, reusing its storage when it is large enough.
func grow[T any](v []T, n int) []T {
	if cap(v) >= n {
		return v[:n]
	}
	return make([]T, n)
}

// Solve solves p. It never panics on malformed input: shapes are checked and
// reported as ErrShape.
func Solve(p *Problem, opt *Options) (*Solution, error) {
	return new(solver).solve(p, opt, &Solution{})
}

// check reports a malformed problem.
func check(p *Problem, opt *Options) error {
	m, n := p.Rows, len(p.C)
	if m <= 0 || len(p.B) != m || len(p.A) != m*n {
		return fmt.Errorf("%w: %d rows, %d costs, %d right-hand sides, %d matrix entries", ErrShape, m, n, len(p.B), len(p.A))
	}
	if !opt.Checked {
		for _, v := range p.A {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("%w: matrix holds %v", ErrShape, v)
			}
		}
	}
	for _, v := range p.B {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%w: right-hand side holds %v", ErrShape, v)
		}
	}
	if !opt.Checked {
		for _, v := range p.C {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("%w: cost holds %v", ErrShape, v)
			}
		}
	}
	return nil
}

// solve runs the method on p, reusing sv's buffers, and fills sol.
func (sv *solver) solve(p *Problem, opt *Options, sol *Solution) (*Solution, error) {
	if opt == nil {
		opt = &Options{}
	}
	if err := check(p, opt); err != nil {
		return nil, err
	}
	m, n := p.Rows, len(p.C)
	sv.m, sv.n, sv.p = m, n, p
	sv.iter, sv.bland, sv.sinceRefactor, sv.priceStart = 0, 0, 0, 0
	sv.cutoff, sv.hasCutoff, sv.stopped = opt.Cutoff, false, false
	sv.maxIter = opt.MaxIter
	if sv.maxIter <= 0 {
		sv.maxIter = 50*(m+n) + 1000
	}
	sv.scale(!opt.NoScale)
	sv.plain = opt.NoScale
	// Between solves every entry of pos is -1 and every entry of barred is
	// false (see release), so a solve over many columns starts without a
	// pass over them.
	defer sv.release()
	sv.basis = grow(sv.basis, m)
	if cap(sv.pos) < n+m {
		sv.pos = make([]int, n+m)
		for i := range sv.pos {
			sv.pos[i] = -1
		}
	}
	sv.pos = sv.pos[:n+m]
	sv.binv = grow(sv.binv, m*m)
	sv.xb = grow(sv.xb, m)
	sv.y = grow(sv.y, m)
	sv.alpha = grow(sv.alpha, m)
	sv.col = grow(sv.col, m)
	sv.cost = grow(sv.cost, n+m)
	if cap(sv.barred) < n+m {
		sv.barred = make([]bool, n+m)
	}
	sv.barred = sv.barred[:n+m]
	sv.artSign = grow(sv.artSign, m)
	for i := range sv.artSign {
		sv.artSign[i] = 1
		if sv.b[i] < 0 {
			sv.artSign[i] = -1
		}
	}

	sv.installed = 0
	started := len(opt.Basis) == m && sv.tryBasis(opt.Basis)
	if !started {
		sol.Phase1 = true
		if err := sv.phase1(); err != nil {
			if errors.Is(err, ErrInfeasible) {
				sol.Y = sv.unscaledDuals()
				sol.Iter, sol.Bland = sv.iter, sv.bland
			}
			return sol, err
		}
	}
	if sv.plain {
		copy(sv.cost[:n], p.C)
	} else {
		for j := 0; j < n; j++ {
			sv.cost[j] = p.C[j] * sv.s[j]
		}
	}
	for k := n; k < n+m; k++ {
		sv.cost[k] = 0
		sv.barred[k] = true
	}
	sv.hasCutoff = opt.HasCutoff
	if err := sv.optimise(); err != nil {
		sol.Iter, sol.Bland = sv.iter, sv.bland
		return sol, err
	}
	sv.fill(sol, !opt.NoReducedCosts)
	return sol, nil
}

// scale computes power-of-two row and column factors so that the largest
// magnitude in every row and column of the scaled matrix is near 1.
func (sv *solver) scale(on bool) {
	m, n, a := sv.m, sv.n, sv.p.A
	sv.r = grow(sv.r, m)
	if cap(sv.s) < n {
		sv.s, sv.ones = make([]float64, n), 0
	}
	sv.s = sv.s[:n]
	sv.b = grow(sv.b, m)
	for i := range sv.r {
		sv.r[i] = 1
	}
	// Column factors of 1 are kept from solve to solve (ones counts them),
	// so unscaled solves over many columns need no pass to set them.
	for j := sv.ones; j < n; j++ {
		sv.s[j] = 1
	}
	sv.ones = max(sv.ones, n)
	if on {
		sv.ones = 0
		sv.rmax = grow(sv.rmax, m)
		rmax := sv.rmax
		clear(rmax)
		for j := 0; j < n; j++ {
			c := a[j*m : (j+1)*m]
			for i, v := range c {
				if v < 0 {
					v = -v
				}
				if v > rmax[i] {
					rmax[i] = v
				}
			}
		}
		for i, v := range rmax {
			if v > 0 {
				sv.r[i] = pow2(1 / v)
			}
		}
		for j := 0; j < n; j++ {
			c := a[j*m : (j+1)*m]
			cm := 0.0
			for i, v := range c {
				v = math.Abs(v * sv.r[i])
				if v > cm {
					cm = v
				}
			}
			if cm > 0 {
				sv.s[j] = pow2(1 / cm)
			}
		}
	}
	for i := range sv.b {
		sv.b[i] = sv.p.B[i] * sv.r[i]
	}
}

// pow2 rounds v to the nearest power of two, so scaling adds no rounding error.
func pow2(v float64) float64 {
	_, e := math.Frexp(v)
	return math.Ldexp(1, e-1)
}

// column writes scaled column j (structural or artificial) into dst.
func (sv *solver) column(j int, dst []float64) {
	if j >= sv.n {
		for i := range dst {
			dst[i] = 0
		}
		dst[j-sv.n] = sv.artSign[j-sv.n]
		return
	}
	c := sv.p.A[j*sv.m : (j+1)*sv.m]
	sj := sv.s[j]
	for i, v := range c {
		dst[i] = v * sv.r[i] * sj
	}
}

// dotColumn returns (scaled column j) . v.
func (sv *solver) dotColumn(j int, v []float64) float64 {
	if j >= sv.n {
		k := j - sv.n
		return sv.artSign[k] * v[k]
	}
	c := sv.p.A[j*sv.m : (j+1)*sv.m]
	t := 0.0
	for i, a := range c {
		t += a * sv.r[i] * v[i]
	}
	return t * sv.s[j]
}

// release restores what solve expects of pos and barred: the columns of
// the last basis (and of a basis tryBasis left half installed) leave pos,
// and the artificial columns' bars are lifted.
func (sv *solver) release() {
	sv.uninstall()
	clear(sv.barred[min(sv.n, len(sv.barred)):])
}

// uninstall takes the columns of the installed basis out of pos.
func (sv *solver) uninstall() {
	for _, j := range sv.basis[:sv.installed] {
		sv.pos[j] = -1
	}
	sv.installed = 0
}

// tryBasis installs a caller's basis; it reports false when the basis is
// singular or not primal feasible.
func (sv *solver) tryBasis(basis []int) bool {
	sv.uninstall()
	for k, j := range basis {
		if j < 0 || j >= sv.n || sv.pos[j] >= 0 {
			return false
		}
		sv.basis[k] = j
		sv.pos[j] = k
		sv.installed = k + 1
	}
	if sv.refactor() != nil {
		return false
	}
	for _, v := range sv.xb {
		if v < -1e-7 {
			return false
		}
	}
	return true
}

// refactor recomputes the basis inverse and the basic values from scratch:
// an LU factorisation with partial pivoting and the inverse from it
// (invertSmall for small bases, gonum's lapack64.Getrf and Getri beyond).
// The basis is refused when its 1-norm condition number, computed exactly
// from the basis and its inverse, exceeds 1e13.
func (sv *solver) refactor() error {
	m := sv.m
	sv.lu = grow(sv.lu, m*m)
	sv.ipiv = grow(sv.ipiv, m)
	sv.work = grow(sv.work, 4*m*m)
	bnorm := 0.0
	for k, j := range sv.basis {
		sv.column(j, sv.col)
		cn := 0.0
		for i := 0; i < m; i++ {
			sv.lu[i*m+k] = sv.col[i]
			cn += math.Abs(sv.col[i])
		}
		bnorm = math.Max(bnorm, cn)
	}
	if m <= smallBasis {
		if !invertSmall(sv.lu, sv.work, sv.ipiv, m) {
			return fmt.Errorf("%w: singular basis", ErrNumerical)
		}
	} else {
		g := blas64.General{Rows: m, Cols: m, Stride: m, Data: sv.lu}
		if !lapack64.Getrf(g, sv.ipiv) || !lapack64.Getri(g, sv.ipiv, sv.work, len(sv.work)) {
			return fmt.Errorf("%w: singular basis", ErrNumerical)
		}
	}
	inorm := 0.0
	for k := 0; k < m; k++ {
		cn := 0.0
		for i := 0; i < m; i++ {
			cn += math.Abs(sv.lu[i*m+k])
		}
		inorm = math.Max(inorm, cn)
	}
	if c := bnorm * inorm; c > 1e13 || math.IsNaN(c) || math.IsInf(c, 0) {
		return fmt.Errorf("%w: basis condition number %.3g", ErrNumerical, c)
	}
	copy(sv.binv, sv.lu)
	for i := 0; i < m; i++ {
		t := 0.0
		row := sv.binv[i*m : (i+1)*m]
		for k, v := range row {
			t += v * sv.b[k]
		}
		sv.xb[i] = t
	}
	sv.sinceRefactor = 0
	return nil
}

// phase1 finds a feasible basis, starting from the artificial basis.
func (sv *solver) phase1() error {
	m, n := sv.m, sv.n
	sv.uninstall()
	for k := 0; k < m; k++ {
		sv.basis[k] = n + k
		sv.pos[n+k] = k
	}
	sv.installed = m
	for j := range sv.cost {
		sv.cost[j] = 0
		sv.barred[j] = false
	}
	for k := n; k < n+m; k++ {
		sv.cost[k] = 1
	}
	if err := sv.refactor(); err != nil {
		return err
	}
	if err := sv.optimise(); err != nil {
		return err
	}
	sum, bmax := 0.0, 1.0
	for k, j := range sv.basis {
		if j >= n {
			sum += sv.xb[k]
		}
	}
	for _, v := range sv.b {
		bmax = math.Max(bmax, math.Abs(v))
	}
	if sum > 1e-8*bmax {
		sv.computeDuals()
		return fmt.Errorf("%w: phase 1 ends with infeasibility %.3g", ErrInfeasible, sum)
	}
	// Drive artificials out of the basis where a structural column can replace them.
	for k := 0; k < m; k++ {
		if sv.basis[k] < n {
			continue
		}
		best, bestV := -1, 1e-7
		row := sv.binv[k*m : (k+1)*m]
		for j := 0; j < n; j++ {
			if sv.pos[j] >= 0 {
				continue
			}
			if v := math.Abs(sv.dotColumn(j, row)); v > bestV {
				best, bestV = j, v
			}
		}
		if best >= 0 {
			sv.column(best, sv.col)
			sv.ftran(sv.col, sv.alpha)
			sv.pivot(k, best)
		}
	}
	return sv.refactor()
}

// ftran computes dst = Binv * a.
func (sv *solver) ftran(a, dst []float64) {
	m := sv.m
	for i := 0; i < m; i++ {
		row := sv.binv[i*m : (i+1)*m]
		t := 0.0
		for k, v := range row {
			t += v * a[k]
		}
		dst[i] = t
	}
}

// computeDuals sets y = c_B' Binv.
func (sv *solver) computeDuals() {
	m := sv.m
	for i := range sv.y {
		sv.y[i] = 0
	}
	for k, j := range sv.basis {
		c := sv.cost[j]
		if c == 0 {
			continue
		}
		row := sv.binv[k*m : (k+1)*m]
		for i, v := range row {
			sv.y[i] += c * v
		}
	}
}

// pivot makes column q basic in position r, using sv.alpha = Binv a_q.
func (sv *solver) pivot(r, q int) {
	m := sv.m
	ar := sv.alpha[r]
	step := sv.xb[r] / ar
	for i := 0; i < m; i++ {
		if i != r {
			sv.xb[i] -= step * sv.alpha[i]
		}
	}
	sv.xb[r] = step
	rowR := sv.binv[r*m : (r+1)*m]
	for k := range rowR {
		rowR[k] /= ar
	}
	for i := 0; i < m; i++ {
		if i == r || sv.alpha[i] == 0 {
			continue
		}
		f := sv.alpha[i]
		row := sv.binv[i*m : (i+1)*m]
		for k, v := range rowR {
			row[k] -= f * v
		}
	}
	old := sv.basis[r]
	sv.pos[old] = -1
	sv.basis[r] = q
	sv.pos[q] = r
	sv.iter++
	sv.sinceRefactor++
}

// optimise runs the primal simplex method on the current costs from the
// current (feasible) basis.
func (sv *solver) optimise() error {
	stall := 0
	useBland := false
	lastObj := math.Inf(1)
	for checks := 0; ; {
		if sv.iter >= sv.maxIter {
			return fmt.Errorf("%w after %d pivots", ErrIterationLimit, sv.iter)
		}
		if sv.sinceRefactor >= RefactorEvery {
			if err := sv.refactor(); err != nil {
				return err
			}
		}
		sv.computeDuals()
		q, _ := sv.price(useBland)
		if q < 0 {
			// Optimal by the running inverse: confirm with a fresh one. When
			// the fresh duals equal the running ones to working accuracy the
			// pricing pass just made stands; otherwise price again.
			if sv.sinceRefactor == 0 || checks > 3 {
				return sv.finalCheck()
			}
			checks++
			sv.yOld = append(sv.yOld[:0], sv.y...)
			if err := sv.refactor(); err != nil {
				return err
			}
			sv.computeDuals()
			diff, size := 0.0, 1.0
			for i, v := range sv.y {
				diff = math.Max(diff, math.Abs(v-sv.yOld[i]))
				size = math.Max(size, math.Abs(v))
			}
			if diff <= 1e-13*size {
				return sv.finalCheck()
			}
			continue
		}
		sv.column(q, sv.col)
		sv.ftran(sv.col, sv.alpha)
		r := sv.ratio(useBland)
		if r < 0 {
			return fmt.Errorf("%w: column %d can grow without limit", ErrUnbounded, q)
		}
		sv.pivot(r, q)
		if useBland {
			sv.bland++
		}
		obj := 0.0
		for k, j := range sv.basis {
			obj += sv.cost[j] * sv.xb[k]
		}
		if sv.hasCutoff && obj < sv.cutoff {
			sv.stopped = true
			return sv.finalCheck()
		}
		if obj < lastObj-1e-12*math.Max(1, math.Abs(obj)) {
			lastObj = obj
			stall = 0
			useBland = false
		} else {
			stall++
			if stall >= StallLimit {
				useBland = true
			}
		}
	}
}

// price chooses the entering column, or -1 when no reduced cost is below
// -tolOpt. Under Bland's rule it is the first such column; otherwise the
// most negative one within a chunk of columns (partial pricing): scanning
// starts where the last scan stopped and goes on chunk by chunk until a
// candidate turns up, so optimality is only declared after a full pass.
func (sv *solver) price(bland bool) (int, float64) {
	m, n := sv.m, sv.n
	total := n + m
	chunk := total
	start := 0
	if !bland {
		// Small chunks: on DEA programs, pricing fewer columns outweighs a
		// few more pivots (32 and 1/32 measured best among 16..256 and
		// 1/64..1/4 on the benchmark's studies, natively and as WebAssembly).
		chunk = max(32, total/32)
		start = sv.priceStart
	}
	q, best := -1, -tolOpt
	a, y := sv.p.A, sv.y
	plain := sv.plain
	for scanned := 0; scanned < total; {
		end := min(start+chunk, total)
		if plain && !bland && start < n {
			// The hot loop: structural columns as stored (kernel.Dots),
			// basic columns (reduced cost zero in theory) skipped only when
			// they would win.
			hi := min(end, n)
			cs := sv.cost[start:hi]
			ps := sv.pos[start:hi]
			ps = ps[:len(cs)]
			sv.dots = grow(sv.dots, len(cs))
			dots := sv.dots[:len(cs)]
			kernel.Dots(dots, a[start*m:hi*m], y[:m])
			for k, t := range dots {
				if d := cs[k] - t; d < best && ps[k] < 0 {
					q, best = start+k, d
				}
			}
		}
		lo := start
		if plain && !bland && start < n {
			lo = max(start, n) // structural columns were priced above
		}
		for j := lo; j < end; j++ {
			if sv.pos[j] >= 0 || sv.barred[j] {
				continue
			}
			var d float64
			switch {
			case j >= n:
				if sv.cost[j] == 0 {
					continue
				}
				d = sv.cost[j] - sv.artSign[j-n]*y[j-n]
			case plain:
				col := a[j*m : j*m+m]
				t := 0.0
				for i, v := range col {
					t += v * y[i]
				}
				d = sv.cost[j] - t
			default:
				d = sv.cost[j] - sv.dotColumn(j, y)
			}
			if d < best {
				q, best = j, d
				if bland {
					return q, best
				}
			}
		}
		scanned += end - start
		start = end % total
		if q >= 0 {
			break
		}
	}
	sv.priceStart = start
	return q, best
}

// ratio chooses the leaving row for the entering column held in sv.alpha,
// or -1 when no row limits it.
func (sv *solver) ratio(bland bool) int {
	m := sv.m
	if bland {
		r, minR := -1, math.Inf(1)
		for i := 0; i < m; i++ {
			a := sv.alpha[i]
			if a <= tolPivot {
				continue
			}
			x := math.Max(sv.xb[i], 0)
			t := x / a
			switch {
			case r < 0 || t < minR-1e-12*(1+minR):
				r, minR = i, t
			case t <= minR+1e-12*(1+minR) && sv.basis[i] < sv.basis[r]:
				r = i
				if t < minR {
					minR = t
				}
			}
		}
		return r
	}
	// Harris: pass 1 finds the relaxed bound, pass 2 the largest pivot within it.
	bound := math.Inf(1)
	for i := 0; i < m; i++ {
		a := sv.alpha[i]
		if a <= tolPivot {
			continue
		}
		t := (math.Max(sv.xb[i], 0) + harrisDelta) / a
		if t < bound {
			bound = t
		}
	}
	if math.IsInf(bound, 1) {
		return -1
	}
	r, bestA := -1, 0.0
	for i := 0; i < m; i++ {
		a := sv.alpha[i]
		if a <= tolPivot {
			continue
		}
		if math.Max(sv.xb[i], 0)/a <= bound && a > bestA {
			r, bestA = i, a
		}
	}
	if r >= 0 && sv.xb[r] < 0 {
		sv.xb[r] = 0 // tiny infeasibility from an earlier Harris step: pivot degenerately
	}
	return r
}

// finalCheck verifies, with a fresh inverse, that the basis is feasible.
func (sv *solver) finalCheck() error {
	if sv.sinceRefactor != 0 {
		if err := sv.refactor(); err != nil {
			return err
		}
	}
	xmax := 1.0
	for _, v := range sv.xb {
		xmax = math.Max(xmax, math.Abs(v))
	}
	for k, v := range sv.xb {
		if v < -1e-7*xmax {
			return fmt.Errorf("%w: basic variable %d is %.3g after refactorisation", ErrNumerical, sv.basis[k], v)
		}
	}
	return nil
}

func (sv *solver) unscaledDuals() []float64 {
	sv.computeDuals()
	y := make([]float64, sv.m)
	for i, v := range sv.y {
		y[i] = v * sv.r[i]
	}
	return y
}

// fill writes the unscaled solution, reusing sol's slices; with reduced it
// also computes the reduced costs.
func (sv *solver) fill(sol *Solution, reduced bool) {
	p := sv.p
	sol.X = grow(sol.X, sv.n)
	clear(sol.X)
	sol.Basis = grow(sol.Basis, sv.m)
	obj := 0.0
	for k, j := range sv.basis {
		if j >= sv.n {
			sol.Basis[k] = -1
			continue
		}
		sol.Basis[k] = j
		v := sv.xb[k]
		if v < 0 {
			v = 0
		}
		sol.X[j] = v * sv.s[j]
		obj += p.C[j] * sol.X[j]
	}
	sv.computeDuals()
	sol.Y = grow(sol.Y, sv.m)
	for i, v := range sv.y {
		sol.Y[i] = v * sv.r[i]
	}
	sol.D = sol.D[:0]
	if reduced {
		sol.D = grow(sol.D, sv.n)
		for j := 0; j < sv.n; j++ {
			c := p.A[j*sv.m : (j+1)*sv.m]
			t := 0.0
			for i, a := range c {
				t += a * sol.Y[i]
			}
			sol.D[j] = p.C[j] - t
		}
		for _, j := range sol.Basis {
			if j >= 0 {
				sol.D[j] = 0
			}
		}
	}
	sol.Obj = obj
	sol.Iter, sol.Bland, sol.Stopped = sv.iter, sv.bland, sv.stopped
}
