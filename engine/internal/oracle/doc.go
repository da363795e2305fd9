// Package oracle checks the DEA models against an outside solver.
//
// It writes each unit's linear program in CPLEX LP text, straight from the
// mathematics of the model (never from the engine's own formulation code),
// solves it with GLPK's glpsol, and reads the answer back:
//
//	glpsol --lp unit.lp --nopresol --tmlim 60 -w unit.sol
//
// The plain-text solution file (-w) carries the status and every value to 15
// significant digits, which is finer than the 1e-6 the tests compare at.
// --exact (rational arithmetic) is available for small examples.
//
// The package is test support: it is imported only by tests, and the tests
// call Available first and skip with a clear message when glpsol is absent.
package oracle
