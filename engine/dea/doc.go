// Package dea computes Data Envelopment Analysis models: for every unit, how
// far it lies from the best-practice frontier spanned by all units, which
// units form its reference combination (its peers), what targets would put it
// on the frontier, the multiplier weights that support its score, and its
// returns to scale.
//
// The radial envelopment models (Charnes, Cooper & Rhodes 1978; Banker,
// Charnes & Cooper 1984) are solved with the package lp, one linear program
// per unit. Data are scaled per measure (divided by the measure's mean) before
// solving; radial scores do not depend on the units of measurement, and
// slacks, targets and weights are scaled back before they are reported.
//
// Large studies are solved frontier first: a set of candidate units that
// contains every extreme-efficient unit is found by evaluating units within
// blocks (a unit beaten inside a block is beaten in the whole sample; Dulá
// 2011, INFORMS Journal on Computing 23(2), describes this family of
// methods), and every unit is then evaluated against that set only. See
// Frontier for why this gives exactly the same scores, slacks and targets.
//
// Every reported score carries a Certificate computed from the data, not taken
// from the solver: the primal solution is feasible, the dual solution is
// feasible (the unit's weights never put any unit beyond the frontier), and
// the two objectives agree.
package dea
