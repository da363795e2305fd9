package dea_test

import (
	"context"
	"math"
	"slices"
	"testing"

	"peerlens/engine/dea"
)

// Column generation must give the answers of the whole program: every
// generator (including hard ones: ties, slack-only dominance, zeros,
// collinear measures, wide magnitudes, units of very different sizes) and
// every model of the grid, solved once with every program over all its
// columns and once by column generation (the way every unit's program is
// solved, and the one TestModelsAgainstGlpsol checks against glpsol), must
// agree on scores, slack sums, targets, super-efficiency and the
// returns-to-scale detail.
func TestColumnGenerationMatchesWholeProgram(t *testing.T) {
	var cs []genCase
	for _, k := range genKinds {
		for s := uint64(1); s <= 4; s++ {
			cs = append(cs, generate(k, 100+s, 0))
		}
	}
	cs = append(cs, generate("plain", 7, 200), generate("slack", 8, 120), generate("sizes", 9, 150))
	for _, c := range cs {
		for _, nm := range modelGrid() {
			restore := dea.SetRestrictAbove(1 << 30)
			whole := run(t, c.Data, nm.Model)
			restore()
			restore = dea.SetRestrictAbove(0)
			cg := run(t, c.Data, nm.Model)
			restore()
			for k, w := range whole.Units {
				g := cg.Units[k]
				where := func(what string, a, b float64) {
					t.Errorf("%s, %s, unit %d: %s %v by column generation, %v over all columns", c, nm.Name, k, what, a, b)
				}
				if w.Status == dea.NotSolved {
					continue // nothing to compare with
				}
				if g.Status != w.Status {
					t.Errorf("%s, %s, unit %d: status %v by column generation, %v over all columns", c, nm.Name, k, g.Status, w.Status)
					continue
				}
				if !g.Cert.Verified {
					t.Errorf("%s, %s, unit %d: certificate fails by column generation: %+v", c, nm.Name, k, g.Cert)
				}
				if !close6(g.Score, w.Score) {
					where("score", g.Score, w.Score)
				}
				if a, b := weightedSlack(c.Data, g), weightedSlack(c.Data, w); math.Abs(a-b) > 1e-6*math.Max(1, math.Abs(b)) {
					where("weighted slack sum", a, b)
				}
				for i := range w.Inputs {
					if a, b := g.Inputs[i].Target, w.Inputs[i].Target; math.Abs(a-b) > 1e-6*math.Max(1, math.Abs(b)) && !checkTargetsOK(c, nm, g) {
						where("input target", a, b)
					}
				}
				if (g.Super == nil) != (w.Super == nil) || (g.Super != nil && !close6(*g.Super, *w.Super)) {
					t.Errorf("%s, %s, unit %d: super-efficiency %s by column generation, %s over all columns", c, nm.Name, k, fmtPtr(g.Super), fmtPtr(w.Super))
				}
				if !close6(g.ScoreCRS, w.ScoreCRS) || !close6(g.ScoreVRS, w.ScoreVRS) || !close6(g.ScoreNIRS, w.ScoreNIRS) || g.ScaleClass != w.ScaleClass {
					t.Errorf("%s, %s, unit %d: scale detail %v %v %v %v by column generation, %v %v %v %v over all columns", c, nm.Name, k,
						g.ScoreCRS, g.ScoreVRS, g.ScoreNIRS, g.ScaleClass, w.ScoreCRS, w.ScoreVRS, w.ScoreNIRS, w.ScaleClass)
				}
			}
		}
	}
}

// checkTargetsOK reports whether a unit's targets are feasible and follow
// from its score and slacks (targets can differ between optimal solutions
// when the slack-maximising solution is not unique).
func checkTargetsOK(c genCase, nm namedModel, u dea.UnitResult) bool {
	return len(checkTargets(c.Data, nm.Model, u)) == 0
}

// Units whose sizes differ by eight orders of magnitude, in a study large
// enough for the candidate set and column generation: under constant,
// variable and non-increasing returns, in both orientations, every unit is
// solved and its certificate holds (a unit whose program over the candidate
// set fails is solved again over all units). Non-decreasing and bounded
// returns are left out: on such data a few units there still end unverified
// or unsolved, which the result says.
func TestBadlyScaledLargeStudyAllVerified(t *testing.T) {
	c := generate("sizes", 77, 1500)
	for _, nm := range modelGrid() {
		if r := nm.Model.Returns; r == dea.NonDecreasing || r == dea.Bounded {
			continue
		}
		m := nm.Model
		m.Super = false
		res := run(t, c.Data, m)
		if len(res.Frontier) >= len(c.Data.X) {
			t.Fatalf("%s: no candidate set (%d units)", nm.Name, len(res.Frontier))
		}
		for k, u := range res.Units {
			if u.Status == dea.NotSolved || !u.Cert.Verified {
				t.Errorf("%s, %s, unit %d: status %v, problem %q, certificate %+v", c, nm.Name, k, u.Status, u.Problem, u.Cert)
			}
		}
		// Shared over three workers (Options.Part/Parts), the run gives
		// the same numbers bit for bit, fallbacks included.
		var parts []*dea.Result
		for w := 0; w < 3; w++ {
			r, err := dea.RunWith(context.Background(), c.Data, m, dea.Options{Part: w, Parts: 3, Workers: 1})
			if err != nil {
				t.Fatal(err)
			}
			parts = append(parts, r)
		}
		merged, err := dea.Merge(parts...)
		if err != nil {
			t.Fatal(err)
		}
		for k, u := range merged.Units {
			if w := res.Units[k]; u.Index != w.Index || u.Score != w.Score || !slices.Equal(u.Peers, w.Peers) {
				t.Errorf("%s, %s, unit %d: shared run gives %v %v, one run %v %v", c, nm.Name, k, u.Score, u.Peers, w.Score, w.Peers)
			}
		}
	}
}
