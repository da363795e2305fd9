package dea_test

// Seeded generators of data that is hard for simplex codes (see
// /work/shared/CHECKS.md): duplicated units, ties on the frontier, units
// dominated only through slacks, zero cells, collinear measures, magnitudes
// from 1e-4 to 1e7, units whose sizes differ by eight orders of magnitude,
// many units exactly on the frontier, a single unit, all
// units identical. Every generated unit keeps a positive input and a
// positive output, and every measure has a positive mean (the second stage
// weighs slacks by 1/mean).

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"peerlens/engine/dea"
	"peerlens/engine/internal/oracle"
)

// genKinds lists every generator by name, in a fixed order.
var genKinds = []string{
	"plain", "duplicates", "ties", "slack", "zeros", "collinear",
	"magnitudes", "degenerate", "single", "identical", "mixed", "sizes",
}

// genCase is one generated data set with what made it.
type genCase struct {
	Kind string
	Seed uint64
	Data *dea.Data
}

func (c genCase) String() string {
	d := c.Data
	return fmt.Sprintf("generator %q seed %d (n=%d, m=%d, s=%d)", c.Kind, c.Seed, len(d.X), len(d.X[0]), len(d.Y[0]))
}

// generate makes the data set of one generator and seed. n, m and s are
// drawn from the seed unless nFix > 0 (then n = nFix).
func generate(kind string, seed uint64, nFix int) genCase {
	r := rand.New(rand.NewPCG(seed, kindStream(kind)))
	n := 2 + r.IntN(29) // 2..30
	if nFix > 0 {
		n = nFix
	}
	m, s := 1+r.IntN(4), 1+r.IntN(4)
	g := &gen{r: r, m: m, s: s}
	var X, Y [][]float64
	switch kind {
	case "plain":
		X, Y = g.base(n, 0.7, 0.3)
	case "duplicates":
		X, Y = g.base(n, 0.8, 0.3)
		g.duplicate(X, Y, 1+n/4)
	case "ties":
		// Constant-returns frontier y = w.x shared by half the units: ties.
		X, Y = g.base(n, 1, 0.5)
		g.duplicate(X, Y, 1+n/6)
	case "slack":
		g.m = max(m, 2) // with one input a raised input is a radial loss
		X, Y = g.base(n, 0.7, 0.4)
		g.slackDominated(&X, &Y, 1+n/5)
	case "zeros":
		X, Y = g.base(n, 0.7, 0.3)
		g.zeros(X, Y, 0.25)
	case "collinear":
		g.m, g.s = max(m, 2), max(s, 2)
		X, Y = g.base(n, 0.8, 0.3)
		g.collinear(X, Y)
	case "magnitudes":
		X, Y = g.base(n, 0.7, 0.3)
		g.magnitudes(X, Y)
	case "degenerate":
		// Every unit on a concave (variable-returns) frontier, a few copies.
		X, Y = g.base(n, 0.5, 1)
		g.duplicate(X, Y, n/5)
	case "single":
		X, Y = g.base(1, 0.7, 0.3)
	case "identical":
		X, Y = g.base(1, 0.7, 0.3)
		for len(X) < n {
			X = append(X, append([]float64(nil), X[0]...))
			Y = append(Y, append([]float64(nil), Y[0]...))
		}
	case "sizes":
		// Units of very different sizes: every measure of a unit scaled by
		// one factor from 1e-3 to 1e5, so each measure spans about eight
		// orders of magnitude, on top of magnitudes across measures.
		X, Y = g.base(n, 0.7, 0.3)
		g.sizes(X, Y)
		g.magnitudes(X, Y)
	case "mixed":
		X, Y = g.base(n, 0.6+0.4*r.Float64(), 0.4)
		g.duplicate(X, Y, 1+n/6)
		g.slackDominated(&X, &Y, 1+n/6)
		g.zeros(X, Y, 0.15)
		g.magnitudes(X, Y)
	default:
		panic("unknown generator " + kind)
	}
	return genCase{Kind: kind, Seed: seed, Data: named(X, Y)}
}

// kindStream gives each generator its own random stream, so that sizes
// differ between generators with the same seed.
func kindStream(kind string) uint64 {
	h := uint64(0x5eed0f)
	for _, c := range kind {
		h = h*1099511628211 ^ uint64(c)
	}
	return h
}

type gen struct {
	r    *rand.Rand
	m, s int
}

// base draws inputs in [1, 10] and outputs from the frontier
// (w.x)^beta split into s shares, times an efficiency that is 1 with
// probability pEff and uniform in [0.4, 1) otherwise; beta = 1 gives a
// constant-returns frontier, beta < 1 a strictly concave one.
func (g *gen) base(n int, beta, pEff float64) (X, Y [][]float64) {
	w := make([]float64, g.m)
	for i := range w {
		w[i] = 0.5 + g.r.Float64()
	}
	share := make([]float64, g.s)
	for k := range share {
		share[k] = 0.2 + g.r.Float64()
	}
	for j := 0; j < n; j++ {
		x := make([]float64, g.m)
		z := 0.0
		for i := range x {
			x[i] = math.Round((1+9*g.r.Float64())*100) / 100
			z += w[i] * x[i]
		}
		e := 1.0
		if g.r.Float64() >= pEff {
			e = 0.4 + 0.6*g.r.Float64()
		}
		y := make([]float64, g.s)
		for k := range y {
			y[k] = e * share[k] * math.Pow(z, beta)
		}
		X, Y = append(X, x), append(Y, y)
	}
	return X, Y
}

// duplicate overwrites k random units with copies of other units.
func (g *gen) duplicate(X, Y [][]float64, k int) {
	n := len(X)
	if n < 2 {
		return
	}
	for ; k > 0; k-- {
		a, b := g.r.IntN(n), g.r.IntN(n)
		copy(X[a], X[b])
		copy(Y[a], Y[b])
	}
}

// slackDominated appends k copies of the unit with the largest outputs,
// each with one input raised by 20-50%. Under variable returns only that
// unit (or its copies) can make its outputs, so the copy keeps input score 1
// and only a slack shows its waste (weak efficiency).
func (g *gen) slackDominated(X, Y *[][]float64, k int) {
	b := 0
	for j := range *Y {
		if sum((*Y)[j]) > sum((*Y)[b]) {
			b = j
		}
	}
	for ; k > 0; k-- {
		x := append([]float64(nil), (*X)[b]...)
		y := append([]float64(nil), (*Y)[b]...)
		x[g.r.IntN(g.m)] *= 1.2 + 0.3*g.r.Float64()
		*X, *Y = append(*X, x), append(*Y, y)
	}
}

func sum(v []float64) float64 {
	t := 0.0
	for _, x := range v {
		t += x
	}
	return t
}

// zeros sets cells to 0 with probability p, keeping one positive input and
// one positive output per unit and a positive value somewhere in each column.
func (g *gen) zeros(X, Y [][]float64, p float64) {
	for _, M := range [][][]float64{X, Y} {
		for j := range M {
			keep := g.r.IntN(len(M[j]))
			for i := range M[j] {
				if i != keep && g.r.Float64() < p {
					M[j][i] = 0
				}
			}
		}
		for i := range M[0] {
			any := false
			for j := range M {
				any = any || M[j][i] > 0
			}
			if !any {
				M[g.r.IntN(len(M))][i] = 1 + g.r.Float64()
			}
		}
	}
}

// collinear makes the second input and the second output exact multiples of
// the first ones.
func (g *gen) collinear(X, Y [][]float64) {
	cx, cy := 0.5+3*g.r.Float64(), 0.25+2*g.r.Float64()
	for j := range X {
		X[j][1] = cx * X[j][0]
		Y[j][1] = cy * Y[j][0]
	}
}

// magnitudes rescales each measure by a factor 10^u, u uniform in [-4, 7].
func (g *gen) magnitudes(X, Y [][]float64) {
	for _, M := range [][][]float64{X, Y} {
		for i := range M[0] {
			f := math.Pow(10, -4+11*g.r.Float64())
			for j := range M {
				M[j][i] *= f
			}
		}
	}
}

func (g *gen) sizes(X, Y [][]float64) {
	for j := range X {
		f := math.Pow(10, -3+8*g.r.Float64())
		for i := range X[j] {
			X[j][i] *= f
		}
		for k := range Y[j] {
			Y[j][k] *= f
		}
	}
}

func named(X, Y [][]float64) *dea.Data {
	d := &dea.Data{X: X, Y: Y}
	for j := range X {
		d.Units = append(d.Units, fmt.Sprintf("u%d", j))
	}
	for i := range X[0] {
		d.InputNames = append(d.InputNames, fmt.Sprintf("x%d", i))
	}
	for k := range Y[0] {
		d.OutputNames = append(d.OutputNames, fmt.Sprintf("y%d", k))
	}
	return d
}

// TestGeneratorsKeepTheirPromises checks the invariants every generated data
// set must satisfy and, with glpsol, the property each generator claims.
func TestGeneratorsKeepTheirPromises(t *testing.T) {
	for _, k := range genKinds {
		for seed := uint64(1); seed <= 20; seed++ {
			c := generate(k, seed, 0)
			if msg := checkGenerated(c.Data); msg != "" {
				t.Errorf("%s: %s", c, msg)
			}
			if c2 := generate(k, seed, 0); fmt.Sprint(c2.Data) != fmt.Sprint(c.Data) {
				t.Errorf("%s: not reproducible from its seed", c)
			}
		}
	}
	for _, n := range []int{2, 120, 200} {
		if c := generate("mixed", 7, n); len(c.Data.X) < n || checkGenerated(c.Data) != "" {
			t.Errorf("%s: size or invariants wrong: %s", c, checkGenerated(c.Data))
		}
	}
	if c := generate("single", 3, 0); len(c.Data.X) != 1 {
		t.Errorf("%s: want one unit", c)
	}
	c := generate("collinear", 4, 0)
	for j := range c.Data.X {
		if c.Data.X[j][1]*c.Data.X[0][0] != c.Data.X[0][1]*c.Data.X[j][0] && math.Abs(c.Data.X[j][1]/c.Data.X[j][0]-c.Data.X[0][1]/c.Data.X[0][0]) > 1e-12 {
			t.Errorf("%s: inputs 0 and 1 not collinear at unit %d", c, j)
		}
	}
	c = generate("magnitudes", 5, 0)
	lo, hi := math.Inf(1), 0.0
	for _, M := range [][][]float64{c.Data.X, c.Data.Y} {
		for _, row := range M {
			for _, v := range row {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if hi/lo < 1e3 {
		t.Errorf("%s: magnitudes span only %g..%g", c, lo, hi)
	}
}

// checkGenerated returns "" when every unit has a positive input and a
// positive output, every cell is finite and non-negative, and every measure
// has a positive mean.
func checkGenerated(d *dea.Data) string {
	if len(d.X) == 0 || len(d.X) != len(d.Y) || len(d.Units) != len(d.X) {
		return "shape"
	}
	for j := range d.X {
		px, py := false, false
		for _, v := range d.X[j] {
			if v < 0 || math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Sprintf("unit %d input %g", j, v)
			}
			px = px || v > 0
		}
		for _, v := range d.Y[j] {
			if v < 0 || math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Sprintf("unit %d output %g", j, v)
			}
			py = py || v > 0
		}
		if !px || !py {
			return fmt.Sprintf("unit %d has no positive input or no positive output", j)
		}
	}
	mx, my := means(d)
	for _, m := range append(mx, my...) {
		if m <= 0 {
			return "a measure has mean 0"
		}
	}
	return ""
}

// TestGeneratorsAgainstGlpsol confirms with glpsol what the frontier
// generators promise: "degenerate" puts every unit on the variable-returns
// frontier (input score 1), "identical" makes every unit efficient under
// constant returns, copies in "duplicates" get equal scores, and each unit
// that "slack" appends keeps variable-returns input score 1 while only a
// slack shows its waste.
func TestGeneratorsAgainstGlpsol(t *testing.T) {
	needGlpsol(t)
	ctx := context.Background()
	solve := func(c genCase, o int, s oracle.Spec) float64 {
		t.Helper()
		r, err := oracle.SolveRadial(ctx, c.Data.X, c.Data.Y, o, s, oracle.Options{})
		if err != nil || !r.Feasible {
			t.Fatalf("%s unit %d: %v (feasible %v)", c, o, err, r.Feasible)
		}
		return r.Value
	}
	for seed := uint64(1); seed <= 3; seed++ {
		c := generate("degenerate", seed, 0)
		for o := range c.Data.X {
			if v := solve(c, o, oracle.VRS); math.Abs(v-1) > 1e-9 {
				t.Errorf("%s unit %d: variable-returns input score %.12g, want 1", c, o, v)
			}
		}
		c = generate("identical", seed, 0)
		for o := range c.Data.X {
			if v := solve(c, o, oracle.CRS); math.Abs(v-1) > 1e-9 {
				t.Errorf("%s unit %d: constant-returns score %.12g, want 1", c, o, v)
			}
		}
		c = generate("duplicates", seed, 0)
		for a := range c.Data.X {
			for b := a + 1; b < len(c.Data.X); b++ {
				if fmt.Sprint(c.Data.X[a], c.Data.Y[a]) != fmt.Sprint(c.Data.X[b], c.Data.Y[b]) {
					continue
				}
				if va, vb := solve(c, a, oracle.VRS), solve(c, b, oracle.VRS); math.Abs(va-vb) > 1e-9 {
					t.Errorf("%s: copies %d and %d score %.12g and %.12g", c, a, b, va, vb)
				}
			}
		}
	}
	// The slack generator appends 1+n/5 units to n base units.
	for seed := uint64(1); seed <= 5; seed++ {
		c := generate("slack", seed, 0)
		N := len(c.Data.X)
		n := N
		for n+1+n/5 > N {
			n--
		}
		for o := n; o < N; o++ {
			src := -1
			for j := 0; j < n; j++ {
				if sameExceptOne(c.Data, j, o) {
					src = j
				}
			}
			if src < 0 || math.Abs(solve(c, src, oracle.VRS)-1) > 1e-9 {
				continue // its source is not itself efficient
			}
			s, err := oracle.SolveSecondStage(ctx, c.Data.X, c.Data.Y, o, oracle.VRS, oracle.Options{})
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(s.Radial-1) > 1e-9 || s.Weighted < 1e-3 {
				t.Errorf("%s unit %d (copy of %d): theta %.12g, weighted slack %.12g; want 1 and a positive slack", c, o, src, s.Radial, s.Weighted)
			}
		}
	}
}

// sameExceptOne says unit b is unit a with exactly one measure changed.
func sameExceptOne(d *dea.Data, a, b int) bool {
	diff := 0
	for i := range d.X[a] {
		if d.X[a][i] != d.X[b][i] {
			diff++
		}
	}
	for r := range d.Y[a] {
		if d.Y[a][r] != d.Y[b][r] {
			diff++
		}
	}
	return diff == 1
}
