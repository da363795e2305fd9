package oracle

import (
	"context"
	"fmt"
	"strconv"
)

// merge puts independent problems of the same sense side by side in one
// block-diagonal problem (variables and rows renamed "b<k>_..."). Its
// optimum is the sum of the blocks' optima, and each block's part of an
// optimal solution is optimal for that block, so one glpsol process can
// solve many units' LPs. first[k] is the index of block k's first variable.
func merge(name string, ps []*Problem) (*Problem, []int, error) {
	out := &Problem{Name: name}
	first := make([]int, len(ps))
	for k, p := range ps {
		if k > 0 && p.Sense != ps[0].Sense {
			return nil, nil, fmt.Errorf("oracle: cannot merge problems of different senses")
		}
		out.Sense = p.Sense
		pre := "b" + strconv.Itoa(k) + "_"
		first[k] = len(out.Vars)
		for _, v := range p.Vars {
			v.Name = pre + v.Name
			out.Vars = append(out.Vars, v)
		}
		for i, r := range p.Rows {
			terms := make([]Term, len(r.Terms))
			for t, tm := range r.Terms {
				terms[t] = Term{tm.Coef, tm.Var + first[k]}
			}
			rn := r.Name
			if rn == "" {
				rn = "r" + strconv.Itoa(i)
			}
			out.Rows = append(out.Rows, Row{Name: pre + rn, Terms: terms, Op: r.Op, RHS: r.RHS})
		}
	}
	return out, first, nil
}

// solveMerged builds one problem per unit with build, solves them merged in
// one glpsol process and returns the solution with each block's problem,
// lambda columns and first variable.
func solveMerged(ctx context.Context, name string, units []int, opt Options,
	build func(k, o int) (*Problem, []int, error)) (sol *Solution, ps []*Problem, cols [][]int, first []int, err error) {
	ps = make([]*Problem, len(units))
	cols = make([][]int, len(units))
	for k, o := range units {
		if ps[k], cols[k], err = build(k, o); err != nil {
			return nil, nil, nil, nil, err
		}
	}
	big, first, err := merge(fmt.Sprintf("%s_batch_u%d_%d", name, units[0], len(units)), ps)
	if err != nil {
		return nil, nil, nil, nil, err
	}
	sol, err = Solve(ctx, big, opt)
	return sol, ps, cols, first, err
}

// lambdaAt reads a block's lambdas (per unit of the data) from sol.
func lambdaAt(sol *Solution, n int, col []int, first int) []float64 {
	l := make([]float64, n)
	for j, c := range col {
		if c >= 0 {
			l[j] = sol.Values[first+c]
		}
	}
	return l
}

// SolveRadialBatch solves the radial LPs of several units in one glpsol
// process (see merge). It is for LPs that are always feasible (the unit
// itself is a feasible combination), not for super-efficiency; if glpsol
// finds the merged problem infeasible or unbounded, each unit is solved on
// its own so that the report names the unit.
func SolveRadialBatch(ctx context.Context, X, Y [][]float64, units []int, s Spec, opt Options) ([]Radial, error) {
	sol, _, cols, first, err := solveMerged(ctx, "radial", units, opt, func(_, o int) (*Problem, []int, error) {
		return RadialProblem(X, Y, o, s)
	})
	if err != nil {
		return nil, err
	}
	out := make([]Radial, len(units))
	if sol.Status != Optimal {
		for k, o := range units {
			if out[k], err = SolveRadial(ctx, X, Y, o, s, opt); err != nil {
				return nil, err
			}
		}
		return out, nil
	}
	for k := range units {
		out[k] = Radial{Feasible: true, Value: sol.Values[first[k]], Lambda: lambdaAt(sol, len(X), cols[k], first[k])}
	}
	return out, nil
}

// SolveSlacksBatch solves the second-stage LPs of several units (radial
// values fixed to radial[k], exactly) in one glpsol process. If glpsol finds
// the merged problem anything but optimal, each unit goes through
// SolveSlacks on its own (which relaxes the fixed value when needed).
func SolveSlacksBatch(ctx context.Context, X, Y [][]float64, units []int, s Spec, radial []float64, opt Options) ([]Slacks, error) {
	sol, ps, cols, first, err := solveMerged(ctx, "slack", units, opt, func(k, o int) (*Problem, []int, error) {
		return SecondStageProblem(X, Y, o, s, radial[k], 0)
	})
	if err != nil {
		return nil, err
	}
	out := make([]Slacks, len(units))
	if sol.Status != Optimal {
		for k, o := range units {
			if out[k], err = SolveSlacks(ctx, X, Y, o, s, radial[k], opt); err != nil {
				return nil, err
			}
		}
		return out, nil
	}
	m, q := len(X[0]), len(Y[0])
	for k := range units {
		p, f := ps[k], first[k]
		sl := Slacks{Radial: radial[k], Lambda: lambdaAt(sol, len(X), cols[k], f)}
		for v, pv := range p.Vars {
			sl.Weighted += pv.Obj * sol.Values[f+v]
		}
		last := f + len(p.Vars)
		sl.In = append([]float64(nil), sol.Values[last-m-q:last-q]...)
		sl.Out = append([]float64(nil), sol.Values[last-q:last]...)
		out[k] = sl
	}
	return out, nil
}
