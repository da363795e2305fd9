package dea

import (
	"errors"
	"math"

	"peerlens/engine/internal/kernel"
	"peerlens/engine/lp"
)

// restrictAbove is the reference-set size above which an envelopment program
// is solved by column generation (restricted.solve) instead of over all its
// columns at once. It is zero: every unit's program goes this way, small
// ones too, because the restricted program is scaled to the unit (see
// scaleRows), which the whole program is not. Screening programs, which
// only need to know whether a score is below 1 and whose answers are
// checked (see dominated), and careful second attempts solve whole
// programs. It is a variable so that tests can compare both ways.
var restrictAbove = 0

// poolSize is the number of recently useful lambda columns an envelope keeps
// to start the next point's restricted program with.
const poolSize = 48

// priceTol is the reduced cost below which a column joins the restricted
// program: the solver's own optimality tolerance on unscaled programs.
const priceTol = 1e-9

// restricted solves a program over a working subset of its lambda columns
// and adds columns by pricing until none prices out (column generation, as
// for DEA with large data sets in Chen & Lai 2017, Annals of Operations
// Research 250: few small programs plus one pass over all columns each).
//
// Why it gives the full program's answer: when the restricted program is
// optimal with duals y and no column of the full program has a negative
// reduced cost c_j - y'a_j, then y is dual feasible for the full program and
// its objective equals the restricted optimum, which is primal feasible for
// the full program (the left-out columns at zero): both are optimal. When the
// restricted program is infeasible with Farkas certificate y and no column
// breaks the certificate (y'a_j > 0), the full program is infeasible too.
// A restricted program stopped at a cutoff has a feasible point below the
// cutoff, which the full program has as well. Columns are only ever added,
// so the process ends, at worst with every column in.
type restricted struct {
	prob  lp.Problem
	ws    lp.Workspace
	cols  []int   // the full column behind each restricted column
	at    []int32 // per full column: its restricted position + 1 (0: absent)
	x     []float64
	basis []int
	rb    []int
	y     []float64
	// The most negative reduced costs of a pricing pass.
	bestD []float64
	bestJ []int
	dots  []float64 // pricing's buffer
	// Row factors of the restricted program (powers of two) and its scaled
	// right-hand side; rowsSet says the factors apply to columns added.
	r, b    []float64
	s       []float64 // column factors, one per restricted column
	rowsSet bool
}

// solve solves full by column generation. The columns in fixed are always
// in; lambda columns lo..hi-1 are priced; init are lambda columns to start
// with; basis (full column indices, or nil) is a feasible starting basis made
// of columns in fixed and init. The Solution is in full column indices and
// belongs to rs until the next solve.
func (rs *restricted) solve(full *lp.Problem, fixed []int, lo, hi int, init, basis []int, opt lp.Options) (*lp.Solution, error) {
	R, N := full.Rows, full.Cols()
	if len(rs.at) != N {
		rs.at = make([]int32, N)
	} else {
		for _, j := range rs.cols {
			rs.at[j] = 0
		}
	}
	rs.cols = rs.cols[:0]
	rs.rowsSet = false
	rs.prob = lp.Problem{Rows: R, A: rs.prob.A[:0], B: full.B, C: rs.prob.C[:0]}
	for _, j := range fixed {
		rs.add(full, j)
	}
	for _, j := range init {
		rs.add(full, j)
	}
	rs.scaleRows()
	rs.rb = rs.mapBasis(basis)
	iters, phase1 := 0, false
	for {
		o := opt
		o.Basis = rs.rb
		sol, err := rs.ws.Solve(&rs.prob, &o)
		if sol != nil {
			iters += sol.Iter
			phase1 = phase1 || sol.Phase1
		}
		infeasible := errors.Is(err, lp.ErrInfeasible)
		if err != nil && !infeasible {
			return nil, err
		}
		if sol != nil {
			for i, f := range rs.r {
				sol.Y[i] *= f // the duals of the program as given
			}
		}
		if err == nil && sol.Stopped {
			return rs.result(sol, iters, phase1), nil
		}
		if rs.price(full, lo, hi, sol.Y) == 0 {
			if infeasible {
				rs.y = append(rs.y[:0], sol.Y...)
				return &lp.Solution{Y: rs.y, Iter: iters, Phase1: phase1}, err
			}
			return rs.result(sol, iters, phase1), nil
		}
		rs.rb = rs.rb[:0]
		if !infeasible {
			for _, k := range sol.Basis {
				if k < 0 {
					rs.rb = rs.rb[:0]
					break
				}
				rs.rb = append(rs.rb, k) // new columns went to the end: positions hold
			}
		}
		if len(rs.rb) != R {
			rs.rb = nil
		}
	}
}

func (rs *restricted) add(full *lp.Problem, j int) {
	if rs.at[j] != 0 {
		return
	}
	rs.cols = append(rs.cols, j)
	rs.at[j] = int32(len(rs.cols))
	rs.prob.A = append(rs.prob.A, full.A[j*full.Rows:(j+1)*full.Rows]...)
	rs.prob.C = append(rs.prob.C, full.C[j])
	if rs.rowsSet {
		rs.scaleColumn(len(rs.cols) - 1)
	}
}

// scaleRows scales each row of the restricted program by a power of two
// near the inverse of the evaluated point's own entry in it. The
// solver's tolerances are absolute, and the data are scaled by each
// measure's mean, so a unit whose value on some measure is tiny next to
// that mean would otherwise have that row held to a tolerance far too loose
// for it. Scaling rows changes neither the solution nor the basis; the
// duals are scaled back after each solve (y_i = r_i y'_i).
func (rs *restricted) scaleRows() {
	R := rs.prob.Rows
	rs.r = grow(rs.r, R)
	rs.b = grow(rs.b, R)
	// The point's own entries set the scale: its right-hand side and the
	// score column (the program's first column); rows where both are zero
	// take their largest entry.
	a := rs.prob.A
	for i := range rs.r {
		rs.r[i] = math.Max(math.Abs(rs.prob.B[i]), math.Abs(a[i]))
		if rs.r[i] == 0 {
			for c := 0; c+R <= len(a); c += R {
				rs.r[i] = math.Max(rs.r[i], math.Abs(a[c+i]))
			}
		}
	}
	for i, v := range rs.r {
		rs.r[i] = 1
		if v > 0 && !math.IsInf(v, 0) {
			rs.r[i] = pow2(1 / v)
		}
	}
	rs.s = rs.s[:0]
	for k := 0; (k+1)*R <= len(a); k++ {
		rs.scaleColumn(k)
	}
	for i, f := range rs.r {
		rs.b[i] = rs.prob.B[i] * f
	}
	rs.prob.B = rs.b
	rs.rowsSet = true
}

// scaleColumn applies the row factors to restricted column k, then scales
// the column by a power of two near the inverse of its largest entry
// (cost included), so that the solver's absolute tolerances on the
// variables also mean the same for every column: a unit far larger than the
// evaluated point on some measure would otherwise enter at a value the
// tolerances cannot tell from zero. The solution is scaled back (x_k =
// s_k x'_k); reduced costs keep their signs.
func (rs *restricted) scaleColumn(k int) {
	R := rs.prob.Rows
	col := rs.prob.A[k*R : (k+1)*R]
	top := math.Abs(rs.prob.C[k])
	for i, f := range rs.r {
		col[i] *= f
		top = math.Max(top, math.Abs(col[i]))
	}
	f := 1.0
	if top > 0 && !math.IsInf(top, 0) {
		f = pow2(1 / top)
	}
	for i := range col {
		col[i] *= f
	}
	rs.prob.C[k] *= f
	rs.s = append(rs.s, f)
}

func (rs *restricted) mapBasis(basis []int) []int {
	if len(basis) == 0 {
		return nil
	}
	out := rs.rb[:0]
	for _, j := range basis {
		if j < 0 || j >= len(rs.at) || rs.at[j] == 0 {
			return nil
		}
		out = append(out, int(rs.at[j])-1)
	}
	return out
}

// price adds the lambda columns lo..hi-1 of full with the most negative
// reduced costs under y (at most a few per pass) and reports how many.
func (rs *restricted) price(full *lp.Problem, lo, hi int, y []float64) int {
	R := full.Rows
	k := max(8, 2*R)
	rs.bestD, rs.bestJ = rs.bestD[:0], rs.bestJ[:0]
	worst, worstAt := -priceTol, -1
	cs := full.C[lo:hi]
	at := rs.at[lo:hi]
	at = at[:len(cs)]
	rs.dots = grow(rs.dots, len(cs))
	dots := rs.dots[:len(cs)]
	kernel.Dots(dots, full.A[lo*R:hi*R], y[:R])
	for c, t := range dots {
		d := cs[c] - t
		if !(d < worst) || at[c] != 0 {
			continue
		}
		if len(rs.bestD) < k {
			rs.bestD = append(rs.bestD, d)
			rs.bestJ = append(rs.bestJ, lo+c)
			if len(rs.bestD) < k {
				continue
			}
		} else {
			rs.bestD[worstAt], rs.bestJ[worstAt] = d, lo+c
		}
		// The list is full: the bar is now its least negative entry.
		worst, worstAt = rs.bestD[0], 0
		for q, v := range rs.bestD {
			if v > worst {
				worst, worstAt = v, q
			}
		}
	}
	for _, j := range rs.bestJ {
		rs.add(full, j)
	}
	return len(rs.bestJ)
}

// result turns a restricted solution into one over the full columns.
func (rs *restricted) result(sol *lp.Solution, iters int, phase1 bool) *lp.Solution {
	N := len(rs.at)
	rs.x = grow(rs.x, N)
	clear(rs.x)
	for k, j := range rs.cols {
		rs.x[j] = sol.X[k] * rs.s[k]
	}
	rs.basis = rs.basis[:0]
	for _, k := range sol.Basis {
		if k < 0 {
			rs.basis = append(rs.basis, -1)
		} else {
			rs.basis = append(rs.basis, rs.cols[k])
		}
	}
	rs.y = append(rs.y[:0], sol.Y...)
	return &lp.Solution{X: rs.x, Y: rs.y, Obj: sol.Obj, Basis: rs.basis, Iter: iters, Phase1: phase1, Stopped: sol.Stopped}
}

func grow(v []float64, n int) []float64 {
	if cap(v) >= n {
		return v[:n]
	}
	return make([]float64, n)
}
