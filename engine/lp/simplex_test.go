package lp

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	gonumlp "gonum.org/v1/gonum/optimize/convex/lp"

	"gonum.org/v1/gonum/mat"
)

// dense builds a Problem from rows (easier to read in tests).
func dense(rows [][]float64, b, c []float64) *Problem {
	m, n := len(rows), len(c)
	a := make([]float64, m*n)
	for i, r := range rows {
		for j, v := range r {
			a[j*m+i] = v
		}
	}
	return &Problem{Rows: m, A: a, B: b, C: c}
}

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b)) }

func TestSmallKnown(t *testing.T) {
	// min -x1 - x2 s.t. x1 + 2x2 + s1 = 4, 3x1 + x2 + s2 = 6: optimum at
	// x1 = 1.6, x2 = 1.2, objective -2.8 (worked by hand: the two
	// constraints meet there).
	p := dense([][]float64{{1, 2, 1, 0}, {3, 1, 0, 1}}, []float64{4, 6}, []float64{-1, -1, 0, 0})
	sol, err := Solve(p, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !near(sol.Obj, -2.8, 1e-12) || !near(sol.X[0], 1.6, 1e-12) || !near(sol.X[1], 1.2, 1e-12) {
		t.Fatalf("got obj %v x %v", sol.Obj, sol.X)
	}
	// Strong duality and dual feasibility.
	if !near(sol.Y[0]*4+sol.Y[1]*6, sol.Obj, 1e-12) {
		t.Errorf("dual objective %v != %v", sol.Y[0]*4+sol.Y[1]*6, sol.Obj)
	}
	for j, d := range sol.D {
		if d < -1e-12 {
			t.Errorf("reduced cost %d = %v < 0", j, d)
		}
	}
}

func TestInfeasibleGivesFarkas(t *testing.T) {
	// x1 + x2 = -1 with x >= 0 has no solution.
	p := dense([][]float64{{1, 1}, {1, -1}}, []float64{-1, 0}, []float64{1, 1})
	sol, err := Solve(p, nil)
	if !errors.Is(err, ErrInfeasible) {
		t.Fatalf("want ErrInfeasible, got %v", err)
	}
	// Farkas: y'A <= 0 for every column and y'b > 0.
	yb := sol.Y[0]*p.B[0] + sol.Y[1]*p.B[1]
	if yb <= 0 {
		t.Errorf("y'b = %v, want > 0", yb)
	}
	for j := 0; j < p.Cols(); j++ {
		c := p.Column(j)
		if v := c[0]*sol.Y[0] + c[1]*sol.Y[1]; v > 1e-12 {
			t.Errorf("y'a_%d = %v > 0", j, v)
		}
	}
}

func TestUnbounded(t *testing.T) {
	// min -x1 s.t. x1 - x2 = 1.
	p := dense([][]float64{{1, -1}}, []float64{1}, []float64{-1, 0})
	if _, err := Solve(p, nil); !errors.Is(err, ErrUnbounded) {
		t.Fatalf("want ErrUnbounded, got %v", err)
	}
}

func TestShapeErrors(t *testing.T) {
	bad := []*Problem{
		{Rows: 0},
		{Rows: 2, A: []float64{1}, B: []float64{1, 1}, C: []float64{1}},
		{Rows: 1, A: []float64{math.NaN()}, B: []float64{1}, C: []float64{1}},
		{Rows: 1, A: []float64{1}, B: []float64{math.Inf(1)}, C: []float64{1}},
	}
	for i, p := range bad {
		if _, err := Solve(p, nil); !errors.Is(err, ErrShape) {
			t.Errorf("case %d: want ErrShape, got %v", i, err)
		}
	}
}

// Beale's (1955) example cycles under Dantzig's rule with a naive ratio test
// (Chvátal 1983, Linear Programming, ch. 3, from memory). The optimum is -1/20
// (x1 = 1/25, x3 = 1); the solver must terminate with it.
func TestBealeTerminates(t *testing.T) {
	rows := [][]float64{
		{0.25, -60, -1.0 / 25, 9, 1, 0, 0},
		{0.5, -90, -1.0 / 50, 3, 0, 1, 0},
		{0, 0, 1, 0, 0, 0, 1},
	}
	c := []float64{-0.75, 150, -1.0 / 50, 6, 0, 0, 0}
	for _, noScale := range []bool{false, true} {
		sol, err := Solve(dense(rows, []float64{0, 0, 1}, c), &Options{Basis: []int{4, 5, 6}, NoScale: noScale})
		if err != nil {
			t.Fatal(err)
		}
		if !near(sol.Obj, -0.05, 1e-12) {
			t.Errorf("objective %v, want -0.05", sol.Obj)
		}
	}
}

// A given basis that is infeasible falls back to phase 1 and still solves.
func TestBadStartBasis(t *testing.T) {
	p := dense([][]float64{{1, 2, 1, 0}, {3, 1, 0, 1}}, []float64{4, 6}, []float64{-1, -1, 0, 0})
	for _, basis := range [][]int{{0, 0}, {0, 1 << 20}, {1, 2}} {
		sol, err := Solve(p, &Options{Basis: basis})
		if err != nil || !near(sol.Obj, -2.8, 1e-12) {
			t.Errorf("basis %v: %v %v", basis, sol, err)
		}
	}
}

// Random feasible bounded problems agree with gonum's independent simplex
// implementation (an outside solver; gonum cycles on degenerate DEA problems,
// so the data here are random and non-degenerate).
func TestAgreesWithGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	compared := 0
	for trial := 0; trial < 200; trial++ {
		m := 2 + rng.IntN(5)
		n := m + 1 + rng.IntN(10)
		rows := make([][]float64, m)
		x0 := make([]float64, n)
		for j := range x0 {
			x0[j] = rng.Float64()
		}
		b := make([]float64, m)
		for i := range rows {
			rows[i] = make([]float64, n)
			for j := range rows[i] {
				rows[i][j] = rng.NormFloat64()
				b[i] += rows[i][j] * x0[j]
			}
		}
		c := make([]float64, n)
		for j := range c {
			c[j] = rng.Float64() // c >= 0 keeps the problem bounded
		}
		sol, err := Solve(dense(rows, b, c), nil)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		A := mat.NewDense(m, n, nil)
		for i := range rows {
			A.SetRow(i, rows[i])
		}
		want, _, gerr := gonumlp.Simplex(c, A, b, 1e-10, nil)
		if gerr != nil {
			continue // gonum failed; nothing to compare
		}
		compared++
		if !near(sol.Obj, want, 1e-8) {
			t.Errorf("trial %d: objective %v, gonum %v", trial, sol.Obj, want)
		}
	}
	if compared < 150 {
		t.Errorf("only %d of 200 problems compared with gonum", compared)
	}
}

// Highly degenerate DEA-shaped problems terminate (the shape gonum cycles on).
func TestDegenerateDEAShape(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 7))
	n, mi, so := 100, 3, 2
	x := make([][]float64, n)
	y := make([][]float64, n)
	for j := 0; j < n; j++ {
		x[j] = make([]float64, mi)
		y[j] = make([]float64, so)
		for i := range x[j] {
			x[j][i] = float64(1 + rng.IntN(3)) // few distinct values: ties everywhere
		}
		for r := range y[j] {
			y[j][r] = float64(1 + rng.IntN(3))
		}
	}
	for o := 0; o < n; o++ {
		sol, err := Solve(deaProblem(x, y, o), nil)
		if err != nil {
			t.Fatalf("unit %d: %v", o, err)
		}
		if sol.Obj <= 0 || sol.Obj > 1+1e-9 {
			t.Errorf("unit %d: score %v outside (0,1]", o, sol.Obj)
		}
	}
}

func BenchmarkDEAShape1000(b *testing.B) {
	rng := rand.New(rand.NewPCG(3, 4))
	n, mi, so := 1000, 3, 2
	rows := mi + so + 1
	cols := 1 + n + mi + so
	a := make([]float64, rows*cols)
	for j := 0; j < n; j++ {
		c := a[(1+j)*rows : (2+j)*rows]
		for i := 0; i < mi+so; i++ {
			c[i] = 1 + 10*rng.Float64()
		}
		c[mi+so] = 1
	}
	for i := 0; i < mi; i++ {
		a[(1+n+i)*rows+i] = 1
	}
	for r := 0; r < so; r++ {
		a[(1+n+mi+r)*rows+mi+r] = -1
	}
	c := make([]float64, cols)
	c[0] = 1
	b.ResetTimer()
	for k := 0; k < b.N; k++ {
		o := k % n
		for i := 0; i < mi; i++ {
			a[i] = -a[(1+o)*rows+i]
		}
		bb := make([]float64, rows)
		copy(bb[mi:], a[(1+o)*rows+mi:(1+o)*rows+mi+so])
		bb[mi+so] = 1
		if _, err := Solve(&Problem{Rows: rows, A: a, B: bb, C: c}, nil); err != nil {
			b.Fatal(err)
		}
	}
}
