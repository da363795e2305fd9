package dea_test

// Shared helpers of the oracle, property and published tests: the model
// grid, tolerances, the GLPK skip, and the checks on one unit's result
// that need no outside solver.

import (
	"context"
	"fmt"
	"math"
	"testing"

	"peerlens/engine/dea"
	"peerlens/engine/internal/oracle"
)

// needGlpsol skips the test, with the reason, when glpsol is absent.
func needGlpsol(t testing.TB) {
	t.Helper()
	if _, err := oracle.Available(); err != nil {
		t.Skip("skipping: GLPK's glpsol is not on PATH (Debian package glpk-utils); it is the independent oracle: ", err)
	}
}

// namedModel is one returns assumption and orientation with the oracle's
// own description of the same technology.
type namedModel struct {
	Name  string
	Model dea.Model
	Spec  oracle.Spec
}

// modelGrid is every returns assumption in both orientations, each with the
// second stage, super-efficiency and the returns-to-scale detail on.
func modelGrid() []namedModel {
	rets := []struct {
		r      dea.Returns
		lo, hi float64
		spec   oracle.Spec
	}{
		{dea.Constant, 0, 0, oracle.CRS},
		{dea.Variable, 0, 0, oracle.VRS},
		{dea.NonIncreasing, 0, 0, oracle.NIRS},
		{dea.NonDecreasing, 0, 0, oracle.NDRS},
		{dea.Bounded, 0.8, 1.2, oracle.Bounded(0.8, 1.2)},
	}
	var out []namedModel
	for _, o := range []dea.Orientation{dea.Input, dea.Output} {
		for _, r := range rets {
			m := dea.Model{Returns: r.r, Lower: r.lo, Upper: r.hi, Orientation: o,
				SecondStage: true, Super: true, ScaleDetail: true}
			name := fmt.Sprintf("%s/%s", r.r, o)
			if r.r == dea.Bounded {
				name = fmt.Sprintf("bounded[%g,%g]/%s", r.lo, r.hi, o)
			}
			out = append(out, namedModel{name, m, r.spec.Orient(o == dea.Output)})
		}
	}
	return out
}

// scoreTol is the agreement asked of a score: 1e-6, relative above 1.
func scoreTol(want float64) float64 { return 1e-6 * math.Max(1, math.Abs(want)) }

func close6(got, want float64) bool { return math.Abs(got-want) <= scoreTol(want) }

// run calls the engine and fails the test on an error.
func run(t testing.TB, d *dea.Data, m dea.Model) *dea.Result {
	t.Helper()
	res, err := dea.Run(context.Background(), d, m, nil)
	if err != nil {
		t.Fatalf("dea.Run(%+v): %v", m, err)
	}
	if len(res.Units) != len(d.X) {
		t.Fatalf("dea.Run gave %d units for %d", len(res.Units), len(d.X))
	}
	return res
}

// means returns each measure's mean over all units (the second stage's
// slack weights are 1/mean).
func means(d *dea.Data) (mx, my []float64) { return oracle.Means(d.X, d.Y) }

// weightedSlack is the engine's second-stage objective recomputed from the
// reported slacks.
func weightedSlack(d *dea.Data, u dea.UnitResult) float64 {
	mx, my := means(d)
	w := 0.0
	for i, tg := range u.Inputs {
		w += tg.Slack / mx[i]
	}
	for r, tg := range u.Outputs {
		w += tg.Slack / my[r]
	}
	return w
}

// checkTargets returns, in words, every way unit u's targets disagree with
// its own peers and score (no outside solver needed):
//   - Target = Value - Radial - Slack (inputs), Value + Radial + Slack
//     (outputs), Radial and Slack non-negative;
//   - the radial part is (1 - theta) x_io on inputs (input orientation) or
//     (phi - 1) y_ro on outputs (output orientation), 0 on the other side;
//   - the peers' lambdas reproduce the targets: sum lambda_j x_ij equals the
//     input target and sum lambda_j y_rj the output target (the second-stage
//     constraints are equalities), and sum(lambda) obeys the returns bounds.
//
// Amounts are compared within 1e-6 of the measure's mean (or the value).
func checkTargets(d *dea.Data, m dea.Model, u dea.UnitResult) []string {
	var bad []string
	mx, my := means(d)
	o := u.Index
	phi := u.Expansion
	side := func(kind string, tg []dea.Target, vals func(j int) []float64, mean []float64, isInput bool) {
		if len(tg) != len(mean) {
			bad = append(bad, fmt.Sprintf("%d %s targets for %d measures", len(tg), kind, len(mean)))
			return
		}
		for i, t := range tg {
			scale := 1e-6 * math.Max(mean[i], math.Abs(t.Value))
			v := vals(o)[i]
			if t.Value != v {
				bad = append(bad, fmt.Sprintf("%s %d: Value %g, data %g", kind, i, t.Value, v))
			}
			if t.Radial < -scale || t.Slack < -scale {
				bad = append(bad, fmt.Sprintf("%s %d: negative movement radial %g slack %g", kind, i, t.Radial, t.Slack))
			}
			want := t.Value - t.Radial - t.Slack
			if !isInput {
				want = t.Value + t.Radial + t.Slack
			}
			if math.Abs(t.Target-want) > scale {
				bad = append(bad, fmt.Sprintf("%s %d: Target %g but Value, Radial, Slack give %g", kind, i, t.Target, want))
			}
			radial := 0.0
			switch {
			case isInput && m.Orientation == dea.Input:
				radial = (1 - u.Score) * v
			case !isInput && m.Orientation == dea.Output:
				radial = (phi - 1) * v
			}
			if math.Abs(t.Radial-radial) > scale {
				bad = append(bad, fmt.Sprintf("%s %d: Radial %g, the score gives %g", kind, i, t.Radial, radial))
			}
			comb := 0.0
			for _, p := range u.Peers {
				comb += p.Lambda * vals(p.Index)[i]
			}
			if math.Abs(comb-t.Target) > scale {
				bad = append(bad, fmt.Sprintf("%s %d: peers' lambdas give %.10g, target %.10g", kind, i, comb, t.Target))
			}
		}
	}
	side("input", u.Inputs, func(j int) []float64 { return d.X[j] }, mx, true)
	side("output", u.Outputs, func(j int) []float64 { return d.Y[j] }, my, false)
	sum := 0.0
	for _, p := range u.Peers {
		if p.Lambda <= 0 || p.Index < 0 || p.Index >= len(d.X) || p.Name != d.Units[p.Index] {
			bad = append(bad, fmt.Sprintf("bad peer %+v", p))
			continue
		}
		sum += p.Lambda
	}
	lo, hi := sumBounds(m)
	if sum < lo-1e-6 || sum > hi+1e-6 {
		bad = append(bad, fmt.Sprintf("sum of lambdas %g outside [%g, %g]", sum, lo, hi))
	}
	return bad
}

// sumBounds is the interval the model puts on sum(lambda).
func sumBounds(m dea.Model) (lo, hi float64) {
	switch m.Returns {
	case dea.Variable:
		return 1, 1
	case dea.NonIncreasing:
		return 0, 1
	case dea.NonDecreasing:
		return 1, math.Inf(1)
	case dea.Bounded:
		hi = m.Upper
		if hi == 0 {
			hi = math.Inf(1)
		}
		return m.Lower, hi
	}
	return 0, math.Inf(1)
}
