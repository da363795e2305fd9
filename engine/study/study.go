package study

import (
	"errors"
	"fmt"
	"math"

	"peerlens/engine/dea"
)

// Role says how a measure takes part in the models.
type Role string

const (
	Input  Role = "input"  // a resource the unit uses; less is better
	Output Role = "output" // something the unit produces; more is better
	Unused Role = "unused" // kept in the study and shown, but not given to the models
)

// Measure is one numeric column of the study.
type Measure struct {
	Name string
	Role Role
	// RoleGuessed is true while the role is the one FromTable guessed from
	// the column's header; the page says so until the user confirms it.
	RoleGuessed bool
	// Controllable is false for a measure the unit's managers cannot change
	// (non-discretionary). Kept in the file; not yet used by the models.
	Controllable bool
	// Desirable is false for an output the unit should produce less of
	// (for example complaints). Kept in the file; not yet used by the models.
	Desirable bool
}

// NewMeasure returns a measure with the given name and role that is
// controllable and desirable, which is what most measures are.
func NewMeasure(name string, role Role) Measure {
	return Measure{Name: name, Role: role, Controllable: true, Desirable: true}
}

// Text is a column of the user's table that is not a number. It is kept,
// shown and saved with the study so nothing the user pasted is dropped, but
// the models never see it.
type Text struct {
	Name  string
	Cells []string // one per unit, in the order of Study.Units
}

// FormatVersion is the version of the study file this package writes and
// the newest it reads.
const FormatVersion = 1

// Study is everything needed to run and re-run an analysis: the units, the
// measures with their roles, the numbers, who is left out and the model
// settings. Its file form is JSON (see Read and Write).
type Study struct {
	// Format is the study file version. Read sets it to the version of the
	// file; Write always writes FormatVersion.
	Format   int
	Title    string
	Units    []string  // unit names, one per row of Values
	Measures []Measure // one per column of Values
	// Values[unit][measure]; NaN marks a missing value.
	Values [][]float64
	// Extra holds the table's text columns, kept but not used.
	Extra []Text
	// LeftOut names the units kept in the study but left out of the run.
	LeftOut  []string
	Settings dea.Model
	Notes    string
}

// Included returns the indices into s.Units of the units that take part in
// a run, in order; Data's units are exactly these, in the same order.
func (s *Study) Included() []int {
	out := make(map[string]bool, len(s.LeftOut))
	for _, name := range s.LeftOut {
		out[name] = true
	}
	idx := make([]int, 0, len(s.Units))
	for i, name := range s.Units {
		if !out[name] {
			idx = append(idx, i)
		}
	}
	return idx
}

// ErrCannotRun is returned by Data when validation found an error; the
// issues say what to fix.
var ErrCannotRun = errors.New("study: the study cannot run yet")

// Data returns the inputs and outputs of the included units (see Included
// for the map back to s.Units), with every issue Validate finds. When any
// issue is an error, the Data is empty and the error wraps ErrCannotRun
// and repeats the first error's message.
func (s *Study) Data() (dea.Data, []Issue, error) {
	issues := Validate(s)
	errs := 0
	var first *Issue
	for i := range issues {
		if issues[i].Severity == Error {
			if first == nil {
				first = &issues[i]
			}
			errs++
		}
	}
	if first != nil {
		more := ""
		if errs > 1 {
			more = fmt.Sprintf(" (and %d more %s)", errs-1, verb(errs-1, "problem", "problems"))
		}
		return dea.Data{}, issues, fmt.Errorf("%w: %s%s", ErrCannotRun, first.Message, more)
	}
	var d dea.Data
	var in, out []int
	for j, m := range s.Measures {
		switch m.Role {
		case Input:
			in = append(in, j)
			d.InputNames = append(d.InputNames, m.Name)
		case Output:
			out = append(out, j)
			d.OutputNames = append(d.OutputNames, m.Name)
		}
	}
	for _, i := range s.Included() {
		d.Units = append(d.Units, s.Units[i])
		d.X = append(d.X, pick(s.Values[i], in))
		d.Y = append(d.Y, pick(s.Values[i], out))
	}
	return d, issues, nil
}

func pick(row []float64, cols []int) []float64 {
	v := make([]float64, len(cols))
	for k, j := range cols {
		v[k] = row[j]
	}
	return v
}

// missing reports whether v marks a missing value.
func missing(v float64) bool { return math.IsNaN(v) }
