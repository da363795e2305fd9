// Package bench holds what the speed measurements of Peerlens share: a seeded
// generator of DEA data with a known frontier, and the floor against which
// the engine's time is judged.
//
// The generator (Generate) draws units around a Cobb-Douglas frontier
//
//	f(x) = prod_i x_i^(0.8/m)        (decreasing returns: exponents sum to 0.8)
//
// Inputs are uniform on [1, 100]. A share of units (Config.OnFrontier) sit
// exactly on the frontier; the others are pulled inside it by a half-normal
// inefficiency exp(-|N(0, sigma^2)|). The output total f(x)*eff is split
// over the outputs along a random direction, so every output mix occurs.
// Because f is strictly concave every unit on the frontier is
// extreme-efficient under variable returns, which makes the frontier large
// and the generated studies a hard case for frontier-first methods. The data
// are invented; the same Config always gives the same numbers.
//
// The floor (Floor) is one pass of multiply-adds over units x frontier units
// x measures: the least work any method that looks at every (unit, frontier
// unit) pair once must do. The engine's time is reported as a multiple of it,
// measured in the same runtime.
package bench
