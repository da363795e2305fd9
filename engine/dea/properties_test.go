package dea_test

// Facts of the trade, checked over seeded generated data. Each test says
// where its fact comes from ("common practice" for textbook facts, or the
// theorem). No outside solver is needed here; the oracle suite compares the
// numbers themselves with glpsol.

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"peerlens/engine/dea"
)

// propTol is the agreement asked between two engine results that theory
// says are equal (same data, different but equivalent questions).
const propTol = 1e-7

// propData is the well-conditioned and the awkward data the facts must hold
// on: plain data (seeds 1-6), and one seed of each awkward generator.
func propData() []genCase {
	var cs []genCase
	for s := uint64(1); s <= 6; s++ {
		cs = append(cs, generate("plain", s, 0))
	}
	for _, k := range []string{"duplicates", "ties", "slack", "zeros", "collinear", "magnitudes", "degenerate", "identical", "mixed"} {
		cs = append(cs, generate(k, 11, 0))
	}
	return cs
}

// wellConditioned is the plain data only.
func wellConditioned() []genCase {
	var cs []genCase
	for s := uint64(1); s <= 6; s++ {
		cs = append(cs, generate("plain", s, 0))
	}
	return append(cs, generate("plain", 99, 150))
}

// forEach runs every model of the grid on every data set.
func forEach(t *testing.T, cs []genCase, f func(t *testing.T, c genCase, nm namedModel, res *dea.Result)) {
	for _, c := range cs {
		for _, nm := range modelGrid() {
			f(t, c, nm, run(t, c.Data, nm.Model))
		}
	}
}

// Common practice: radial scores lie in (0, 1], and at least one unit is
// efficient in every model (the technology is spanned by the units).
func TestScoresInUnitIntervalSomeEfficient(t *testing.T) {
	forEach(t, propData(), func(t *testing.T, c genCase, nm namedModel, res *dea.Result) {
		best := 0.0
		for _, u := range res.Units {
			if !(u.Score > 0 && u.Score <= 1+1e-9) {
				t.Errorf("%s, %s, unit %d: score %.12g outside (0, 1]", nm.Name, c, u.Index, u.Score)
			}
			best = math.Max(best, u.Score)
		}
		if best < 1-1e-6 {
			t.Errorf("%s, %s: no efficient unit (best score %.12g)", nm.Name, c, best)
		}
	})
}

// scoresBy runs one returns assumption in one orientation.
func scoresBy(t *testing.T, d *dea.Data, r dea.Returns, o dea.Orientation) []float64 {
	m := dea.Model{Returns: r, Orientation: o}
	if r == dea.Bounded {
		m.Lower, m.Upper = 0.8, 1.2
	}
	res := run(t, d, m)
	s := make([]float64, len(res.Units))
	for k, u := range res.Units {
		s[k] = u.Score
	}
	return s
}

// Nested technologies (common practice; Färe, Grosskopf & Lovell 1994):
// the constant-returns technology contains the non-increasing, the
// non-decreasing and the bounded [0.8, 1.2] ones, which all contain the
// variable-returns one; so CRS <= NIRS, NDRS, bounded <= VRS unit by unit,
// in either orientation. Under constant returns the input score equals
// 1/phi of the output orientation (common practice; Cooper, Seiford & Tone
// 2007, ch. 3).
func TestReturnsOrderingAndCRSOrientations(t *testing.T) {
	for _, c := range propData() {
		for _, o := range []dea.Orientation{dea.Input, dea.Output} {
			crs := scoresBy(t, c.Data, dea.Constant, o)
			vrs := scoresBy(t, c.Data, dea.Variable, o)
			for _, mid := range []dea.Returns{dea.NonIncreasing, dea.NonDecreasing, dea.Bounded} {
				s := scoresBy(t, c.Data, mid, o)
				for k := range s {
					if s[k] < crs[k]-propTol || s[k] > vrs[k]+propTol {
						t.Errorf("%s, %s, unit %d: %s score %.12g not between CRS %.12g and VRS %.12g", c, o, k, mid, s[k], crs[k], vrs[k])
					}
				}
			}
		}
		in, out := scoresBy(t, c.Data, dea.Constant, dea.Input), scoresBy(t, c.Data, dea.Constant, dea.Output)
		for k := range in {
			if math.Abs(in[k]-out[k]) > propTol {
				t.Errorf("%s, unit %d: CRS input theta %.12g but 1/phi %.12g", c, k, in[k], out[k])
			}
		}
	}
}

// Banker, Charnes & Cooper (1984): the input- and output-oriented
// variable-returns models find the same efficient units (score 1).
func TestVRSOrientationsSameEfficientUnits(t *testing.T) {
	for _, c := range propData() {
		in, out := scoresBy(t, c.Data, dea.Variable, dea.Input), scoresBy(t, c.Data, dea.Variable, dea.Output)
		for k := range in {
			if (in[k] >= 1-1e-6) != (out[k] >= 1-1e-6) {
				t.Errorf("%s, unit %d: VRS input score %.12g, output score %.12g", c, k, in[k], out[k])
			}
		}
	}
}

// Färe, Grosskopf & Lovell (1994): scale efficiency = CRS / VRS lies in
// (0, 1]; the detail's three scores are those of the separate models.
func TestScaleDetail(t *testing.T) {
	for _, c := range propData() {
		for _, o := range []dea.Orientation{dea.Input, dea.Output} {
			crs := scoresBy(t, c.Data, dea.Constant, o)
			vrs := scoresBy(t, c.Data, dea.Variable, o)
			nirs := scoresBy(t, c.Data, dea.NonIncreasing, o)
			res := run(t, c.Data, dea.Model{Returns: dea.Variable, Orientation: o, ScaleDetail: true})
			for k, u := range res.Units {
				if !(u.ScaleEff > 0 && u.ScaleEff <= 1+1e-9) || math.Abs(u.ScaleEff-u.ScoreCRS/u.ScoreVRS) > propTol {
					t.Errorf("%s, %s, unit %d: scale efficiency %.12g (CRS %.12g / VRS %.12g)", c, o, k, u.ScaleEff, u.ScoreCRS, u.ScoreVRS)
				}
				if math.Abs(u.ScoreCRS-crs[k]) > propTol || math.Abs(u.ScoreVRS-vrs[k]) > propTol || math.Abs(u.ScoreNIRS-nirs[k]) > propTol {
					t.Errorf("%s, %s, unit %d: detail (%.12g, %.12g, %.12g), separate runs (%.12g, %.12g, %.12g)",
						c, o, k, u.ScoreCRS, u.ScoreVRS, u.ScoreNIRS, crs[k], vrs[k], nirs[k])
				}
			}
		}
	}
}

// Common practice: a larger reference set can only lower (never raise)
// another unit's score, in every radial model.
func TestAddingAUnitNeverRaisesAScore(t *testing.T) {
	for _, c := range propData() {
		r := rand.New(rand.NewPCG(c.Seed, 77))
		d := c.Data
		b := r.IntN(len(d.X))
		big := cloneData(d)
		x, y := append([]float64(nil), d.X[b]...), append([]float64(nil), d.Y[b]...)
		for i := range x {
			x[i] *= 0.6 + 0.6*r.Float64()
		}
		for k := range y {
			y[k] *= 0.6 + 0.6*r.Float64()
		}
		big.X, big.Y = append(big.X, x), append(big.Y, y)
		big.Units = append(big.Units, "added")
		for _, nm := range modelGrid() {
			before, after := run(t, d, nm.Model), run(t, big, nm.Model)
			for k, u := range before.Units {
				if after.Units[k].Score > u.Score+propTol {
					t.Errorf("%s, %s, unit %d: score rose from %.12g to %.12g when a unit was added", nm.Name, c, k, u.Score, after.Units[k].Score)
				}
			}
		}
	}
}

// Common practice: an inefficient unit lies inside the technology spanned
// by the others, so removing it changes no score. (This holds when the
// returns bounds are 0 or 1 on each side; bounds such as [0.8, 1.2] are
// not covered.)
func TestRemovingAnInefficientUnitChangesNoScore(t *testing.T) {
	for _, c := range propData() {
		d := c.Data
		for _, nm := range modelGrid() {
			if nm.Model.Returns == dea.Bounded {
				continue
			}
			before := run(t, d, nm.Model)
			removed := 0
			for k, u := range before.Units {
				if u.Score >= 1-1e-6 || removed == 2 {
					continue
				}
				removed++
				after := run(t, without(d, k), nm.Model)
				for j, v := range after.Units {
					orig := j
					if j >= k {
						orig++
					}
					if math.Abs(v.Score-before.Units[orig].Score) > propTol {
						t.Errorf("%s, %s: removing inefficient unit %d moved unit %d from %.12g to %.12g", nm.Name, c, k, orig, before.Units[orig].Score, v.Score)
					}
				}
			}
		}
	}
}

// Common practice (units invariance of radial models; Cooper, Seiford &
// Tone 2007, ch. 3): rescaling a measure changes no score and no
// super-efficiency score.
func TestRescalingAMeasureChangesNoScore(t *testing.T) {
	for _, c := range propData() {
		r := rand.New(rand.NewPCG(c.Seed, 91))
		d := cloneData(c.Data)
		fx, fy := math.Pow(10, -3+6*r.Float64()), math.Pow(10, -3+6*r.Float64())
		ix, iy := r.IntN(len(d.X[0])), r.IntN(len(d.Y[0]))
		for j := range d.X {
			d.X[j][ix] *= fx
			d.Y[j][iy] *= fy
		}
		for _, nm := range modelGrid() {
			a, b := run(t, c.Data, nm.Model), run(t, d, nm.Model)
			for k := range a.Units {
				ua, ub := a.Units[k], b.Units[k]
				if !close7(ua.Score, ub.Score) || (ua.Super == nil) != (ub.Super == nil) || (ua.Super != nil && !close7(*ua.Super, *ub.Super)) {
					t.Errorf("%s, %s, unit %d (input %d x %g, output %d x %g): score %.12g -> %.12g, super %v -> %v",
						nm.Name, c, k, ix, fx, iy, fy, ua.Score, ub.Score, fmtPtr(ua.Super), fmtPtr(ub.Super))
				}
			}
		}
	}
}

func close7(a, b float64) bool { return math.Abs(a-b) <= propTol*math.Max(1, math.Abs(b)) }

func fmtPtr(p *float64) string {
	if p == nil {
		return "nil"
	}
	return fmt.Sprintf("%.12g", *p)
}

// Common practice (Pareto-Koopmans efficiency; Cooper, Seiford & Tone 2007,
// ch. 3): a unit is fully efficient only when its score is 1 and every
// slack is zero; weakly efficient when its score is 1 with some slack;
// inefficient when its score is below 1. Also: the peers' lambdas
// reproduce the targets.
func TestStatusAndTargetsConsistent(t *testing.T) {
	forEach(t, propData(), func(t *testing.T, c genCase, nm namedModel, res *dea.Result) {
		for _, u := range res.Units {
			slack := weightedSlack(c.Data, u)
			one := u.Score >= 1-1e-6
			var want dea.Status
			switch {
			case !one:
				want = dea.Inefficient
			case slack > 0:
				want = dea.WeaklyEfficient
			default:
				want = dea.Efficient
			}
			if u.Status != want {
				t.Errorf("%s, %s, unit %d: status %q with score %.12g and weighted slack %.3g; want %q", nm.Name, c, u.Index, u.Status, u.Score, slack, want)
			}
			for _, bad := range checkTargets(c.Data, nm.Model, u) {
				t.Errorf("%s, %s, unit %d: %s", nm.Name, c, u.Index, bad)
			}
		}
	})
}

// Super-efficiency (Andersen & Petersen 1993): leaving an inefficient unit
// out of its own reference set changes nothing, so its super score equals
// its score; an efficient unit's super score is at least 1 (or none). The
// first fact needs returns bounds of 0 or 1 (as for removing a unit): under
// bounded returns such as [0.8, 1.2] the unit's own column can carry part
// of its optimal combination, and glpsol agrees with the engine there.
func TestSuperEfficiencyFacts(t *testing.T) {
	forEach(t, propData(), func(t *testing.T, c genCase, nm namedModel, res *dea.Result) {
		for _, u := range res.Units {
			if nm.Model.Returns == dea.Bounded && u.Score < 1-1e-6 {
				continue
			}
			switch {
			case u.Score < 1-1e-6 && (u.Super == nil || !close7(*u.Super, u.Score)):
				t.Errorf("%s, %s, unit %d: inefficient (score %.12g) but super %s", nm.Name, c, u.Index, u.Score, fmtPtr(u.Super))
			case u.Score >= 1-1e-6 && u.Super != nil && *u.Super < 1-propTol:
				t.Errorf("%s, %s, unit %d: efficient but super %.12g < 1", nm.Name, c, u.Index, *u.Super)
			case u.Super == nil && u.SuperNote == "":
				t.Errorf("%s, %s, unit %d: no super score and no note saying why", nm.Name, c, u.Index)
			}
		}
	})
}

// Certificates (duality; common practice): the reported multiplier weights
// v (inputs) and u (outputs) and the free variable w satisfy, for every
// unit j, u.y_j - v.x_j + w <= 0 (no unit's ratio beyond the frontier),
// with v, u >= 0; in input orientation v.x_o <= 1 and theta = u.y_o + b*w;
// in output orientation u.y_o >= 1 and phi = v.x_o - b*w, where b is the
// returns bound that w belongs to (1 for variable, non-increasing and
// non-decreasing returns; the lower bound when w > 0 and the upper bound
// when w < 0 for bounded returns; w = 0 under constant returns). Checked
// here from InputW, OutputW and Free alone, and every certificate must be
// Verified on well-conditioned data.
func TestCertificatesFromReportedWeights(t *testing.T) {
	forEach(t, wellConditioned(), func(t *testing.T, c genCase, nm namedModel, res *dea.Result) {
		for _, u := range res.Units {
			if !u.Cert.Verified {
				t.Errorf("%s, %s, unit %d: certificate not verified: %+v", nm.Name, c, u.Index, u.Cert)
			}
			if u.SuperCert != nil && !u.SuperCert.Verified {
				t.Errorf("%s, %s, unit %d: super-efficiency certificate not verified: %+v", nm.Name, c, u.Index, *u.SuperCert)
			}
			for _, bad := range checkDual(c.Data, nm.Model, u) {
				t.Errorf("%s, %s, unit %d: %s", nm.Name, c, u.Index, bad)
			}
		}
	})
}

// checkDual is the multiplier-form check of TestCertificatesFromReportedWeights.
func checkDual(d *dea.Data, m dea.Model, u dea.UnitResult) []string {
	var bad []string
	const tol = 1e-6
	v := make([]float64, len(u.InputW))
	w := make([]float64, len(u.OutputW))
	for i, x := range u.InputW {
		v[i] = x.Weight
	}
	for r, x := range u.OutputW {
		w[r] = x.Weight
	}
	for _, x := range append(append([]float64(nil), v...), w...) {
		if x < -tol {
			bad = append(bad, fmt.Sprintf("negative weight %g", x))
		}
	}
	if len(v) != len(d.X[0]) || len(w) != len(d.Y[0]) {
		return append(bad, "weights missing")
	}
	for j := range d.X {
		vx, uy := dotp(v, d.X[j]), dotp(w, d.Y[j])
		if uy-vx+u.Free > tol*(1+vx) {
			bad = append(bad, fmt.Sprintf("weights put unit %d beyond the frontier: u.y - v.x + w = %.3g", j, uy-vx+u.Free))
		}
	}
	lo, hi := sumBounds(m)
	b := 1.0
	switch {
	case m.Returns == dea.Constant:
		if math.Abs(u.Free) > tol {
			bad = append(bad, fmt.Sprintf("free variable %g under constant returns", u.Free))
		}
	case m.Returns == dea.Bounded && u.Free > 0:
		b = lo
	case m.Returns == dea.Bounded && u.Free < 0:
		b = hi
	}
	vx, uy := dotp(v, d.X[u.Index]), dotp(w, d.Y[u.Index])
	if m.Orientation == dea.Input {
		if vx > 1+tol {
			bad = append(bad, fmt.Sprintf("v.x_o = %.12g > 1", vx))
		}
		if dual := uy + b*u.Free; math.Abs(dual-u.Score) > tol*math.Max(1, u.Score) {
			bad = append(bad, fmt.Sprintf("dual objective %.12g, theta %.12g", dual, u.Score))
		}
	} else {
		if uy < 1-tol {
			bad = append(bad, fmt.Sprintf("u.y_o = %.12g < 1", uy))
		}
		if dual := vx - b*u.Free; math.Abs(dual-u.Expansion) > tol*math.Max(1, u.Expansion) {
			bad = append(bad, fmt.Sprintf("dual objective %.12g, phi %.12g", dual, u.Expansion))
		}
	}
	return bad
}

func dotp(a, b []float64) float64 {
	t := 0.0
	for i := range a {
		t += a[i] * b[i]
	}
	return t
}

func cloneData(d *dea.Data) *dea.Data {
	c := &dea.Data{Units: append([]string(nil), d.Units...), InputNames: d.InputNames, OutputNames: d.OutputNames}
	for j := range d.X {
		c.X = append(c.X, append([]float64(nil), d.X[j]...))
		c.Y = append(c.Y, append([]float64(nil), d.Y[j]...))
	}
	return c
}

// without returns d with unit k removed.
func without(d *dea.Data, k int) *dea.Data {
	c := cloneData(d)
	c.X = append(c.X[:k], c.X[k+1:]...)
	c.Y = append(c.Y[:k], c.Y[k+1:]...)
	c.Units = append(c.Units[:k], c.Units[k+1:]...)
	return c
}
