package dea_test

// Every radial model (constant, variable, non-increasing, non-decreasing
// and bounded [0.8, 1.2] returns; input and output orientation) with its
// super-efficiency score (Andersen & Petersen 1993), its second-stage
// weighted slack sum and its returns-to-scale detail (Färe, Grosskopf &
// Lovell 1994), checked unit by unit against GLPK's glpsol on generated
// data that is hard for simplex codes (testgen_test.go). The oracle writes
// each LP from the mathematics (engine/internal/oracle), not from the
// engine's code.

import (
	"context"
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"

	"peerlens/engine/dea"
	"peerlens/engine/internal/oracle"
)

// oracleCase is one generated data set and the units to check (all units
// unless the data set is large).
type oracleCase struct {
	genCase
	units []int
}

// oracleCases is the data the oracle suite runs on: every generator with
// two seeds at n = 2..30 (one seed under -short), and two large mixed data
// sets (n = 120 and 200) checked on a sample of units.
func oracleCases(short bool) []oracleCase {
	seeds := []uint64{1, 2}
	if short {
		seeds = seeds[:1]
	}
	var cs []oracleCase
	for _, k := range genKinds {
		for _, s := range seeds {
			c := generate(k, s, 0)
			cs = append(cs, oracleCase{c, allUnits(len(c.Data.X))})
		}
	}
	if !short {
		for _, n := range []int{120, 200} {
			c := generate("mixed", uint64(n), n)
			var us []int
			for j := 0; j < n; j += n / 6 {
				us = append(us, j)
			}
			us = append(us, n-1) // the last unit is a slack-dominated copy
			cs = append(cs, oracleCase{c, us})
		}
	}
	return cs
}

func allUnits(n int) []int {
	us := make([]int, n)
	for j := range us {
		us[j] = j
	}
	return us
}

// oracleAnswer is glpsol's verdict on one unit under one model.
type oracleAnswer struct {
	radial oracle.Radial // theta or phi
	super  oracle.Radial
	slacks oracle.Slacks
	err    error
}

// solveCase asks glpsol for every unit of c under every model of the grid,
// two glpsol processes at a time. answers[model][unit].
func solveCase(ctx context.Context, c oracleCase, grid []namedModel) [][]oracleAnswer {
	ans := make([][]oracleAnswer, len(grid))
	for i := range ans {
		ans[i] = make([]oracleAnswer, len(c.Data.X))
	}
	X, Y := c.Data.X, c.Data.Y
	nu := len(c.units)
	var mu sync.Mutex
	_ = oracle.Each(ctx, len(grid)*nu, 2, func(ctx context.Context, k int) error {
		g, o := k/nu, c.units[k%nu]
		var a oracleAnswer
		a.radial, a.err = oracle.SolveRadial(ctx, X, Y, o, grid[g].Spec, oracle.Options{})
		if a.err == nil && !a.radial.Feasible {
			a.err = fmt.Errorf("glpsol: the radial LP is infeasible")
		}
		if a.err == nil {
			a.slacks, a.err = oracle.SolveSlacks(ctx, X, Y, o, grid[g].Spec, a.radial.Value, oracle.Options{})
		}
		if a.err == nil {
			a.super, a.err = oracle.SolveRadial(ctx, X, Y, o, grid[g].Spec.Super(), oracle.Options{})
		}
		mu.Lock()
		ans[g][o] = a
		mu.Unlock()
		return nil
	})
	return ans
}

// exactValue re-solves one radial LP with rational arithmetic for a
// disagreement report (small data only).
func exactValue(c oracleCase, o int, s oracle.Spec) string {
	if len(c.Data.X) > 60 {
		return ""
	}
	r, err := oracle.SolveRadial(context.Background(), c.Data.X, c.Data.Y, o, s, oracle.Options{Exact: true, TimeLimit: 60})
	switch {
	case err != nil:
		return fmt.Sprintf("; glpsol --exact failed: %v", err)
	case !r.Feasible:
		return "; glpsol --exact: infeasible"
	}
	return fmt.Sprintf("; glpsol --exact %.12g", r.Value)
}

// scoreOf turns an oracle theta/phi into the reported score.
func scoreOf(output bool, v float64) float64 {
	if output {
		return 1 / v
	}
	return v
}

func TestModelsAgainstGlpsol(t *testing.T) {
	needGlpsol(t)
	grid := modelGrid()
	ctx := context.Background()
	lps := 0
	for _, c := range oracleCases(testing.Short()) {
		t.Run(fmt.Sprintf("%s/seed%d/n%d", c.Kind, c.Seed, len(c.Data.X)), func(t *testing.T) {
			ans := solveCase(ctx, c, grid)
			lps += 3 * len(grid) * len(c.units)
			for g, nm := range grid {
				res, err := dea.Run(ctx, c.Data, nm.Model, nil)
				if err != nil {
					t.Errorf("model %s, %s: dea.Run: %v", nm.Name, c, err)
					continue
				}
				for _, o := range c.units {
					compareUnit(t, c, grid, g, o, res, ans)
				}
			}
		})
	}
	t.Logf("%d glpsol runs", lps)
}

// compareUnit reports every disagreement of one unit under one model.
func compareUnit(t *testing.T, c oracleCase, grid []namedModel, g, o int, res *dea.Result, ans [][]oracleAnswer) {
	t.Helper()
	nm := grid[g]
	a := ans[g][o]
	out := nm.Model.Orientation == dea.Output
	where := fmt.Sprintf("model %s, %s, unit %d", nm.Name, c, o)
	if a.err != nil {
		t.Errorf("%s: oracle failed: %v", where, a.err)
		return
	}
	if len(res.Units) <= o || res.Units[o].Index != o {
		t.Errorf("%s: no result for the unit", where)
		return
	}
	u := res.Units[o]
	if u.Status == dea.NotSolved {
		t.Errorf("%s: engine did not solve it (%s); glpsol value %.12g", where, u.Problem, a.radial.Value)
		return
	}
	// Radial score.
	want := scoreOf(out, a.radial.Value)
	if !close6(u.Score, want) || (out && !close6(u.Expansion, a.radial.Value)) {
		t.Errorf("%s: engine score %.12g (expansion %.12g), glpsol score %.12g (theta/phi %.12g)%s",
			where, u.Score, u.Expansion, want, a.radial.Value, exactValue(c, o, nm.Spec))
	}
	// Second stage: the weighted slack sum is unique; the slacks may not be.
	if got := weightedSlack(c.Data, u); !close6(got, a.slacks.Weighted) {
		t.Errorf("%s: engine weighted slack sum %.12g, glpsol %.12g (glpsol slacks in %v out %v)",
			where, got, a.slacks.Weighted, a.slacks.In, a.slacks.Out)
	}
	if bad := checkTargets(c.Data, nm.Model, u); len(bad) > 0 {
		t.Errorf("%s: targets: %s", where, strings.Join(bad, "; "))
	}
	// Super-efficiency: nil exactly when glpsol finds no feasible solution
	// (or, in output orientation, phi = 0: no finite score).
	superNone := !a.super.Feasible || (out && a.super.Value <= 1e-12)
	switch {
	case superNone && u.Super != nil:
		t.Errorf("%s: engine super-efficiency %.12g, glpsol: no finite value (feasible %v, value %g)%s",
			where, *u.Super, a.super.Feasible, a.super.Value, exactValue(c, o, nm.Spec.Super()))
	case !superNone && u.Super == nil:
		t.Errorf("%s: engine super-efficiency nil (%s), glpsol %.12g (theta/phi %.12g)%s",
			where, u.SuperNote, scoreOf(out, a.super.Value), a.super.Value, exactValue(c, o, nm.Spec.Super()))
	case !superNone && !close6(*u.Super, scoreOf(out, a.super.Value)):
		t.Errorf("%s: engine super-efficiency %.12g, glpsol %.12g (theta/phi %.12g)%s",
			where, *u.Super, scoreOf(out, a.super.Value), a.super.Value, exactValue(c, o, nm.Spec.Super()))
	}
	compareScale(t, where, grid, g, o, u, ans)
}

// compareScale checks the returns-to-scale detail against the oracle's
// constant, variable and non-increasing scores in the same orientation, and
// the class (Färe, Grosskopf & Lovell 1994) where the oracle's own
// comparison is clear of the tolerance.
func compareScale(t *testing.T, where string, grid []namedModel, g, o int, u dea.UnitResult, ans [][]oracleAnswer) {
	t.Helper()
	out := grid[g].Model.Orientation == dea.Output
	find := func(r dea.Returns) (float64, bool) {
		for k, nm := range grid {
			if nm.Model.Returns == r && (nm.Model.Orientation == dea.Output) == out && ans[k][o].err == nil {
				return scoreOf(out, ans[k][o].radial.Value), true
			}
		}
		return 0, false
	}
	crs, ok1 := find(dea.Constant)
	vrs, ok2 := find(dea.Variable)
	nirs, ok3 := find(dea.NonIncreasing)
	if !ok1 || !ok2 || !ok3 {
		return
	}
	for _, p := range []struct {
		name      string
		got, want float64
	}{{"ScoreCRS", u.ScoreCRS, crs}, {"ScoreVRS", u.ScoreVRS, vrs}, {"ScoreNIRS", u.ScoreNIRS, nirs}, {"ScaleEff", u.ScaleEff, crs / vrs}} {
		if !close6(p.got, p.want) {
			t.Errorf("%s: engine %s %.12g, glpsol %.12g", where, p.name, p.got, p.want)
		}
	}
	var class dea.ScaleClass
	switch se := crs / vrs; {
	case math.Abs(se-1) <= 1e-9:
		class = dea.ScaleConstant
	case math.Abs(se-1) < 1e-5:
		return // too close to call
	case math.Abs(nirs-vrs) <= 1e-9:
		class = dea.ScaleDecreasing
	case math.Abs(nirs-vrs) < 1e-5:
		return
	default:
		class = dea.ScaleIncreasing
	}
	if u.ScaleClass != class {
		t.Errorf("%s: engine scale class %q, glpsol scores give %q (CRS %.12g, VRS %.12g, NIRS %.12g)", where, u.ScaleClass, class, crs, vrs, nirs)
	}
}
