package study

import (
	"math"
	"slices"
	"strings"
	"testing"

	"peerlens/engine/dea"
	"peerlens/engine/table"
)

// handTable builds a table.Table the way the table package describes it,
// without its parser.
func handTable(header []string, numeric []bool, nameColumn int, rows [][]string, values [][]float64) *table.Table {
	t := &table.Table{Delimiter: ',', HasHeader: true, Header: header, NameColumn: nameColumn}
	for i, cells := range rows {
		t.Rows = append(t.Rows, table.Row{Line: i + 2, Cells: cells})
	}
	for j, name := range header {
		c := table.Column{Name: name, Numeric: numeric[j]}
		if numeric[j] {
			for i := range rows {
				c.Values = append(c.Values, values[i][j])
			}
		}
		t.Columns = append(t.Columns, c)
	}
	return t
}

func TestFromTable(t *testing.T) {
	nan := math.NaN()
	tab := handTable(
		[]string{"Branch", "Staff", "Region", "Budget", "Visits", "Loans made"},
		[]bool{false, true, false, true, true, true},
		0,
		[][]string{
			{"North", "4", "Hills", "100", "50", "7"},
			{"<b>South</b>", "6", "Coast", "", "80", "9"},
			{"East", "5", "", "120", "60", "x"},
		},
		[][]float64{
			{0, 4, 0, 100, 50, 7},
			{0, 6, 0, nan, 80, 9},
			{0, 5, 0, 120, 60, nan},
		},
	)
	s := FromTable(tab)
	if !slices.Equal(s.Units, []string{"North", "<b>South</b>", "East"}) {
		t.Errorf("units %q", s.Units)
	}
	want := []Measure{
		{Name: "Staff", Role: Input, RoleGuessed: true, Controllable: true, Desirable: true},
		{Name: "Budget", Role: Input, RoleGuessed: true, Controllable: true, Desirable: true},
		{Name: "Visits", Role: Output, RoleGuessed: true, Controllable: true, Desirable: true},
		{Name: "Loans made", Role: Output, RoleGuessed: true, Controllable: true, Desirable: true},
	}
	if !slices.Equal(s.Measures, want) {
		t.Errorf("measures %+v, want %+v", s.Measures, want)
	}
	if len(s.Extra) != 1 || s.Extra[0].Name != "Region" || !slices.Equal(s.Extra[0].Cells, []string{"Hills", "Coast", ""}) {
		t.Errorf("text columns %+v, want Region kept", s.Extra)
	}
	if s.Values[0][3] != 7 || !math.IsNaN(s.Values[1][1]) || !math.IsNaN(s.Values[2][3]) || s.Values[2][0] != 5 {
		t.Errorf("values %v", s.Values)
	}
	if s.Notes != "" || s.Format != FormatVersion || s.Settings != dea.DefaultModel() {
		t.Errorf("notes %q format %d settings %+v", s.Notes, s.Format, s.Settings)
	}
	// The blanks are not dropped: validation names them.
	var missing []string
	for _, is := range Validate(s) {
		if is.Code == CodeMissing {
			missing = append(missing, is.Message)
		}
	}
	if len(missing) != 2 || !strings.Contains(missing[0], `"<b>South</b>" has no value for "Budget"`) {
		t.Errorf("missing-value errors: %q", missing)
	}
}

func TestFromTableWithoutNames(t *testing.T) {
	tab := handTable([]string{"Column 1", "Column 2"}, []bool{true, true}, -1,
		[][]string{{"1", "2"}, {"3", "4"}}, [][]float64{{1, 2}, {3, 4}})
	s := FromTable(tab)
	if !slices.Equal(s.Units, []string{"Unit 1", "Unit 2"}) {
		t.Errorf("units %q", s.Units)
	}
	if !strings.Contains(s.Notes, "no column of unit names") {
		t.Errorf("notes %q should say the units were numbered", s.Notes)
	}
	if len(s.Measures) != 2 || s.Measures[0].Role != Input || s.Measures[1].Role != Output {
		t.Errorf("measures %+v: with no header words, first half inputs, rest outputs", s.Measures)
	}
}

func TestFromEmptyTable(t *testing.T) {
	s := FromTable(&table.Table{NameColumn: -1})
	if len(s.Units) != 0 || len(s.Measures) != 0 || len(s.Values) != 0 {
		t.Errorf("got %+v", s)
	}
	if got := codes(Validate(s)); !slices.Contains(got, CodeNoUnits) || !slices.Contains(got, CodeNoInput) {
		t.Errorf("issues %v", got)
	}
}

func TestGuessRoles(t *testing.T) {
	I, O := Input, Output
	for _, tc := range []struct {
		name  string
		names []string
		want  []Role
	}{
		{"header words", []string{"Nursing staff", "Operating cost", "Beds", "Patients treated", "Outpatient visits"}, []Role{I, I, I, O, O}},
		{"bank branch", []string{"FTE", "Floor space (m2)", "Deposits", "Loans", "Sales"}, []Role{I, I, O, O, O}},
		{"case and plural", []string{"EMPLOYEES", "Total Expenses", "Calls answered", "Trips"}, []Role{I, I, O, O}},
		{"nothing recognised: first half inputs", []string{"A", "B", "C"}, []Role{I, I, O}},
		{"nothing recognised, four", []string{"w", "x", "y", "z"}, []Role{I, I, O, O}},
		{"unrecognised take the nearest on the left", []string{"Staff", "Widgets", "Visits", "Gadgets"}, []Role{I, I, O, O}},
		{"unrecognised first takes the nearest on the right", []string{"Widgets", "Staff", "Visits"}, []Role{I, I, O}},
		{"only inputs recognised: the rest are outputs", []string{"Staff", "Budget", "Widgets"}, []Role{I, I, O}},
		{"only outputs recognised: the rest are inputs", []string{"Widgets", "Revenue", "Gizmos"}, []Role{I, O, I}},
		{"both kinds of word: undecided", []string{"Staff", "Cost per visit", "Pupils passed"}, []Role{I, I, O}},
		{"one measure", []string{"Score"}, []Role{I}},
		{"none", nil, []Role{}},
	} {
		got := GuessRoles(tc.names)
		if !slices.Equal(got, tc.want) {
			t.Errorf("%s: GuessRoles(%q) = %v, want %v", tc.name, tc.names, got, tc.want)
		}
	}
}
