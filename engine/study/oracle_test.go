package study

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// A small, plain writer of the variable-returns (BCC; Banker, Charnes &
// Cooper 1984) envelopment LPs in CPLEX LP text, solved by GLPK's glpsol
// (see /work/shared/CHECKS.md). It is independent of the engine's own
// formulation code and is used here only to check the demo data.

func needGlpsol(t *testing.T) string {
	t.Helper()
	path, err := exec.LookPath("glpsol")
	if err != nil {
		t.Skip("glpsol (Debian package glpk-utils) is not installed; the demo's frontier check needs it")
	}
	return path
}

var objectiveLine = regexp.MustCompile(`Objective:\s+\S+\s+=\s+(\S+)`)

// glpsolObjective solves one LP and returns its optimal objective.
func glpsolObjective(t *testing.T, glpsol, lp string) float64 {
	t.Helper()
	dir := t.TempDir()
	in, out := filepath.Join(dir, "m.lp"), filepath.Join(dir, "m.out")
	if err := os.WriteFile(in, []byte(lp), 0o600); err != nil {
		t.Fatal(err)
	}
	if msg, err := exec.Command(glpsol, "--lp", in, "-o", out).CombinedOutput(); err != nil {
		t.Fatalf("glpsol: %v\n%s", err, msg)
	}
	text, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(text), "OPTIMAL") {
		t.Fatalf("glpsol found no optimum:\n%s\nfor\n%s", text, lp)
	}
	m := objectiveLine.FindSubmatch(text)
	if m == nil {
		t.Fatalf("no objective in glpsol output:\n%s", text)
	}
	v, err := strconv.ParseFloat(string(m[1]), 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// vrsLP writes unit o's radial variable-returns LP. Input orientation:
// min theta s.t. sum_j l_j x_ij <= theta x_io, sum_j l_j y_rj >= y_ro,
// sum_j l_j = 1, l >= 0. Output orientation: max phi s.t.
// sum_j l_j x_ij <= x_io, sum_j l_j y_rj >= phi y_ro, sum_j l_j = 1.
func vrsLP(x, y [][]float64, o int, inputOriented bool) string {
	var b strings.Builder
	if inputOriented {
		b.WriteString("Minimize\n obj: f\nSubject To\n")
	} else {
		b.WriteString("Maximize\n obj: f\nSubject To\n")
	}
	for i := range x[o] {
		fmt.Fprintf(&b, " in%d:", i)
		for j := range x {
			fmt.Fprintf(&b, " + %.17g l%d", x[j][i], j)
		}
		if inputOriented {
			fmt.Fprintf(&b, " - %.17g f <= 0\n", x[o][i])
		} else {
			fmt.Fprintf(&b, " <= %.17g\n", x[o][i])
		}
	}
	for r := range y[o] {
		fmt.Fprintf(&b, " out%d:", r)
		for j := range y {
			fmt.Fprintf(&b, " + %.17g l%d", y[j][r], j)
		}
		if inputOriented {
			fmt.Fprintf(&b, " >= %.17g\n", y[o][r])
		} else {
			fmt.Fprintf(&b, " - %.17g f >= 0\n", y[o][r])
		}
	}
	b.WriteString(" sum:")
	for j := range x {
		fmt.Fprintf(&b, " + l%d", j)
	}
	b.WriteString(" = 1\nBounds\n f free\nEnd\n")
	return b.String()
}

// vrsSlackLP writes the second stage for a unit whose radial score is 1:
// the largest total of slacks, each divided by the unit's own value, that
// the unit's own inputs and outputs leave; zero means fully efficient.
func vrsSlackLP(x, y [][]float64, o int) string {
	var b strings.Builder
	b.WriteString("Maximize\n obj:")
	for i := range x[o] {
		fmt.Fprintf(&b, " + %.17g si%d", 1/x[o][i], i)
	}
	for r := range y[o] {
		if y[o][r] > 0 {
			fmt.Fprintf(&b, " + %.17g so%d", 1/y[o][r], r)
		} else {
			fmt.Fprintf(&b, " + so%d", r)
		}
	}
	b.WriteString("\nSubject To\n")
	for i := range x[o] {
		fmt.Fprintf(&b, " in%d:", i)
		for j := range x {
			fmt.Fprintf(&b, " + %.17g l%d", x[j][i], j)
		}
		fmt.Fprintf(&b, " + si%d = %.17g\n", i, x[o][i])
	}
	for r := range y[o] {
		fmt.Fprintf(&b, " out%d:", r)
		for j := range y {
			fmt.Fprintf(&b, " + %.17g l%d", y[j][r], j)
		}
		fmt.Fprintf(&b, " - so%d = %.17g\n", r, y[o][r])
	}
	b.WriteString(" sum:")
	for j := range x {
		fmt.Fprintf(&b, " + l%d", j)
	}
	b.WriteString(" = 1\nEnd\n")
	return b.String()
}

// vrsFrontier returns the units with a variable-returns score of 1 in the
// given orientation, and those among them that also have no slack.
func vrsFrontier(t *testing.T, x, y [][]float64, inputOriented bool) (scoreOne, efficient []int) {
	glpsol := needGlpsol(t)
	for o := range x {
		f := glpsolObjective(t, glpsol, vrsLP(x, y, o, inputOriented))
		if f < 1-1e-9 || f > 1+1e-9 {
			continue
		}
		scoreOne = append(scoreOne, o)
		if glpsolObjective(t, glpsol, vrsSlackLP(x, y, o)) <= 1e-9 {
			efficient = append(efficient, o)
		}
	}
	return scoreOne, efficient
}
