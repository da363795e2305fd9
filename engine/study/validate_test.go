package study

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"peerlens/engine/dea"
)

// small is a valid study with nothing to report: 6 units, one input and one
// output, so it meets the sample-size rule of thumb (max(1*1, 3*(1+1)) = 6).
func small() *Study {
	return &Study{
		Format:   FormatVersion,
		Units:    []string{"North", "South", "East", "West", "Centre", "Harbour"},
		Measures: []Measure{NewMeasure("Staff", Input), NewMeasure("Visits", Output), NewMeasure("Postcode", Unused)},
		Values: [][]float64{
			{5, 120, 1},
			{8, 150, 2},
			{3, 90, 3},
			{10, 160, 4},
			{6, 100, 5},
			{4, 110, 6},
		},
		Settings: dea.DefaultModel(),
	}
}

func codes(issues []Issue) []string {
	var c []string
	for _, is := range issues {
		c = append(c, is.Code)
	}
	return c
}

func TestValidateCleanStudy(t *testing.T) {
	if issues := Validate(small()); len(issues) != 0 {
		t.Fatalf("a clean study gave issues: %+v", issues)
	}
}

func TestValidateRules(t *testing.T) {
	for _, tc := range []struct {
		name     string
		change   func(s *Study)
		severity Severity
		code     string
		units    []int
		measures []int
		words    []string // the message must contain each
	}{
		{"no input", func(s *Study) { s.Measures[0].Role = Unused }, Error, CodeNoInput, nil, nil, []string{"No measure is an input"}},
		{"no output", func(s *Study) { s.Measures[1].Role = Unused }, Error, CodeNoOutput, nil, nil, []string{"No measure is an output"}},
		{"no units", func(s *Study) { s.LeftOut = slices.Clone(s.Units) }, Error, CodeNoUnits, nil, nil, []string{"No unit is included"}},
		{"no positive input", func(s *Study) { s.Values[2][0] = 0 }, Error, CodeNoPositiveIn, []int{2}, []int{0},
			[]string{`"East"`, "positive value in at least one input"}},
		{"no positive output", func(s *Study) { s.Values[3][1] = 0 }, Error, CodeNoPositiveOut, []int{3}, []int{1},
			[]string{`"West"`, "positive value in at least one output"}},
		{"negative", func(s *Study) { s.Values[1][1] = -7 }, Error, CodeNegative, []int{1}, []int{1},
			[]string{`"South"`, `"Visits"`, "-7", "need values of zero or more", "does not shift data silently"}},
		{"missing", func(s *Study) { s.Values[4][0] = math.NaN() }, Error, CodeMissing, []int{4}, []int{0},
			[]string{`"Centre"`, `"Staff"`, "fill it in or leave the unit out"}},
		{"infinite", func(s *Study) { s.Values[4][0] = math.Inf(1) }, Error, CodeNotFinite, []int{4}, []int{0}, []string{`"Centre"`, `"Staff"`}},
		{"zero input", func(s *Study) {
			s.Measures = append(s.Measures, NewMeasure("Beds", Input))
			for i := range s.Values {
				s.Values[i] = append(s.Values[i], float64(10+i))
			}
			s.Values[0][3], s.Values[5][3] = 0, 0
		}, Warning, CodeZeroInput, []int{0, 5}, []int{3}, []string{`"North" and "Harbour" have zero for the input "Beds"`, "look efficient"}},
		{"zero output", func(s *Study) {
			s.Measures = append(s.Measures, NewMeasure("Loans", Output))
			for i := range s.Values {
				s.Values[i] = append(s.Values[i], float64(1+i*i))
			}
			s.Values[2][3] = 0
		}, Note, CodeZeroOutput, []int{2}, []int{3}, []string{`"East" has zero for the output "Loans"`, "allowed"}},
		// Constant input under variable returns, input orientation: sum(l)*c <=
		// theta*c with sum(l) = 1 forces theta >= 1 (derived from the BCC LP,
		// Banker, Charnes & Cooper 1984).
		{"constant input", func(s *Study) {
			s.Measures = append(s.Measures, NewMeasure("Vans", Input))
			for i := range s.Values {
				s.Values[i] = append(s.Values[i], 2)
			}
		}, Warning, CodeConstant, nil, []int{3}, []string{`"Vans" has the same value (2)`, "every unit scores 1"}},
		{"constant output under input orientation", func(s *Study) {
			s.Measures = append(s.Measures, NewMeasure("Licences", Output))
			for i := range s.Values {
				s.Values[i] = append(s.Values[i], 1)
			}
		}, Warning, CodeConstant, nil, []int{3}, []string{`"Licences"`, "at least 1", "adds nothing"}},
		{"proportional measures", func(s *Study) {
			s.Measures = append(s.Measures, NewMeasure("Staff hours", Input))
			for i := range s.Values {
				s.Values[i] = append(s.Values[i], s.Values[i][0]*37.5)
			}
		}, Warning, CodeDuplicateMeas, nil, []int{0, 3}, []string{`"Staff hours" is exactly 37.5 times "Staff"`}},
		{"identical measures", func(s *Study) {
			s.Measures = append(s.Measures, NewMeasure("Visits again", Output))
			for i := range s.Values {
				s.Values[i] = append(s.Values[i], s.Values[i][1])
			}
		}, Warning, CodeDuplicateMeas, nil, []int{1, 3}, []string{`"Visits again" is the same as "Visits"`}},
		{"identical units", func(s *Study) { s.Values[5] = []float64{5, 120, 99} }, Warning, CodeIdenticalUnits, []int{0, 5}, []int{0, 1},
			[]string{`"North" and "Harbour" have the same value on every input and output`}},
		{"duplicate names", func(s *Study) { s.Units[4] = "South" }, Error, CodeDuplicateName, []int{1, 4}, nil, []string{`Rows 2 and 5 are all called "South"`}},
		{"empty name", func(s *Study) { s.Units[3] = "  " }, Error, CodeEmptyName, []int{3}, nil, []string{"row 4 has no name"}},
		{"duplicate measure names", func(s *Study) { s.Measures[2].Name = "Staff" }, Error, CodeMeasureName, nil, []int{0, 2}, []string{`called "Staff"`}},
		// Rule of thumb n >= max(m*s, 3(m+s)): Cooper, Seiford & Tone (2007),
		// Data Envelopment Analysis: A Comprehensive Text, 2nd ed.
		{"sample size", func(s *Study) { s.LeftOut = []string{"Harbour"} }, Warning, CodeSampleSize, nil, nil,
			[]string{"5 units for 1 input and 1 output", "= 6 units"}},
		{"magnitudes", func(s *Study) {
			for i := range s.Values {
				s.Values[i][1] *= 1e5 // Visits up to 1.6e7 against Staff up to 10
			}
		}, Warning, CodeMagnitudes, nil, []int{0, 1}, []string{`"Staff" is 10`, `"Visits" is 1.6e+07`, "six orders of magnitude"}},
		{"left out", func(s *Study) {
			s.Units = append(s.Units, "Quay", "Ridge")
			s.Values = append(s.Values, []float64{math.NaN(), -1, 0}, []float64{1, 1, 1})
			s.LeftOut = []string{"Ridge", "Quay"}
		}, Note, CodeLeftOut, []int{6, 7}, nil, []string{`Left out of the run (kept in the study): "Quay" and "Ridge".`}},
		{"unknown left out", func(s *Study) { s.LeftOut = []string{"Nowhere"} }, Error, CodeUnknownLeftOut, nil, nil, []string{`"Nowhere"`}},
		{"settings", func(s *Study) { s.Settings.Orientation = "diagonal" }, Error, CodeSettings, nil, nil, []string{`unknown orientation "diagonal"`}},
		{"shape", func(s *Study) { s.Values[2] = s.Values[2][:1] }, Error, CodeShape, []int{2}, nil, []string{`"East" has 1 values but the study has 3 measures`}},
		{"not yet used", func(s *Study) { s.Measures[1].Desirable = false }, Note, CodeNotYetUsed, nil, []int{1}, []string{`"Visits" is marked as undesirable`}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := small()
			tc.change(s)
			issues := Validate(s)
			var found *Issue
			for i := range issues {
				if issues[i].Code == tc.code {
					found = &issues[i]
					break
				}
			}
			if found == nil {
				t.Fatalf("no %s issue; got %v: %+v", tc.code, codes(issues), issues)
			}
			if found.Severity != tc.severity {
				t.Errorf("severity %s, want %s", found.Severity, tc.severity)
			}
			if !slices.Equal(found.Units, tc.units) || !slices.Equal(found.Measures, tc.measures) {
				t.Errorf("units %v measures %v, want %v %v", found.Units, found.Measures, tc.units, tc.measures)
			}
			for _, w := range tc.words {
				if !strings.Contains(found.Message, w) {
					t.Errorf("message %q lacks %q", found.Message, w)
				}
			}
		})
	}
}

// Cells that take no part in the run raise nothing: an unused measure and a
// left-out unit may hold missing or negative values.
func TestValidateIgnoresCellsOutsideTheRun(t *testing.T) {
	s := small()
	s.Values[0][2] = math.NaN() // unused measure
	s.Units = append(s.Units, "Quay")
	s.Values = append(s.Values, []float64{math.NaN(), -4, 0})
	s.LeftOut = []string{"Quay"}
	issues := Validate(s)
	if got := codes(issues); !slices.Equal(got, []string{CodeLeftOut}) {
		t.Fatalf("got %v, want only the left-out note: %+v", got, issues)
	}
}

func TestValidateOrdersBySeverity(t *testing.T) {
	s := small()
	s.Units = append(s.Units, "Quay")
	s.Values = append(s.Values, []float64{1, 1, 1})
	s.LeftOut = []string{"Quay"}       // note
	s.Values[0][1] = -1                // error
	s.Values[5] = []float64{8, 150, 0} // warning: same as South
	issues := Validate(s)
	rank := map[Severity]int{Error: 0, Warning: 1, Note: 2}
	for k := 1; k < len(issues); k++ {
		if rank[issues[k].Severity] < rank[issues[k-1].Severity] {
			t.Fatalf("issues out of order: %v", issues)
		}
	}
	if len(issues) < 3 {
		t.Fatalf("want an error, a warning and a note, got %+v", issues)
	}
}

func TestData(t *testing.T) {
	s := small()
	s.Measures = append([]Measure{NewMeasure("Budget", Input)}, s.Measures...)
	for i := range s.Values {
		s.Values[i] = append([]float64{float64(100 + 10*i)}, s.Values[i]...)
	}
	s.Units = append(s.Units, "Quay")
	s.Values = append(s.Values, []float64{math.NaN(), 1, 1, 1})
	s.LeftOut = []string{"East", "Quay"}
	d, issues, err := s.Data()
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(codes(issues), []string{CodeSampleSize, CodeLeftOut}) {
		t.Errorf("issues %v, want the sample-size warning (5 units, 2 inputs, 1 output) and the left-out note", codes(issues))
	}
	if want := []int{0, 1, 3, 4, 5}; !slices.Equal(s.Included(), want) {
		t.Errorf("Included() = %v, want %v", s.Included(), want)
	}
	if !slices.Equal(d.Units, []string{"North", "South", "West", "Centre", "Harbour"}) {
		t.Errorf("units %v", d.Units)
	}
	if !slices.Equal(d.InputNames, []string{"Budget", "Staff"}) || !slices.Equal(d.OutputNames, []string{"Visits"}) {
		t.Errorf("names %v %v", d.InputNames, d.OutputNames)
	}
	if !slices.Equal(d.X[2], []float64{130, 10}) || !slices.Equal(d.Y[2], []float64{160}) {
		t.Errorf("West's row: x %v y %v", d.X[2], d.Y[2])
	}
	d.X[0][0] = -1
	if s.Values[0][0] != 100 {
		t.Error("Data shares its numbers with the study")
	}
}

func TestDataRefusesErrors(t *testing.T) {
	s := small()
	s.Values[1][0] = math.NaN()
	s.Values[2][1] = -3
	d, issues, err := s.Data()
	if !errors.Is(err, ErrCannotRun) {
		t.Fatalf("got %v, want ErrCannotRun", err)
	}
	if !strings.Contains(err.Error(), `"South" has no value for "Staff"`) || !strings.Contains(err.Error(), "(and 1 more problem)") {
		t.Errorf("error %q should give the first problem and the count of the rest", err)
	}
	if len(d.Units) != 0 || len(issues) != 2 {
		t.Errorf("got data %+v and issues %+v", d, issues)
	}
}
