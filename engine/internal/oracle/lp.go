package oracle

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
)

// Sense is the direction of optimisation.
type Sense int

const (
	Minimize Sense = iota
	Maximize
)

// Op is the relation of a constraint row.
type Op string

const (
	LE Op = "<="
	GE Op = ">="
	EQ Op = "="
)

// Term is coefficient * variable.
type Term struct {
	Coef float64
	Var  int // index into Problem.Vars
}

// Row is one constraint: sum of Terms Op RHS.
type Row struct {
	Name  string
	Terms []Term
	Op    Op
	RHS   float64
}

// Var is one column. Its default bounds are [0, +Inf); Free makes it
// (-Inf, +Inf); Lower and Upper override when HasLower / HasUpper are set.
type Var struct {
	Name     string
	Obj      float64
	Free     bool
	HasLower bool
	Lower    float64
	HasUpper bool
	Upper    float64
}

// Problem is a linear program in plain form.
type Problem struct {
	Name  string
	Sense Sense
	Vars  []Var
	Rows  []Row
}

// AddVar appends a column and returns its index.
func (p *Problem) AddVar(v Var) int {
	p.Vars = append(p.Vars, v)
	return len(p.Vars) - 1
}

// AddRow appends a constraint.
func (p *Problem) AddRow(r Row) { p.Rows = append(p.Rows, r) }

func num(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// WriteLP writes p in CPLEX LP format as glpsol reads it. Every variable is
// listed in the objective (with a zero coefficient where it has none) so
// that glpsol numbers the columns in the order of p.Vars.
func (p *Problem) WriteLP(w io.Writer) error {
	for _, v := range p.Vars {
		if math.IsNaN(v.Obj) || math.IsInf(v.Obj, 0) {
			return fmt.Errorf("oracle: objective coefficient of %s is %g", v.Name, v.Obj)
		}
	}
	for _, r := range p.Rows {
		if math.IsNaN(r.RHS) || math.IsInf(r.RHS, 0) {
			return fmt.Errorf("oracle: right-hand side of row %s is %g", r.Name, r.RHS)
		}
		for _, t := range r.Terms {
			if math.IsNaN(t.Coef) || math.IsInf(t.Coef, 0) {
				return fmt.Errorf("oracle: coefficient of %s in row %s is %g", p.Vars[t.Var].Name, r.Name, t.Coef)
			}
		}
	}
	if len(p.Vars) == 0 {
		return fmt.Errorf("oracle: problem %q has no variables", p.Name)
	}
	b := bufio.NewWriter(w)
	fmt.Fprintf(b, "\\ %s\n", p.Name)
	if p.Sense == Maximize {
		b.WriteString("Maximize\n obj:")
	} else {
		b.WriteString("Minimize\n obj:")
	}
	for i, v := range p.Vars {
		writeTerm(b, v.Obj, v.Name, i == 0)
	}
	b.WriteString("\nSubject To\n")
	for i, r := range p.Rows {
		name := r.Name
		if name == "" {
			name = "r" + strconv.Itoa(i)
		}
		fmt.Fprintf(b, " %s:", name)
		if len(r.Terms) == 0 {
			// A row without terms still needs a variable; 0 * first column.
			writeTerm(b, 0, p.Vars[0].Name, true)
		}
		for k, t := range r.Terms {
			writeTerm(b, t.Coef, p.Vars[t.Var].Name, k == 0)
		}
		fmt.Fprintf(b, " %s %s\n", r.Op, num(r.RHS))
	}
	b.WriteString("Bounds\n")
	for _, v := range p.Vars {
		switch {
		case v.Free:
			fmt.Fprintf(b, " %s free\n", v.Name)
		case v.HasLower && v.HasUpper:
			fmt.Fprintf(b, " %s <= %s <= %s\n", num(v.Lower), v.Name, num(v.Upper))
		case v.HasLower:
			fmt.Fprintf(b, " %s >= %s\n", v.Name, num(v.Lower))
		case v.HasUpper:
			fmt.Fprintf(b, " %s <= %s\n", v.Name, num(v.Upper))
		}
	}
	b.WriteString("End\n")
	return b.Flush()
}

func writeTerm(b *bufio.Writer, c float64, name string, first bool) {
	switch {
	case c < 0:
		fmt.Fprintf(b, " - %s %s", num(-c), name)
	case first:
		fmt.Fprintf(b, " %s %s", num(c), name)
	default:
		fmt.Fprintf(b, " + %s %s", num(c), name)
	}
}
