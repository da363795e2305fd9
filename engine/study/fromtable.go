package study

import (
	"fmt"
	"math"
	"strings"
	"unicode"

	"peerlens/engine/dea"
	"peerlens/engine/table"
)

// FromTable makes a study from a table as read: unit names from the
// table's name column (or "Unit 1", "Unit 2", ... with a note in Notes when
// it has none), one measure per numeric column with a guessed role
// (RoleGuessed is set; see GuessRoles), and every other column kept as
// Extra text. Nothing in the table is dropped. Settings are
// dea.DefaultModel().
func FromTable(t *table.Table) *Study {
	s := &Study{Format: FormatVersion, Settings: dea.DefaultModel()}
	n := len(t.Rows)
	s.Units = make([]string, n)
	for i, row := range t.Rows {
		if t.NameColumn >= 0 {
			s.Units[i] = cell(row, t.NameColumn)
		} else {
			s.Units[i] = fmt.Sprintf("Unit %d", i+1)
		}
	}
	if t.NameColumn < 0 {
		s.Notes = "The table has no column of unit names, so the units are numbered in table order (Unit 1, Unit 2, ...)."
	}
	var names []string
	var cols []int
	for j, c := range t.Columns {
		if j == t.NameColumn {
			continue
		}
		name := columnName(t, j)
		if c.Numeric {
			names = append(names, name)
			cols = append(cols, j)
			continue
		}
		text := Text{Name: name, Cells: make([]string, n)}
		for i, row := range t.Rows {
			text.Cells[i] = cell(row, j)
		}
		s.Extra = append(s.Extra, text)
	}
	for k, role := range GuessRoles(names) {
		m := NewMeasure(names[k], role)
		m.RoleGuessed = true
		s.Measures = append(s.Measures, m)
	}
	if n > 0 {
		s.Values = make([][]float64, n)
	}
	for i := range s.Values {
		s.Values[i] = make([]float64, len(cols))
		for k, j := range cols {
			s.Values[i][k] = math.NaN()
			if vs := t.Columns[j].Values; i < len(vs) {
				s.Values[i][k] = vs[i]
			}
		}
	}
	return s
}

func cell(r table.Row, j int) string {
	if j < len(r.Cells) {
		return r.Cells[j]
	}
	return ""
}

func columnName(t *table.Table, j int) string {
	if name := t.Columns[j].Name; name != "" {
		return name
	}
	if j < len(t.Header) && t.Header[j] != "" {
		return t.Header[j]
	}
	return fmt.Sprintf("Column %d", j+1)
}

// Word stems that suggest a role. A header word suggests a role when it
// starts with one of these stems ("patients" starts with "patient").
var (
	inputStems = []string{"staff", "employee", "cost", "budget", "spend", "hour", "bed", "area",
		"space", "asset", "capital", "fte", "vehicle", "expens", "labour", "labor", "wage", "salar",
		"input", "nurse", "doctor", "teacher", "personnel", "headcount", "equipment", "fuel", "energy used"}
	outputStems = []string{"visit", "case", "patient", "loan", "deposit", "sale", "revenue", "served",
		"pupil", "passed", "trip", "call", "volume", "output", "treated", "discharge", "prescription",
		"consultation", "graduat", "delivered", "income", "transaction", "customer", "journey", "dispens"}
)

// GuessRoles guesses the role of each measure from its name. Header words
// that name resources (staff, cost, budget, beds, area, vehicles, ...) mark
// inputs; words that name results (visits, cases, loans, sales, pupils,
// passed, ...) mark outputs. A name with words of both kinds, or of neither,
// takes the role of the nearest recognised measure to its left (tables
// usually list inputs together, then outputs), or to its right when none is
// to the left. When no name is recognised, the first half (rounded up) are
// inputs and the rest outputs. When every recognised measure has the same
// role, the unrecognised ones take the other role. The page marks all of
// these as guesses.
func GuessRoles(names []string) []Role {
	roles := make([]Role, len(names))
	known := make([]bool, len(names))
	var ins, outs int
	for k, name := range names {
		switch guessOne(name) {
		case Input:
			roles[k], known[k] = Input, true
			ins++
		case Output:
			roles[k], known[k] = Output, true
			outs++
		}
	}
	switch {
	case ins+outs == 0:
		for k := range roles {
			roles[k] = Output
			if k < (len(names)+1)/2 {
				roles[k] = Input
			}
		}
	case ins == 0 || outs == 0:
		other := Input
		if ins > 0 {
			other = Output
		}
		for k := range roles {
			if !known[k] {
				roles[k] = other
			}
		}
	default:
		for k := range roles {
			if known[k] {
				continue
			}
			roles[k] = nearestKnown(roles, known, k)
		}
	}
	return roles
}

func nearestKnown(roles []Role, known []bool, k int) Role {
	for l := k - 1; l >= 0; l-- {
		if known[l] {
			return roles[l]
		}
	}
	for l := k + 1; l < len(roles); l++ {
		if known[l] {
			return roles[l]
		}
	}
	return Input
}

// guessOne returns Input, Output, or "" when the name says neither or both.
func guessOne(name string) Role {
	words := strings.FieldsFunc(strings.ToLower(name), func(r rune) bool {
		return !unicode.IsLetter(r) && !unicode.IsDigit(r)
	})
	joined := " " + strings.Join(words, " ")
	var in, out bool
	for _, stem := range inputStems {
		in = in || strings.Contains(joined, " "+stem)
	}
	for _, stem := range outputStems {
		out = out || strings.Contains(joined, " "+stem)
	}
	switch {
	case in && !out:
		return Input
	case out && !in:
		return Output
	}
	return ""
}
