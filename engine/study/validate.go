package study

import (
	"encoding/binary"
	"fmt"
	"math"
	"strings"

	"peerlens/engine/dea"
)

// Severity says how much an Issue matters.
type Severity string

const (
	Error   Severity = "error"   // the study cannot run until this is fixed
	Warning Severity = "warning" // the study runs, but the results may mislead
	Note    Severity = "note"    // worth knowing; nothing to fix
)

// Codes of the issues Validate reports. They are stable: the page and the
// tests key on them; the messages may change.
const (
	CodeShape          = "shape"            // Values does not match Units and Measures
	CodeNoUnits        = "no-units"         // no unit is included
	CodeNoInput        = "no-input"         // no measure has the input role
	CodeNoOutput       = "no-output"        // no measure has the output role
	CodeEmptyName      = "empty-name"       // a unit without a name
	CodeDuplicateName  = "duplicate-name"   // two units with one name
	CodeMeasureName    = "measure-name"     // a measure without a name, or two with one name
	CodeUnknownLeftOut = "unknown-left-out" // LeftOut names a unit that is not in the study
	CodeLeftOut        = "left-out"         // the units left out of the run
	CodeMissing        = "missing"          // a missing value in a used cell
	CodeNotFinite      = "not-finite"       // an infinite value
	CodeNegative       = "negative"         // a negative value
	CodeNoPositiveIn   = "no-positive-input"
	CodeNoPositiveOut  = "no-positive-output"
	CodeZeroInput      = "zero-input"
	CodeZeroOutput     = "zero-output"
	CodeConstant       = "constant-measure"
	CodeDuplicateMeas  = "duplicate-measure" // identical or proportional columns
	CodeIdenticalUnits = "identical-units"
	CodeSampleSize     = "sample-size"
	CodeMagnitudes     = "magnitudes"
	CodeSettings       = "settings"
	CodeNotYetUsed     = "not-yet-used" // non-discretionary or undesirable marks the models ignore so far
)

// Issue is one thing Validate found, in plain words, with the units and
// measures it concerns (0-based indices into Study.Units and
// Study.Measures) so the page can mark the cells.
type Issue struct {
	Severity Severity
	Code     string
	Message  string
	Units    []int
	Measures []int
}

// MagnitudeSpread is the largest ratio between the typical sizes of two
// measures that Validate accepts without a warning (six orders of magnitude).
const MagnitudeSpread = 1e6

// Validate checks a study before it runs and reports every issue, errors
// first in the order the user would fix them. Only the included units and
// the input and output measures are checked for numbers: a missing value in
// an unused measure or a left-out unit is no problem.
func Validate(s *Study) []Issue {
	v := validator{s: s}
	v.run()
	return v.issues
}

type validator struct {
	s      *Study
	issues []Issue
	units  []int // included units
	in     []int // input measures
	out    []int // output measures
}

func (v *validator) add(sev Severity, code string, units, measures []int, format string, args ...any) {
	v.issues = append(v.issues, Issue{Severity: sev, Code: code, Message: fmt.Sprintf(format, args...), Units: units, Measures: measures})
}

func (v *validator) unit(i int) string    { return fmt.Sprintf("%q", v.s.Units[i]) }
func (v *validator) measure(j int) string { return fmt.Sprintf("%q", v.s.Measures[j].Name) }

func (v *validator) run() {
	s := v.s
	if !v.shape() {
		return
	}
	v.names()
	if err := s.Settings.Validate(); err != nil {
		v.add(Error, CodeSettings, nil, nil, "The model settings cannot be used: %v.", strings.TrimPrefix(err.Error(), "dea: "))
	}
	v.units = s.Included()
	for j, m := range s.Measures {
		switch m.Role {
		case Input:
			v.in = append(v.in, j)
		case Output:
			v.out = append(v.out, j)
		}
		if (m.Role == Input || m.Role == Output) && (!m.Controllable || !m.Desirable) {
			v.add(Note, CodeNotYetUsed, nil, []int{j}, "%s is marked as %s; this version of Peerlens does not use that mark yet and treats it as an ordinary %s.",
				v.measure(j), map[bool]string{true: "undesirable", false: "outside the managers' control"}[!m.Desirable], m.Role)
		}
	}
	if len(v.units) == 0 {
		v.add(Error, CodeNoUnits, nil, nil, "No unit is included: add units or bring left-out units back in.")
	}
	if len(v.in) == 0 {
		v.add(Error, CodeNoInput, nil, nil, "No measure is an input: mark at least one measure as an input (something the units use).")
	}
	if len(v.out) == 0 {
		v.add(Error, CodeNoOutput, nil, nil, "No measure is an output: mark at least one measure as an output (something the units produce).")
	}
	v.cells()
	v.positive()
	v.zeros()
	v.columns()
	v.identicalUnits()
	v.sampleSize()
	v.magnitudes()
	v.leftOut()
	sortBySeverity(v.issues)
}

// shape reports a Study whose slices do not fit together; nothing else can
// be checked then.
func (v *validator) shape() bool {
	s := v.s
	if len(s.Values) != len(s.Units) {
		v.add(Error, CodeShape, nil, nil, "The study has %d units but %d rows of values.", len(s.Units), len(s.Values))
		return false
	}
	ok := true
	for i, row := range s.Values {
		if len(row) != len(s.Measures) {
			v.add(Error, CodeShape, []int{i}, nil, "Unit %q has %d values but the study has %d measures.", s.Units[i], len(row), len(s.Measures))
			ok = false
		}
	}
	return ok
}

func (v *validator) names() {
	s := v.s
	seen := map[string][]int{}
	var order []string
	for i, name := range s.Units {
		if strings.TrimSpace(name) == "" {
			v.add(Error, CodeEmptyName, []int{i}, nil, "The unit in row %d has no name: give every unit a name.", i+1)
			continue
		}
		if seen[name] == nil {
			order = append(order, name)
		}
		seen[name] = append(seen[name], i)
	}
	for _, name := range order {
		if rows := seen[name]; len(rows) > 1 {
			v.add(Error, CodeDuplicateName, rows, nil, "Rows %s are all called %q: unit names must be different.", rowList(rows), name)
		}
	}
	known := map[string]bool{}
	for _, name := range s.Units {
		known[name] = true
	}
	for _, name := range s.LeftOut {
		if !known[name] {
			v.add(Error, CodeUnknownLeftOut, nil, nil, "%q is listed as left out but no unit has that name.", name)
		}
	}
	mseen := map[string][]int{}
	var morder []string
	for j, m := range s.Measures {
		if strings.TrimSpace(m.Name) == "" {
			v.add(Error, CodeMeasureName, nil, []int{j}, "Measure %d has no name: give every measure a name.", j+1)
			continue
		}
		if mseen[m.Name] == nil {
			morder = append(morder, m.Name)
		}
		mseen[m.Name] = append(mseen[m.Name], j)
	}
	for _, name := range morder {
		if cols := mseen[name]; len(cols) > 1 {
			v.add(Error, CodeMeasureName, nil, cols, "Measures %s are all called %q: measure names must be different.", rowList(cols), name)
		}
	}
}

// used returns the input and output measures.
func (v *validator) used() []int { return append(append([]int(nil), v.in...), v.out...) }

func (v *validator) cells() {
	for _, i := range v.units {
		for _, j := range v.used() {
			x := v.s.Values[i][j]
			switch {
			case missing(x):
				v.add(Error, CodeMissing, []int{i}, []int{j}, "%s has no value for %s: fill it in or leave the unit out.", v.unit(i), v.measure(j))
			case math.IsInf(x, 0):
				v.add(Error, CodeNotFinite, []int{i}, []int{j}, "%s has an infinite value for %s: enter a finite number or leave the unit out.", v.unit(i), v.measure(j))
			case x < 0:
				v.add(Error, CodeNegative, []int{i}, []int{j}, "%s has a negative value (%g) for %s. The radial models need values of zero or more. Peerlens does not shift data silently: change the measure (for example add the same amount to every unit) or leave the unit out.",
					v.unit(i), x, v.measure(j))
			}
		}
	}
}

// positive checks that each unit uses some input and produces some output.
func (v *validator) positive() {
	side := func(cols []int, code, what string) {
		if len(cols) == 0 {
			return
		}
		for _, i := range v.units {
			pos, gap := false, false
			for _, j := range cols {
				x := v.s.Values[i][j]
				pos = pos || x > 0
				gap = gap || !finite(x) || x < 0 // already reported per cell
			}
			if !pos && !gap {
				v.add(Error, code, []int{i}, cols, "%s has no %s above zero: every unit needs a positive value in at least one %s.", v.unit(i), what, what)
			}
		}
	}
	side(v.in, CodeNoPositiveIn, "input")
	side(v.out, CodeNoPositiveOut, "output")
}

// zeros reports zero values, one issue per measure.
func (v *validator) zeros() {
	for _, j := range v.used() {
		var units []int
		for _, i := range v.units {
			if v.s.Values[i][j] == 0 {
				units = append(units, i)
			}
		}
		if len(units) == 0 {
			continue
		}
		names := v.unitList(units)
		if v.s.Measures[j].Role == Input {
			v.add(Warning, CodeZeroInput, units, []int{j}, "%s %s zero for the input %s. A unit that uses none of an input can look efficient on that account alone; check that zero is really meant.",
				names, verb(len(units), "has", "have"), v.measure(j))
		} else {
			v.add(Note, CodeZeroOutput, units, []int{j}, "%s %s zero for the output %s. That is allowed: the models compare such units on their other outputs.",
				names, verb(len(units), "has", "have"), v.measure(j))
		}
	}
}

// complete reports whether column j has a finite value for every included unit.
func (v *validator) complete(j int) bool {
	for _, i := range v.units {
		if !finite(v.s.Values[i][j]) {
			return false
		}
	}
	return true
}

// columns reports constant measures and measures that repeat another.
func (v *validator) columns() {
	if len(v.units) < 2 {
		return
	}
	used := v.used()
	for _, j := range used {
		if !v.complete(j) {
			continue
		}
		first := v.s.Values[v.units[0]][j]
		constant := true
		for _, i := range v.units {
			constant = constant && v.s.Values[i][j] == first
		}
		if !constant {
			continue
		}
		m := v.s.Measures[j]
		var effect string
		if (m.Role == Input) == (v.s.Settings.Orientation == dea.Input) {
			// The radial factor scales this measure too, and no combination of
			// units has less (more) of it: under variable returns the factor
			// cannot move, so every unit scores 1.
			effect = fmt.Sprintf("Because the model scales it with the other %ss and no combination of units does better on it, under variable returns every unit scores 1, and under other returns assumptions it limits the total peer weight", m.Role)
		} else {
			// A constant input c gives sum(lambda)*c <= c; a constant output
			// gives sum(lambda)*c >= c.
			bound := "at most"
			if m.Role == Output {
				bound = "at least"
			}
			effect = fmt.Sprintf("It only limits the total peer weight to %s 1: under variable returns it adds nothing, and under constant returns it changes the returns assumption", bound)
		}
		v.add(Warning, CodeConstant, nil, []int{j}, "%s has the same value (%g) for every included unit, so it does not tell units apart. %s. Consider leaving it out.",
			v.measure(j), first, effect)
	}
	for a := 0; a < len(used); a++ {
		for b := a + 1; b < len(used); b++ {
			j, k := used[a], used[b]
			if !v.complete(j) || !v.complete(k) {
				continue
			}
			if ratio, ok := v.proportional(j, k); ok {
				how := "is the same as"
				if ratio != 1 {
					how = fmt.Sprintf("is exactly %g times", ratio)
				}
				v.add(Warning, CodeDuplicateMeas, nil, []int{j, k}, "%s %s %s for every included unit, so one of them adds nothing; consider leaving one out.",
					v.measure(k), how, v.measure(j))
			}
		}
	}
}

// proportional reports whether column k is a fixed multiple of column j
// (within a relative 1e-12) over the included units, and the multiple.
func (v *validator) proportional(j, k int) (float64, bool) {
	ratio, set := 0.0, false
	for _, i := range v.units {
		x, y := v.s.Values[i][j], v.s.Values[i][k]
		if x == 0 || y == 0 {
			if x != y {
				return 0, false
			}
			continue
		}
		r := y / x
		if !set {
			ratio, set = r, true
		} else if math.Abs(r-ratio) > 1e-12*math.Abs(ratio) {
			return 0, false
		}
	}
	return ratio, set
}

func (v *validator) identicalUnits() {
	used := v.used()
	if len(used) == 0 {
		return
	}
	groups := map[string][]int{}
	var order []string
	key := make([]byte, 8*len(used))
	for _, i := range v.units {
		// The key is the values' bits: equal exactly when the values are
		// (0 and -0 apart), without formatting numbers.
		nan := false
		for q, j := range used {
			x := v.s.Values[i][j]
			nan = nan || math.IsNaN(x)
			binary.LittleEndian.PutUint64(key[8*q:], math.Float64bits(x))
		}
		if nan {
			continue
		}
		k := string(key)
		if groups[k] == nil {
			order = append(order, k)
		}
		groups[k] = append(groups[k], i)
	}
	for _, k := range order {
		if g := groups[k]; len(g) > 1 {
			v.add(Warning, CodeIdenticalUnits, g, used, "%s have the same value on every input and output: they share their place on (or below) the frontier, and each can be the other's peer.",
				v.unitList(g))
		}
	}
}

// sampleSize applies the rule of thumb n >= max(m*s, 3(m+s)) of Cooper,
// Seiford & Tone (2007), Data Envelopment Analysis: A Comprehensive Text,
// 2nd ed., Springer, section 4.
func (v *validator) sampleSize() {
	m, s, n := len(v.in), len(v.out), len(v.units)
	if m == 0 || s == 0 || n == 0 {
		return
	}
	need := max(m*s, 3*(m+s))
	if n < need {
		v.add(Warning, CodeSampleSize, nil, nil, "%d %s for %d %s and %d %s is few: a common rule of thumb (Cooper, Seiford & Tone 2007) asks for at least max(%d × %d, 3 × (%d + %d)) = %d units. With few units many of them look efficient; use fewer measures or more units.",
			n, verb(n, "unit", "units"), m, verb(m, "input", "inputs"), s, verb(s, "output", "outputs"), m, s, m, s, need)
	}
}

// magnitudes warns when the typical sizes of the measures differ by more
// than MagnitudeSpread.
func (v *validator) magnitudes() {
	lo, hi := math.Inf(1), 0.0
	var jlo, jhi int
	for _, j := range v.used() {
		size := 0.0
		for _, i := range v.units {
			if x := math.Abs(v.s.Values[i][j]); finite(x) && x > size {
				size = x
			}
		}
		if size == 0 {
			continue
		}
		if size < lo {
			lo, jlo = size, j
		}
		if size > hi {
			hi, jhi = size, j
		}
	}
	if hi > 0 && hi/lo > MagnitudeSpread {
		v.add(Warning, CodeMagnitudes, nil, []int{jlo, jhi}, "The measures differ greatly in size: the largest value of %s is %g and the largest of %s is %g, more than six orders of magnitude apart. The solver scales each measure, but check the units of measurement (for example thousands against single units).",
			v.measure(jlo), lo, v.measure(jhi), hi)
	}
}

func (v *validator) leftOut() {
	in := make([]bool, len(v.s.Units))
	for _, i := range v.units {
		in[i] = true
	}
	var out []int
	for i := range v.s.Units {
		if !in[i] {
			out = append(out, i)
		}
	}
	if len(out) > 0 {
		v.add(Note, CodeLeftOut, out, nil, "Left out of the run (kept in the study): %s.", v.unitList(out))
	}
}

// unitList names units for a message: "A", "B" and "C".
func (v *validator) unitList(units []int) string {
	names := make([]string, len(units))
	for k, i := range units {
		names[k] = v.unit(i)
	}
	return andList(names)
}

func rowList(rows []int) string {
	s := make([]string, len(rows))
	for k, r := range rows {
		s[k] = fmt.Sprint(r + 1)
	}
	return andList(s)
}

func andList(s []string) string {
	if len(s) <= 1 {
		return strings.Join(s, "")
	}
	return strings.Join(s[:len(s)-1], ", ") + " and " + s[len(s)-1]
}

func verb(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// sortBySeverity puts errors first, then warnings, then notes, keeping the
// order within each.
func sortBySeverity(issues []Issue) {
	rank := map[Severity]int{Error: 0, Warning: 1, Note: 2}
	sorted := make([]Issue, 0, len(issues))
	for r := 0; r < 3; r++ {
		for _, is := range issues {
			if rank[is.Severity] == r {
				sorted = append(sorted, is)
			}
		}
	}
	copy(issues, sorted)
}
