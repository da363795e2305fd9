package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"peerlens/engine/dea"
	"peerlens/engine/study"
)

const demoInputs = "Staff (FTE),Operating budget (thousands),Floor area (m²)"
const demoOutputs = "Prescriptions dispensed (thousands),Patient consultations"

// The runner's JSON gives, per unit, the fields the issue names, with the
// same scores as the engine called directly on the same data.
func TestJSONMatchesEngine(t *testing.T) {
	var out bytes.Buffer
	err := run([]string{"-data", "../../../testdata/demo.csv", "-inputs", demoInputs, "-outputs", demoOutputs, "-rts", "vrs", "-json"}, &out)
	if err != nil {
		t.Fatal(err)
	}
	var got struct {
		Units []struct {
			Name     string   `json:"name"`
			Score    *float64 `json:"score"`
			Status   string   `json:"status"`
			Verified bool     `json:"verified"`
			Peers    []struct {
				Name   string  `json:"name"`
				Lambda float64 `json:"lambda"`
			} `json:"peers"`
		} `json:"units"`
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	s := study.Demo()
	d, _, err := s.Data()
	if err != nil {
		t.Fatal(err)
	}
	want, err := dea.Run(context.Background(), &d, dea.Model{Returns: dea.Variable, Orientation: dea.Input, SecondStage: true, ScaleDetail: true}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(got.Units) != len(want.Units) {
		t.Fatalf("%d units, want %d", len(got.Units), len(want.Units))
	}
	for k, u := range got.Units {
		w := want.Units[k]
		if u.Name != w.Name || u.Score == nil || math.Abs(*u.Score-w.Score) > 1e-12 || u.Status != string(w.Status) || !u.Verified {
			t.Errorf("unit %d: got %+v, engine %s %v %s", k, u, w.Name, w.Score, w.Status)
		}
		if len(u.Peers) == 0 {
			t.Errorf("unit %s has no peers", u.Name)
		}
	}
}

// With -super, "score" is the super-efficiency score: above 1 for some
// efficient unit, and null where none exists.
func TestSuperScore(t *testing.T) {
	dir := t.TempDir()
	// A 1-input 1-output example worked by hand: under variable returns and
	// output orientation, A (the smallest input) has no finite super score.
	path := filepath.Join(dir, "t.csv")
	os.WriteFile(path, []byte("Unit,x,y\nA,2,1\nB,3,3\nC,6,4\nD,9,4\n"), 0o644)
	var out bytes.Buffer
	if err := run([]string{"-data", path, "-inputs", "x", "-outputs", "y", "-orientation", "output", "-super", "-json"}, &out); err != nil {
		t.Fatal(err)
	}
	var got struct {
		Units []struct {
			Name   string   `json:"name"`
			Score  *float64 `json:"score"`
			Radial *float64 `json:"radialScore"`
		} `json:"units"`
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if got.Units[0].Score != nil {
		t.Errorf("A: super score %v, want null (no other unit uses input 2 or less)", *got.Units[0].Score)
	}
	// B without B: the frontier through A(2,1) and C(6,4) at x = 3 gives
	// y = 1 + 3/4 = 1.75, so phi = 1.75/3 and the score 1/phi = 12/7
	// (worked by hand).
	if s := got.Units[1].Score; s == nil || math.Abs(*s-12.0/7) > 1e-9 {
		t.Errorf("B: super score %v, want 12/7", s)
	}
	if r := got.Units[1].Radial; r == nil || math.Abs(*r-1) > 1e-9 {
		t.Errorf("B: radial score %v, want 1", r)
	}
}

func TestStudyFileAndCSV(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "demo.json")
	f, _ := os.Create(path)
	if err := study.Demo().Write(f); err != nil {
		t.Fatal(err)
	}
	f.Close()
	var out bytes.Buffer
	if err := run([]string{"-study", path}, &out); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&out).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != len(study.Demo().Units)+1 || recs[0][0] != "unit" || recs[0][1] != "score" {
		t.Fatalf("unexpected CSV: %d rows, header %v", len(recs), recs[0])
	}
}

func TestErrorsNameRowAndColumn(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "bad.csv")
	os.WriteFile(path, []byte("Unit,x,y\nA,2,1\nB,three,3\nC,6,4\n"), 0o644)
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"-data", path, "-inputs", "x", "-outputs", "y"}, `row 3, column 2 (x): "three"`},
		{[]string{"-data", path, "-inputs", "z", "-outputs", "y"}, `no column named "z"`},
		{[]string{"-data", path, "-inputs", "x"}, "at least one input"},
		{[]string{"-data", path, "-inputs", "x", "-outputs", "y", "-rts", "odd"}, "unknown -rts"},
		{[]string{}, "give -data"},
	}
	for _, c := range cases {
		err := run(c.args, &bytes.Buffer{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: error %v, want it to mention %q", c.args, err, c.want)
		}
	}
}
