// Package lp solves the small, wide, degenerate linear programs of Data
// Envelopment Analysis.
//
// A Problem is in standard form
//
//	minimise   c'x
//	subject to A x = b,  x >= 0,
//
// with A dense and stored column by column. DEA programs have few rows (one per
// measure, plus one or two for returns to scale) and one column per unit, and
// many units sit exactly on the frontier, so most pivots are degenerate. The
// solver is a revised primal simplex method built for that shape:
//
//   - the basis is small and dense: its inverse is kept explicitly, updated
//     with a product-form step after each pivot and recomputed from an LU
//     factorisation (gonum's mat.LU) every RefactorEvery pivots and before any
//     answer is returned;
//   - rows and columns are scaled to unit largest magnitude before solving;
//   - the ratio test is Harris's two-pass test (it prefers large pivots among
//     near-ties), which keeps the basis well conditioned on degenerate problems;
//   - anti-cycling: after StallLimit pivots without strict progress the solver
//     switches to Bland's smallest-index rule until the objective strictly
//     improves. Bland's rule cannot cycle (Bland 1977, Mathematics of
//     Operations Research 2(2) 103-107) and the objective never repeats between
//     strict improvements, so the method terminates;
//   - a caller may give a starting basis that is primal feasible (for DEA: the
//     evaluated unit itself); otherwise a phase 1 with artificial variables
//     finds one.
//
// Failures are error values: ErrInfeasible, ErrUnbounded, ErrNumerical and
// ErrIterationLimit. On ErrInfeasible the Solution carries the phase-1 dual
// (a Farkas certificate: y'A <= 0 for every column and y'b > 0), which lets a
// caller that works on a subset of columns ask whether other columns would
// make the problem feasible.
package lp
