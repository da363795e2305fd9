package oracle

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strconv"
)

// Spec describes a radial DEA model in the oracle's own terms, independent
// of the engine's types.
//
// The reference technology bounds sum(lambda) by [Lower, Upper]:
//
//	constant returns (CCR)       [0, +Inf)
//	variable returns (BCC)       [1, 1]
//	non-increasing returns       [0, 1]
//	non-decreasing returns       [1, +Inf)
//	bounded returns              [L, U]
type Spec struct {
	Output      bool    // output orientation (max phi); input orientation (min theta) otherwise
	Lower       float64 // lower bound on sum(lambda); 0 means none
	Upper       float64 // upper bound on sum(lambda); +Inf means none
	ExcludeSelf bool    // drop the unit's own column (super-efficiency, Andersen & Petersen 1993)
}

// Standard returns-to-scale bounds.
var (
	CRS  = Spec{Lower: 0, Upper: math.Inf(1)}
	VRS  = Spec{Lower: 1, Upper: 1}
	NIRS = Spec{Lower: 0, Upper: 1}
	NDRS = Spec{Lower: 1, Upper: math.Inf(1)}
)

// Bounded returns the spec with sum(lambda) in [lo, hi].
func Bounded(lo, hi float64) Spec { return Spec{Lower: lo, Upper: hi} }

// Orient returns a copy of s with the orientation set.
func (s Spec) Orient(output bool) Spec { s.Output = output; return s }

// Super returns a copy of s that leaves the unit out of its reference set.
func (s Spec) Super() Spec { s.ExcludeSelf = true; return s }

// lambdas adds one lambda column per reference unit and returns the unit
// index of each column's variable (-1 for the unit itself when excluded).
func lambdas(p *Problem, n, o int, s Spec) []int {
	col := make([]int, n)
	for j := 0; j < n; j++ {
		if s.ExcludeSelf && j == o {
			col[j] = -1
			continue
		}
		col[j] = p.AddVar(Var{Name: "l" + strconv.Itoa(j)})
	}
	return col
}

// returnsRows adds the bounds on sum(lambda).
func returnsRows(p *Problem, col []int, s Spec) {
	var sum []Term
	for _, c := range col {
		if c >= 0 {
			sum = append(sum, Term{1, c})
		}
	}
	switch {
	case s.Lower == s.Upper:
		p.AddRow(Row{Name: "sum", Terms: sum, Op: EQ, RHS: s.Lower})
	default:
		if s.Lower > 0 {
			p.AddRow(Row{Name: "sumlo", Terms: sum, Op: GE, RHS: s.Lower})
		}
		if !math.IsInf(s.Upper, 1) {
			p.AddRow(Row{Name: "sumhi", Terms: sum, Op: LE, RHS: s.Upper})
		}
	}
}

func checkData(X, Y [][]float64, o int) error {
	if len(X) == 0 || len(X) != len(Y) {
		return fmt.Errorf("oracle: %d input rows and %d output rows", len(X), len(Y))
	}
	if o < 0 || o >= len(X) {
		return fmt.Errorf("oracle: unit %d out of range 0..%d", o, len(X)-1)
	}
	return nil
}

// RadialProblem writes the envelopment LP of unit o.
//
// Input orientation:
//
//	min theta
//	s.t. sum_j lambda_j x_ij - theta x_io <= 0   for each input i
//	     sum_j lambda_j y_rj            >= y_ro  for each output r
//	     Lower <= sum_j lambda_j <= Upper, lambda >= 0, theta free
//
// Output orientation:
//
//	max phi
//	s.t. sum_j lambda_j x_ij          <= x_io   for each input i
//	     sum_j lambda_j y_rj - phi y_ro >= 0    for each output r
//	     Lower <= sum_j lambda_j <= Upper, lambda >= 0, phi free
//
// Variable 0 is theta (or phi); lambda_j follows in unit order.
func RadialProblem(X, Y [][]float64, o int, s Spec) (*Problem, []int, error) {
	if err := checkData(X, Y, o); err != nil {
		return nil, nil, err
	}
	p := &Problem{Name: fmt.Sprintf("radial_u%d", o)}
	t := p.AddVar(Var{Name: "t", Obj: 1, Free: true})
	if s.Output {
		p.Sense = Maximize
	}
	col := lambdas(p, len(X), o, s)
	for i := range X[o] {
		p.AddRow(measureRow("in"+strconv.Itoa(i), LE, X, i, o, col, t, !s.Output))
	}
	for k := range Y[o] {
		p.AddRow(measureRow("out"+strconv.Itoa(k), GE, Y, k, o, col, t, s.Output))
	}
	returnsRows(p, col, s)
	return p, col, nil
}

// measureRow is the row of measure k (of M, inputs or outputs):
// sum_j lambda_j M[j][k] op M[o][k], with the right-hand side multiplied by
// the radial variable t (and moved to the left) on the radial side.
func measureRow(name string, op Op, M [][]float64, k, o int, col []int, t int, radial bool) Row {
	r := Row{Name: name, Op: op}
	for j, c := range col {
		if c >= 0 && M[j][k] != 0 {
			r.Terms = append(r.Terms, Term{M[j][k], c})
		}
	}
	switch {
	case !radial:
		r.RHS = M[o][k]
	case M[o][k] != 0:
		r.Terms = append(r.Terms, Term{-M[o][k], t})
	}
	return r
}

// Radial is the oracle's answer for one unit's radial LP.
type Radial struct {
	Feasible bool
	Value    float64   // theta (input) or phi (output)
	Lambda   []float64 // per unit of the data; 0 for the excluded unit
}

// SolveRadial solves unit o's radial LP with glpsol. An infeasible LP
// (possible only for super-efficiency) gives Feasible false and no error;
// an unbounded one is an error.
func SolveRadial(ctx context.Context, X, Y [][]float64, o int, s Spec, opt Options) (Radial, error) {
	p, col, err := RadialProblem(X, Y, o, s)
	if err != nil {
		return Radial{}, err
	}
	sol, err := Solve(ctx, p, opt)
	if err != nil {
		return Radial{}, err
	}
	switch sol.Status {
	case Infeasible:
		return Radial{}, nil
	case Unbounded:
		return Radial{}, fmt.Errorf("oracle: radial LP of unit %d is unbounded", o)
	}
	return Radial{Feasible: true, Value: sol.Values[0], Lambda: lambdaAt(sol, len(X), col, 0)}, nil
}

// Means returns the mean of each input and each output over all units:
// the weights 1/mean of the second stage's slack sum.
func Means(X, Y [][]float64) (mx, my []float64) {
	mx = make([]float64, len(X[0]))
	my = make([]float64, len(Y[0]))
	for j := range X {
		for i, v := range X[j] {
			mx[i] += v / float64(len(X))
		}
		for r, v := range Y[j] {
			my[r] += v / float64(len(Y))
		}
	}
	return mx, my
}

// SecondStageProblem writes unit o's slack-maximising LP with the radial
// value held at radial (relaxed by rel on each side):
//
//	max sum_i s_i^- / mean_i(x) + sum_r s_r^+ / mean_r(y)
//	input orientation:  sum_j lambda_j x_ij + s_i^- = theta x_io
//	                    sum_j lambda_j y_rj - s_r^+ = y_ro
//	output orientation: sum_j lambda_j x_ij + s_i^- = x_io
//	                    sum_j lambda_j y_rj - s_r^+ = phi y_ro
//	radial (1-rel) <= theta (or phi) <= radial (1+rel), the same returns
//	bounds on sum(lambda), lambda, s >= 0.
//
// Columns: 0 theta/phi, then the lambdas, then s^- per input, s^+ per output.
func SecondStageProblem(X, Y [][]float64, o int, s Spec, radial, rel float64) (*Problem, []int, error) {
	if err := checkData(X, Y, o); err != nil {
		return nil, nil, err
	}
	mx, my := Means(X, Y)
	p := &Problem{Name: fmt.Sprintf("slack_u%d", o), Sense: Maximize}
	lo, hi := radial*(1-rel), radial*(1+rel)
	if lo > hi {
		lo, hi = hi, lo
	}
	t := p.AddVar(Var{Name: "t", HasLower: true, Lower: lo, HasUpper: true, Upper: hi})
	col := lambdas(p, len(X), o, s)
	for i, m := range mx {
		if m <= 0 {
			return nil, nil, fmt.Errorf("oracle: input %d has mean %g; the slack weights need a positive mean", i, m)
		}
		sv := p.AddVar(Var{Name: "si" + strconv.Itoa(i), Obj: 1 / m})
		r := measureRow("in"+strconv.Itoa(i), EQ, X, i, o, col, t, !s.Output)
		r.Terms = append(r.Terms, Term{1, sv})
		p.AddRow(r)
	}
	for k, m := range my {
		if m <= 0 {
			return nil, nil, fmt.Errorf("oracle: output %d has mean %g; the slack weights need a positive mean", k, m)
		}
		sv := p.AddVar(Var{Name: "so" + strconv.Itoa(k), Obj: 1 / m})
		r := measureRow("out"+strconv.Itoa(k), EQ, Y, k, o, col, t, s.Output)
		r.Terms = append(r.Terms, Term{-1, sv})
		p.AddRow(r)
	}
	returnsRows(p, col, s)
	return p, col, nil
}

// Slacks is the oracle's second-stage answer for one unit.
type Slacks struct {
	Radial   float64   // theta or phi from phase 1
	Weighted float64   // the maximal weighted slack sum (unique even when the slacks are not)
	In, Out  []float64 // one optimal set of slacks (not necessarily unique)
	Lambda   []float64
}

// ErrInfeasible is returned when an LP that must be feasible is not.
var ErrInfeasible = errors.New("oracle: LP has no feasible solution")

// SolveSecondStage solves phase 1 (the radial LP) and then phase 2 (see
// SolveSlacks) with glpsol's phase-1 value.
func SolveSecondStage(ctx context.Context, X, Y [][]float64, o int, s Spec, opt Options) (Slacks, error) {
	r, err := SolveRadial(ctx, X, Y, o, s, opt)
	if err != nil {
		return Slacks{}, err
	}
	if !r.Feasible {
		return Slacks{}, fmt.Errorf("%w (phase 1 of unit %d)", ErrInfeasible, o)
	}
	return SolveSlacks(ctx, X, Y, o, s, r.Value, opt)
}

// SolveSlacks solves phase 2 with the radial value fixed to radial (a
// phase-1 value from glpsol): exactly at first, then relaxed by 1e-9 and
// 1e-7 if glpsol finds the tighter problem infeasible.
func SolveSlacks(ctx context.Context, X, Y [][]float64, o int, s Spec, radial float64, opt Options) (Slacks, error) {
	for _, rel := range []float64{0, 1e-9, 1e-7} {
		p, col, err := SecondStageProblem(X, Y, o, s, radial, rel)
		if err != nil {
			return Slacks{}, err
		}
		sol, err := Solve(ctx, p, opt)
		if err != nil {
			return Slacks{}, err
		}
		switch sol.Status {
		case Infeasible:
			continue
		case Unbounded:
			return Slacks{}, fmt.Errorf("oracle: second stage of unit %d is unbounded", o)
		}
		out := Slacks{Radial: radial, Weighted: sol.Objective, Lambda: lambdaAt(sol, len(X), col, 0)}
		// The slack columns are the last m + q columns, inputs first.
		m, q := len(X[0]), len(Y[0])
		k := len(p.Vars) - m - q
		out.In = append([]float64(nil), sol.Values[k:k+m]...)
		out.Out = append([]float64(nil), sol.Values[k+m:k+m+q]...)
		return out, nil
	}
	return Slacks{}, fmt.Errorf("%w (phase 2 of unit %d, radial value %g fixed)", ErrInfeasible, o, radial)
}
