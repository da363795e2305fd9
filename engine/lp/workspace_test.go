package lp

import (
	"math"
	"math/rand/v2"
	"testing"
)

// randomDEA builds a variable-returns, input-oriented DEA program (the shape
// this package is for) over n random units with m inputs and s outputs, for
// unit o (see deaProblem).
func randomDEA(rng *rand.Rand, n, m, s, o int) *Problem {
	x := make([][]float64, n)
	y := make([][]float64, n)
	for j := range x {
		x[j], y[j] = make([]float64, m), make([]float64, s)
		for i := range x[j] {
			x[j][i] = 1 + 9*rng.Float64()
		}
		for r := range y[j] {
			y[j][r] = 1 + 9*rng.Float64()
		}
	}
	return deaProblem(x, y, o)
}

// deaProblem is the variable-returns, input-oriented envelopment program of
// unit o over units with inputs x[j] and outputs y[j]: columns theta,
// lambda_1..n, the input slacks, the output slacks; rows the inputs, the
// outputs and the convexity row.
func deaProblem(x, y [][]float64, o int) *Problem {
	n, m, s := len(x), len(x[0]), len(y[0])
	rows := m + s + 1
	cols := 1 + n + m + s
	a := make([]float64, rows*cols)
	for i := 0; i < m; i++ {
		a[i] = -x[o][i]
	}
	for j := 0; j < n; j++ {
		col := a[(1+j)*rows : (2+j)*rows]
		copy(col, x[j])
		copy(col[m:], y[j])
		col[m+s] = 1
	}
	for i := 0; i < m; i++ {
		a[(1+n+i)*rows+i] = 1
	}
	for r := 0; r < s; r++ {
		a[(1+n+m+r)*rows+m+r] = -1
	}
	b := make([]float64, rows)
	copy(b[m:], y[o])
	b[m+s] = 1
	c := make([]float64, cols)
	c[0] = 1
	return &Problem{Rows: rows, A: a, B: b, C: c}
}

// A workspace reused over programs of different shapes gives the answers of
// fresh solves, also without scaling and from phase 1 (where partial pricing
// runs past the structural columns into the artificial ones). Source: the
// method itself (a workspace only keeps buffers).
func TestWorkspaceMatchesFreshSolves(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	var w Workspace
	for k := 0; k < 60; k++ {
		n := 20 + rng.IntN(400)
		p := randomDEA(rng, n, 1+rng.IntN(3), 1+rng.IntN(3), rng.IntN(n))
		opt := &Options{NoScale: k%2 == 0}
		want, err := Solve(p, opt)
		if err != nil {
			t.Fatalf("program %d: %v", k, err)
		}
		got, err := w.Solve(p, opt)
		if err != nil {
			t.Fatalf("program %d, workspace: %v", k, err)
		}
		if math.Abs(got.Obj-want.Obj) > 1e-9 {
			t.Errorf("program %d: workspace objective %v, fresh %v", k, got.Obj, want.Obj)
		}
		if got.Obj > 1+1e-9 || got.Obj <= 0 {
			t.Errorf("program %d: score %v outside (0, 1]", k, got.Obj)
		}
	}
}

// With a cutoff the solver stops at a feasible point below it, or finishes
// at the optimum when the optimum is not below it. Source: the option's
// definition.
func TestCutoff(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for k := 0; k < 40; k++ {
		n := 50 + rng.IntN(200)
		p := randomDEA(rng, n, 3, 2, rng.IntN(n))
		full, err := Solve(p, &Options{NoScale: true})
		if err != nil {
			t.Fatal(err)
		}
		const cut = 1 - 1e-6
		got, err := Solve(p, &Options{NoScale: true, HasCutoff: true, Cutoff: cut, NoReducedCosts: true})
		if err != nil {
			t.Fatal(err)
		}
		switch {
		case full.Obj < cut && !(got.Stopped && got.Obj < cut && got.Obj >= full.Obj-1e-9):
			t.Errorf("program %d: optimum %v below the cutoff, but stopped=%v at %v", k, full.Obj, got.Stopped, got.Obj)
		case full.Obj >= cut && (got.Stopped || math.Abs(got.Obj-full.Obj) > 1e-9):
			t.Errorf("program %d: optimum %v not below the cutoff, but stopped=%v at %v", k, full.Obj, got.Stopped, got.Obj)
		}
		if len(got.D) != 0 {
			t.Errorf("program %d: reduced costs computed although not asked for", k)
		}
	}
}
