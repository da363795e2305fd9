package api

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"peerlens/engine/dea"
	"peerlens/engine/export"
	"peerlens/engine/report"
	"peerlens/engine/study"
)

func TestParse(t *testing.T) {
	out, err := Parse("clinic,staff,visits\nAshby,10,100\nBrook,x,120\nCray,8,90\n")
	if err != nil {
		t.Fatal(err)
	}
	var p struct {
		Table struct {
			Header []string
			Rows   []struct {
				Line  int
				Cells []string
			}
			Columns []struct {
				Name    string
				Numeric bool
			}
			NameColumn int
		}
		Study    *json.RawMessage
		Problems []Problem
	}
	if err := json.Unmarshal(out, &p); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if strings.Join(p.Table.Header, ",") != "clinic,staff,visits" || len(p.Table.Rows) != 3 || p.Table.Rows[1].Line != 3 ||
		p.Table.Rows[1].Cells[1] != "x" || p.Table.NameColumn != 0 || !p.Table.Columns[1].Numeric {
		t.Errorf("table view = %+v", p.Table)
	}
	if p.Study == nil {
		t.Fatal("no study")
	}
	s, err := ReadStudy(*p.Study)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(s.Units, ",") != "Ashby,Brook,Cray" || len(s.Measures) != 2 || !math.IsNaN(s.Values[1][0]) {
		t.Errorf("study = %+v", s)
	}
	// The unreadable cell is reported at row 3 (the header is row 1), column 2.
	found := false
	for _, pr := range p.Problems {
		if pr.Row == 3 && pr.Column == 2 && pr.Text == "x" && pr.Message != "" && pr.Reason != "" {
			found = true
		}
	}
	if !found {
		t.Errorf("no problem at row 3, column 2: %+v", p.Problems)
	}
}

func TestParseRecordsMatchesParse(t *testing.T) {
	a, err := Parse("unit,in,out\nA,1,2\nB,3,4\n")
	if err != nil {
		t.Fatal(err)
	}
	b, err := ParseRecords([][]string{{"unit", "in", "out"}, {"A", "1", "2"}, {"B", "3", "4"}})
	if err != nil {
		t.Fatal(err)
	}
	var pa, pb Parsed
	json.Unmarshal(a, &pa)
	json.Unmarshal(b, &pb)
	if !bytes.Equal(pa.Study, pb.Study) {
		t.Errorf("studies differ:\n%s\n%s", pa.Study, pb.Study)
	}
}

func demoJSON(t *testing.T) []byte {
	t.Helper()
	b, err := Demo()
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestDemoValidateRunExplainExport(t *testing.T) {
	sj := demoJSON(t)
	s, err := ReadStudy(sj)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Units) != len(study.Demo().Units) {
		t.Errorf("demo has %d units, want %d", len(s.Units), len(study.Demo().Units))
	}
	ij, err := Validate(sj)
	if err != nil {
		t.Fatal(err)
	}
	var is []Issue
	if err := json.Unmarshal(ij, &is); err != nil {
		t.Fatal(err)
	}
	for _, x := range is {
		if x.Severity == string(study.Error) {
			t.Errorf("demo has an error: %+v", x)
		}
	}

	var calls, last int
	rj, err := Run(context.Background(), sj, nil, func(done, total int) { calls++; last = done })
	if err != nil {
		t.Fatal(err)
	}
	if calls == 0 || last != len(s.Units) {
		t.Errorf("progress: %d calls, last %d, want last %d", calls, last, len(s.Units))
	}
	// The bridge's result is the engine's own result, number for number.
	d, _, _ := s.Data()
	native, err := dea.Run(context.Background(), &d, s.Settings, nil)
	if err != nil {
		t.Fatal(err)
	}
	nj, _ := export.JSON(native)
	if !bytes.Equal(rj, nj) {
		t.Error("bridge result differs from the native run")
	}
	r, err := ReadResult(rj)
	if err != nil {
		t.Fatal(err)
	}
	back, _ := export.JSON(r)
	if !bytes.Equal(back, rj) {
		t.Error("result does not survive a JSON round trip")
	}

	k := 3
	uj, _ := json.Marshal(native.Units[k])
	mj, _ := json.Marshal(native.Model)
	ej, err := Explain(mj, uj)
	if err != nil {
		t.Fatal(err)
	}
	var rep report.UnitReport
	json.Unmarshal(ej, &rep)
	if want := report.Unit(native.Units[k], native.Model); rep.Summary != want.Summary || len(rep.Sections) != len(want.Sections) {
		t.Errorf("explain = %+v\nwant %+v", rep, want)
	}

	csv, err := ExportCSV(sj, rj)
	if err != nil {
		t.Fatal(err)
	}
	var want bytes.Buffer
	export.CSV(&want, s, native)
	if csv != want.String() {
		t.Error("bridge CSV differs from the native export")
	}

	dj, err := Describe(mj)
	if err != nil || !strings.Contains(string(dj), "Banker, Charnes") || !strings.Contains(string(dj), "human review") {
		t.Errorf("describe = %s, %v", dj, err)
	}
}

func TestRunSubsetOfUnits(t *testing.T) {
	sj := demoJSON(t)
	full, err := Run(context.Background(), sj, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	part, err := Run(context.Background(), sj, []int{4, 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	f, _ := ReadResult(full)
	p, _ := ReadResult(part)
	// The same scores to rounding: a list of units that is not a union of
	// the engine's chunks can start each program from other columns (bit
	// for bit equality is promised for shares, see dea.Options.Parts).
	if len(p.Units) != 2 || p.Units[0].Name != f.Units[4].Name || math.Abs(p.Units[1].Score-f.Units[1].Score) > 1e-12 {
		t.Errorf("subset run = %+v", p.Units)
	}
}

func TestReadResultRestoresNaN(t *testing.T) {
	r := &dea.Result{Units: []dea.UnitResult{{Name: "A", Status: dea.NotSolved, Score: math.NaN(),
		Inputs: []dea.Target{{Measure: "x", Value: 0, Change: math.NaN()}, {Measure: "y", Value: 2, Change: -50}}}}}
	b, err := export.JSON(r)
	if err != nil {
		t.Fatal(err)
	}
	back, err := ReadResult(b)
	if err != nil {
		t.Fatal(err)
	}
	u := back.Units[0]
	if !math.IsNaN(u.Score) || !math.IsNaN(u.Inputs[0].Change) || u.Inputs[1].Change != -50 {
		t.Errorf("restored = %+v", u)
	}
}

// Errors are values with a message, never a panic.
func TestErrorsAreMessages(t *testing.T) {
	for name, f := range map[string]func() error{
		"validate junk": func() error { _, err := Validate([]byte("{not json")); return err },
		"run junk":      func() error { _, err := Run(context.Background(), []byte("[]"), nil, nil); return err },
		"explain junk":  func() error { _, err := Explain([]byte("{}"), []byte("{")); return err },
		"describe junk": func() error { _, err := Describe([]byte("3")); return err },
		"export junk":   func() error { _, err := ExportCSV(demoJSON(t), []byte(`{"units":[]}`)); return err },
		"run unrunnable": func() error {
			_, err := Run(context.Background(), []byte(`{"format":1,"units":[],"measures":[],"values":[]}`), nil, nil)
			return err
		},
	} {
		err := f()
		if err == nil || err.Error() == "" {
			t.Errorf("%s: err = %v, want a message", name, err)
		}
	}
}
