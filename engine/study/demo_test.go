package study

import (
	"context"
	"encoding/csv"
	"math"
	"os"
	"slices"
	"strconv"
	"testing"

	"peerlens/engine/internal/oracle"
	"peerlens/engine/table"
)

const demoCSV = "../../testdata/demo.csv"

// The literal table in Demo is what the generator made: re-running it gives
// the same numbers.
func TestDemoIsWhatTheGeneratorMade(t *testing.T) {
	s := Demo()
	gen := generateDemo(demoSeed)
	if len(gen) != len(s.Values) {
		t.Fatalf("generator made %d rows, Demo has %d", len(gen), len(s.Values))
	}
	for i := range gen {
		if !slices.Equal(gen[i], s.Values[i]) {
			t.Errorf("row %d (%s): generator %v, Demo %v", i+1, s.Units[i], gen[i], s.Values[i])
		}
	}
}

func TestDemoIsClean(t *testing.T) {
	s := Demo()
	if issues := Validate(s); len(issues) != 0 {
		t.Errorf("the demo should raise no issue: %+v", issues)
	}
	if len(s.Units) != 30 {
		t.Errorf("%d units", len(s.Units))
	}
	// Magnitudes as described in Demo's comment.
	ranges := [][2]float64{{4, 25}, {300, 2500}, {60, 400}, {5, 200}, {300, 8000}}
	for i, row := range s.Values {
		for j, v := range row {
			if v < ranges[j][0] || v > ranges[j][1] {
				t.Errorf("%s, %s = %g, outside %v", s.Units[i], s.Measures[j].Name, v, ranges[j])
			}
		}
	}
	a, b := Demo(), Demo()
	a.Values[0][0] = -1
	if b.Values[0][0] == -1 {
		t.Error("Demo returns shared numbers")
	}
}

// vrsFrontier returns the units with a variable-returns radial score of 1
// in the given orientation, and those among them with no slack either, as
// GLPK's glpsol finds them (engine/internal/oracle).
func vrsFrontier(t *testing.T, x, y [][]float64, output bool) (scoreOne, efficient []int) {
	t.Helper()
	if _, err := oracle.Available(); err != nil {
		t.Skip(err)
	}
	for o := range x {
		r, err := oracle.SolveSecondStage(context.Background(), x, y, o, oracle.VRS.Orient(output), oracle.Options{})
		if err != nil {
			t.Fatalf("unit %d: %v", o, err)
		}
		if math.Abs(r.Radial-1) > 1e-9 {
			continue
		}
		scoreOne = append(scoreOne, o)
		if r.Weighted <= 1e-9 {
			efficient = append(efficient, o)
		}
	}
	return scoreOne, efficient
}

// The demo was made so that six pharmacies lie on the variable-returns
// frontier (generateDemo). Checked with GLPK's glpsol as the oracle: the
// radial BCC model (Banker, Charnes & Cooper 1984) in both orientations,
// plus the slack stage; input- and output-oriented variable-returns models
// find the same efficient units (common practice).
func TestDemoFrontier(t *testing.T) {
	d, _, err := Demo().Data()
	if err != nil {
		t.Fatal(err)
	}
	in1, inEff := vrsFrontier(t, d.X, d.Y, false)
	out1, outEff := vrsFrontier(t, d.X, d.Y, true)
	var names []string
	for _, i := range inEff {
		names = append(names, d.Units[i])
	}
	t.Logf("efficient under variable returns: %q", names)
	if len(inEff) < 4 || len(inEff) > 7 {
		t.Errorf("%d efficient units, want 4 to 7", len(inEff))
	}
	if !slices.Equal(in1, inEff) || !slices.Equal(out1, outEff) {
		t.Errorf("some units score 1 with slack: input %v/%v, output %v/%v", in1, inEff, out1, outEff)
	}
	if !slices.Equal(inEff, outEff) {
		t.Errorf("input orientation finds %v, output orientation %v", inEff, outEff)
	}
}

// testdata/demo.csv holds the same table as Demo.
func TestDemoCSV(t *testing.T) {
	f, err := os.Open(demoCSV)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	records, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	s := Demo()
	if len(records) != len(s.Units)+1 {
		t.Fatalf("%d records, want header + %d", len(records), len(s.Units))
	}
	for j, m := range s.Measures {
		if records[0][j+1] != m.Name {
			t.Errorf("header %d is %q, want %q", j+2, records[0][j+1], m.Name)
		}
	}
	for i, rec := range records[1:] {
		if rec[0] != s.Units[i] {
			t.Errorf("row %d: name %q, want %q", i+2, rec[0], s.Units[i])
		}
		for j, cell := range rec[1:] {
			v, err := strconv.ParseFloat(cell, 64)
			if err != nil || v != s.Values[i][j] {
				t.Errorf("row %d, column %d: %q, want %g", i+2, j+2, cell, s.Values[i][j])
			}
		}
	}
}

// End to end: the table reader on testdata/demo.csv, then FromTable, gives
// the demo study back, with every role guessed right from the headers.
func TestDemoCSVThroughTable(t *testing.T) {
	text, err := os.ReadFile(demoCSV)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := table.Parse(string(text))
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range tab.Problems {
		if p.Severity != table.Note {
			t.Errorf("table problem: %v", p)
		}
	}
	got, want := FromTable(tab), Demo()
	if !slices.Equal(got.Units, want.Units) {
		t.Errorf("units %q", got.Units)
	}
	if len(got.Measures) != len(want.Measures) {
		t.Fatalf("measures %+v", got.Measures)
	}
	for j, m := range got.Measures {
		w := want.Measures[j]
		if m.Name != w.Name || m.Role != w.Role || !m.RoleGuessed {
			t.Errorf("measure %d: %+v, want %s as a guessed %s", j, m, w.Name, w.Role)
		}
	}
	for i := range want.Values {
		for j, v := range want.Values[i] {
			if g := got.Values[i][j]; g != v || math.IsNaN(g) {
				t.Errorf("%s, %s: %g, want %g", want.Units[i], want.Measures[j].Name, g, v)
			}
		}
	}
	if len(got.Extra) != 0 || got.Notes != "" {
		t.Errorf("extra %+v notes %q", got.Extra, got.Notes)
	}
}
