package oracle

import (
	"bytes"
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

func needGlpsol(t *testing.T) {
	t.Helper()
	if _, err := Available(); err != nil {
		t.Skip("glpsol not on PATH (install Debian package glpk-utils): ", err)
	}
}

// A two-variable LP solved by hand: min x + 2y s.t. x + y >= 2, x <= 1.5,
// so x = 1.5, y = 0.5, objective 2.5.
func TestSolveHandLP(t *testing.T) {
	needGlpsol(t)
	p := &Problem{Name: "hand"}
	x := p.AddVar(Var{Name: "x", Obj: 1})
	y := p.AddVar(Var{Name: "y", Obj: 2})
	p.AddRow(Row{Name: "c1", Terms: []Term{{1, x}, {1, y}}, Op: GE, RHS: 2})
	p.AddRow(Row{Name: "c2", Terms: []Term{{1, x}}, Op: LE, RHS: 1.5})
	for _, exact := range []bool{false, true} {
		s, err := Solve(context.Background(), p, Options{Exact: exact})
		if err != nil {
			t.Fatal(err)
		}
		if s.Status != Optimal || s.Objective != 2.5 || s.Values[0] != 1.5 || s.Values[1] != 0.5 {
			t.Errorf("exact=%v: got %+v, want optimal 2.5 at (1.5, 0.5)", exact, s)
		}
	}
}

func TestSolveInfeasibleAndUnbounded(t *testing.T) {
	needGlpsol(t)
	p := &Problem{Name: "infeasible"}
	x := p.AddVar(Var{Name: "x", Obj: 1})
	p.AddRow(Row{Terms: []Term{{1, x}}, Op: GE, RHS: 3})
	p.AddRow(Row{Terms: []Term{{1, x}}, Op: LE, RHS: 1})
	s, err := Solve(context.Background(), p, Options{})
	if err != nil || s.Status != Infeasible {
		t.Errorf("x >= 3, x <= 1: got %+v, %v; want infeasible", s, err)
	}
	q := &Problem{Name: "unbounded", Sense: Maximize}
	q.AddVar(Var{Name: "x", Obj: 1})
	q.AddRow(Row{Terms: []Term{{1, 0}}, Op: GE, RHS: 1})
	s, err = Solve(context.Background(), q, Options{})
	if err != nil || s.Status != Unbounded {
		t.Errorf("max x, x >= 1: got %+v, %v; want unbounded", s, err)
	}
}

func TestWriteLPRejectsNaN(t *testing.T) {
	p := &Problem{Name: "nan"}
	p.AddVar(Var{Name: "x", Obj: math.NaN()})
	if err := p.WriteLP(&bytes.Buffer{}); err == nil {
		t.Error("NaN objective coefficient accepted")
	}
}

func TestWriteLPText(t *testing.T) {
	p := &Problem{Name: "text", Sense: Maximize}
	a := p.AddVar(Var{Name: "a", Obj: 1, Free: true})
	b := p.AddVar(Var{Name: "b", HasLower: true, Lower: 0.5, HasUpper: true, Upper: 2})
	p.AddRow(Row{Name: "c", Terms: []Term{{-1e-4, a}, {1.5e7, b}}, Op: EQ, RHS: 3})
	var buf bytes.Buffer
	if err := p.WriteLP(&buf); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Maximize\n obj: 1 a + 0 b\n", " c: - 0.0001 a + 1.5e+07 b = 3\n", " a free\n", " 0.5 <= b <= 2\n"} {
		if !strings.Contains(buf.String(), want) {
			t.Errorf("LP text lacks %q:\n%s", want, buf.String())
		}
	}
}

func TestParseSolutionErrors(t *testing.T) {
	for _, in := range []string{"", "s bas 1 1 u u 0\n", "s bas 1 2 f f 0\n", "s bas 1 1 f f x\n"} {
		if _, err := ParseSolution([]byte(in), 1); err == nil {
			t.Errorf("ParseSolution(%q) accepted", in)
		}
	}
}

// Three single-input single-output units x = (2, 4, 4), y = (1, 2, 1).
// Worked by hand (common practice, CCR is the best ratio y/x = 0.5):
// CCR input scores 1, 1, 0.5; BCC input scores 1, 1, 0.5 (unit 2 uses
// unit 0 at x = 2 for y = 1); unit 1's super-efficiency under BCC input
// orientation is infeasible (no other unit makes y = 2), under CCR it is
// 1 (unit 0 on the same ray); unit 0's super-efficiency is 2 under BCC
// input orientation and infeasible under BCC output orientation.
func TestRadialHandExample(t *testing.T) {
	needGlpsol(t)
	X := [][]float64{{2}, {4}, {4}}
	Y := [][]float64{{1}, {2}, {1}}
	ctx := context.Background()
	cases := []struct {
		name  string
		o     int
		s     Spec
		want  float64
		infea bool
	}{
		{"CCR input u2", 2, CRS, 0.5, false},
		{"BCC input u2", 2, VRS, 0.5, false},
		{"BCC output u2 phi", 2, VRS.Orient(true), 2, false},
		{"CCR output u2 phi", 2, CRS.Orient(true), 2, false},
		{"NIRS input u1", 1, NIRS, 1, false},
		{"CCR super u1", 1, CRS.Super(), 1, false},
		{"BCC super u1", 1, VRS.Super(), 0, true},
		{"BCC super u0 (C at x = 4)", 0, VRS.Super(), 2, false},
		{"BCC output super u0 (no other unit has x <= 2)", 0, VRS.Orient(true).Super(), 0, true},
		{"NDRS super u0", 0, NDRS.Super(), 2, false},
		{"Bounded [0.5,1] input u2", 2, Bounded(0.5, 1), 0.5, false},
	}
	for _, c := range cases {
		for _, exact := range []bool{false, true} {
			r, err := SolveRadial(ctx, X, Y, c.o, c.s, Options{Exact: exact})
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			if c.infea {
				if r.Feasible {
					t.Errorf("%s: got %g, want infeasible", c.name, r.Value)
				}
				continue
			}
			if !r.Feasible || math.Abs(r.Value-c.want) > 1e-9 {
				t.Errorf("%s (exact=%v): got %+v, want %g", c.name, exact, r, c.want)
			}
		}
	}
}

// Two inputs, one output (y = 1 everywhere): A (1, 3), B (3, 1), C (3, 3).
// C is radially projected to (2, 2) = (A + B)/2: theta = 2/3, no slack.
// D (4, 1) is radially efficient against B only after a slack: theta = 1,
// input-1 slack 1. Hand-worked, common practice (weak efficiency).
func TestSecondStageHandExample(t *testing.T) {
	needGlpsol(t)
	X := [][]float64{{1, 3}, {3, 1}, {3, 3}, {4, 1}}
	Y := [][]float64{{1}, {1}, {1}, {1}}
	mx, _ := Means(X, Y) // (2.75, 2)
	ctx := context.Background()
	s, err := SolveSecondStage(ctx, X, Y, 2, CRS, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(s.Radial-2.0/3) > 1e-9 || math.Abs(s.Weighted) > 1e-9 {
		t.Errorf("unit C: got %+v, want theta 2/3 and no slack", s)
	}
	s, err = SolveSecondStage(ctx, X, Y, 3, VRS, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(s.Radial-1) > 1e-9 || math.Abs(s.Weighted-1/mx[0]) > 1e-8 || math.Abs(s.In[0]-1) > 1e-8 {
		t.Errorf("unit D: got %+v, want theta 1, input-1 slack 1, weighted %g", s, 1/mx[0])
	}
}

func TestEach(t *testing.T) {
	got := make([]int, 20)
	err := Each(context.Background(), 20, 3, func(_ context.Context, i int) error {
		got[i] = i * i
		if i == 7 {
			return errors.New("seven")
		}
		return nil
	})
	if err == nil || !strings.Contains(err.Error(), "seven") {
		t.Errorf("error lost: %v", err)
	}
	for i, v := range got {
		if v != i*i {
			t.Fatalf("job %d not run", i)
		}
	}
}

// The batched solves must give what one process per unit gives, on the
// a six-unit, two-input, two-output data set under five models.
func TestBatchMatchesSingle(t *testing.T) {
	needGlpsol(t)
	X := [][]float64{{1, 3}, {3, 1}, {3, 3}, {4, 1}, {2, 2}, {5, 4}}
	Y := [][]float64{{1, 2}, {1, 1}, {1, 3}, {1, 1}, {2, 1}, {3, 3}}
	ctx := context.Background()
	units := []int{0, 2, 3, 5}
	for _, s := range []Spec{CRS, VRS.Orient(true), NIRS, NDRS.Orient(true), Bounded(0.8, 1.2)} {
		rs, err := SolveRadialBatch(ctx, X, Y, units, s, Options{})
		if err != nil {
			t.Fatal(err)
		}
		vals := make([]float64, len(units))
		for k, o := range units {
			one, err := SolveRadial(ctx, X, Y, o, s, Options{})
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(one.Value-rs[k].Value) > 1e-9 {
				t.Errorf("%+v unit %d: batch %g, single %g", s, o, rs[k].Value, one.Value)
			}
			vals[k] = rs[k].Value
		}
		ss, err := SolveSlacksBatch(ctx, X, Y, units, s, vals, Options{})
		if err != nil {
			t.Fatal(err)
		}
		for k, o := range units {
			one, err := SolveSlacks(ctx, X, Y, o, s, vals[k], Options{})
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(one.Weighted-ss[k].Weighted) > 1e-9 {
				t.Errorf("%+v unit %d: batch weighted slack %g, single %g", s, o, ss[k].Weighted, one.Weighted)
			}
		}
	}
}
