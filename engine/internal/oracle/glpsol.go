package oracle

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
)

// Status is glpsol's verdict on a problem.
type Status string

const (
	Optimal    Status = "optimal"
	Infeasible Status = "infeasible" // no primal feasible solution exists
	Unbounded  Status = "unbounded"  // feasible, objective unbounded
)

// Solution is what glpsol reported.
type Solution struct {
	Status    Status
	Objective float64
	Values    []float64 // column values, in the order of Problem.Vars
}

// Options tune one glpsol run.
type Options struct {
	// Exact asks for rational arithmetic (--exact): slow, for small problems.
	Exact bool
	// TimeLimit in seconds (--tmlim); 0 means 60.
	TimeLimit int
	// KeepDir, when set, keeps the LP and solution files there (for reading
	// a disagreement by hand) instead of a temporary directory.
	KeepDir string
}

// ErrNoGlpsol is returned by Available when glpsol is not on PATH.
var ErrNoGlpsol = errors.New("oracle: glpsol (GLPK, Debian package glpk-utils) is not on PATH")

// Available returns the path of glpsol, or ErrNoGlpsol.
func Available() (string, error) {
	p, err := exec.LookPath("glpsol")
	if err != nil {
		return "", ErrNoGlpsol
	}
	return p, nil
}

// Solve writes p to a file, runs glpsol on it and reads the solution back.
// Statuses other than optimal, infeasible and unbounded (time limit reached,
// undefined) are errors that quote glpsol's own words.
func Solve(ctx context.Context, p *Problem, o Options) (*Solution, error) {
	bin, err := Available()
	if err != nil {
		return nil, err
	}
	dir := o.KeepDir
	if dir == "" {
		dir, err = os.MkdirTemp("", "oracle-lp-")
		if err != nil {
			return nil, fmt.Errorf("oracle: %w", err)
		}
		defer os.RemoveAll(dir)
	} else if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("oracle: %w", err)
	}
	base := p.Name
	if base == "" {
		base = "problem"
	}
	lpPath := filepath.Join(dir, base+".lp")
	solPath := filepath.Join(dir, base+".sol")
	var lp bytes.Buffer
	if err := p.WriteLP(&lp); err != nil {
		return nil, err
	}
	if err := os.WriteFile(lpPath, lp.Bytes(), 0o644); err != nil {
		return nil, fmt.Errorf("oracle: %w", err)
	}
	tl := o.TimeLimit
	if tl <= 0 {
		tl = 60
	}
	args := []string{"--lp", lpPath, "--nopresol", "--tmlim", strconv.Itoa(tl), "-w", solPath}
	if o.Exact {
		args = append(args, "--exact")
	}
	cmd := exec.CommandContext(ctx, bin, args...)
	out, err := cmd.CombinedOutput()
	if err != nil {
		return nil, fmt.Errorf("oracle: glpsol on %s failed: %v\n%s", base, err, tail(out))
	}
	sol, err := os.ReadFile(solPath)
	if err != nil {
		return nil, fmt.Errorf("oracle: glpsol wrote no solution for %s: %v\n%s", base, err, tail(out))
	}
	s, err := ParseSolution(sol, len(p.Vars))
	if err != nil {
		return nil, fmt.Errorf("oracle: %s: %w\n%s", base, err, tail(out))
	}
	return s, nil
}

// tail keeps the last lines of glpsol's log for an error message.
func tail(b []byte) string {
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	if len(lines) > 8 {
		lines = lines[len(lines)-8:]
	}
	return strings.Join(lines, "\n")
}

// ParseSolution reads glpsol's plain-text basic solution (-w): the line
// "s bas ROWS COLS PRIM DUAL OBJ" and one "j COL STATUS VALUE DUAL" line per
// column. PRIM and DUAL are f (feasible), i (infeasible), n (no feasible
// solution exists) or u (undefined).
func ParseSolution(b []byte, cols int) (*Solution, error) {
	var s *Solution
	sc := bufio.NewScanner(bytes.NewReader(b))
	sc.Buffer(make([]byte, 1<<16), 1<<24)
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) == 0 {
			continue
		}
		switch f[0] {
		case "s":
			if len(f) != 7 || f[1] != "bas" {
				return nil, fmt.Errorf("unexpected solution line %q", sc.Text())
			}
			n, err := strconv.Atoi(f[3])
			if err != nil || n != cols {
				return nil, fmt.Errorf("solution has %s columns, problem has %d", f[3], cols)
			}
			obj, err := strconv.ParseFloat(f[6], 64)
			if err != nil {
				return nil, fmt.Errorf("bad objective %q", f[6])
			}
			s = &Solution{Objective: obj, Values: make([]float64, cols)}
			switch prim, dual := f[4], f[5]; {
			case prim == "n":
				s.Status = Infeasible
			case prim == "f" && dual == "f":
				s.Status = Optimal
			case prim == "f" && dual == "n":
				s.Status = Unbounded
			default:
				return nil, fmt.Errorf("glpsol stopped without a verdict (primal status %q, dual status %q; time limit?)", prim, dual)
			}
		case "j":
			if s == nil || len(f) < 4 {
				return nil, fmt.Errorf("unexpected column line %q", sc.Text())
			}
			k, err := strconv.Atoi(f[1])
			if err != nil || k < 1 || k > cols {
				return nil, fmt.Errorf("bad column number in %q", sc.Text())
			}
			v, err := strconv.ParseFloat(f[3], 64)
			if err != nil {
				return nil, fmt.Errorf("bad column value in %q", sc.Text())
			}
			s.Values[k-1] = v
		}
	}
	if err := sc.Err(); err != nil {
		return nil, err
	}
	if s == nil {
		return nil, errors.New("no solution line in glpsol output")
	}
	return s, nil
}
