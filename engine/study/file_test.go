package study

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"peerlens/engine/dea"
)

// sameStudy reports the first difference between two studies, comparing
// numbers bit for bit (so NaN equals NaN and -0 differs from 0) and treating
// nil and empty lists alike.
func sameStudy(a, b *Study) string {
	switch {
	case a.Format != b.Format || a.Title != b.Title || a.Notes != b.Notes:
		return fmt.Sprintf("format, title or notes differ: %d %q %q / %d %q %q", a.Format, a.Title, a.Notes, b.Format, b.Title, b.Notes)
	case a.Settings != b.Settings:
		return fmt.Sprintf("settings differ: %+v / %+v", a.Settings, b.Settings)
	case !slices.Equal(a.Units, b.Units) || !slices.Equal(a.LeftOut, b.LeftOut):
		return fmt.Sprintf("units or left-out differ: %q %q / %q %q", a.Units, a.LeftOut, b.Units, b.LeftOut)
	case !slices.Equal(a.Measures, b.Measures):
		return fmt.Sprintf("measures differ: %+v / %+v", a.Measures, b.Measures)
	case len(a.Extra) != len(b.Extra) || len(a.Values) != len(b.Values):
		return "number of text columns or value rows differ"
	}
	for k := range a.Extra {
		if a.Extra[k].Name != b.Extra[k].Name || !slices.Equal(a.Extra[k].Cells, b.Extra[k].Cells) {
			return fmt.Sprintf("text column %d differs: %q / %q", k, a.Extra[k], b.Extra[k])
		}
	}
	for i := range a.Values {
		if len(a.Values[i]) != len(b.Values[i]) {
			return fmt.Sprintf("row %d lengths differ", i)
		}
		for j, x := range a.Values[i] {
			y := b.Values[i][j]
			if math.IsNaN(x) != math.IsNaN(y) || !math.IsNaN(x) && math.Float64bits(x) != math.Float64bits(y) {
				return fmt.Sprintf("value [%d][%d] differs: %v / %v", i, j, x, y)
			}
		}
	}
	return ""
}

func roundTrip(t *testing.T, s *Study) (*Study, []byte) {
	t.Helper()
	var buf bytes.Buffer
	if err := s.Write(&buf); err != nil {
		t.Fatalf("Write: %v", err)
	}
	got, err := Read(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatalf("Read: %v\nfile:\n%s", err, buf.Bytes())
	}
	return got, buf.Bytes()
}

// hostileStudy holds what a user might paste: markup, quotes, right-to-left
// text, control characters, extreme numbers and missing values.
func hostileStudy() *Study {
	s := &Study{
		Format: FormatVersion,
		Title:  `Test "study" </script><script>alert(1)</script>`,
		Units: []string{
			`<img src=x onerror=alert(1)>`,
			`O'Brien "the elder" \ back\slash`,
			"مستشفى الشمال", // right-to-left text
			"line\nbreak\ttab\u0000nul",
			"emoji 🏥 and \u202e reversed",
		},
		Measures: []Measure{
			NewMeasure("Staff <b>", Input),
			{Name: "Budget ‏שקל", Role: Input, Controllable: false, Desirable: true, RoleGuessed: true},
			NewMeasure("Visits", Output),
			{Name: "Complaints", Role: Output, Controllable: true, Desirable: false},
			NewMeasure("Region code", Unused),
		},
		Values: [][]float64{
			{1, 2, 3, 4, 5},
			{math.NaN(), 1e308, math.MaxFloat64, math.SmallestNonzeroFloat64, 0},
			{0.1, 1.0 / 3, 2.0 / 3, 123456789.123456789, -1e-300},
			{math.Copysign(0, -1), 5e-324, 9007199254740993, 1e21, 1e-7},
			{math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN()},
		},
		Extra: []Text{
			{Name: "Manager", Cells: []string{"Ann", "", "سارة", "<i>x</i>", `"q"`}},
		},
		LeftOut:  []string{"مستشفى الشمال", `<img src=x onerror=alert(1)>`},
		Settings: dea.Model{Returns: dea.Bounded, Lower: 0.8, Upper: 1.2, Orientation: dea.Output, Super: true},
		Notes:    "Notes with\nnew lines & ampersands",
	}
	return s
}

func TestRoundTrip(t *testing.T) {
	for _, tc := range []struct {
		name  string
		study *Study
	}{
		{"demo", Demo()},
		{"hostile text and extreme numbers", hostileStudy()},
		{"empty study", &Study{Format: FormatVersion, Settings: dea.DefaultModel()}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, file := roundTrip(t, tc.study)
			if d := sameStudy(tc.study, got); d != "" {
				t.Fatalf("%s\nfile:\n%s", d, file)
			}
			again, file2 := roundTrip(t, got)
			if !bytes.Equal(file, file2) {
				t.Errorf("writing the read study gave a different file:\n%s\n---\n%s", file, file2)
			}
			if d := sameStudy(got, again); d != "" {
				t.Error(d)
			}
		})
	}
}

func TestWriteForm(t *testing.T) {
	var buf bytes.Buffer
	if err := hostileStudy().Write(&buf); err != nil {
		t.Fatal(err)
	}
	file := buf.String()
	for _, want := range []string{
		`"format": 1,`,
		`[null, 1e+308, 1.7976931348623157e+308, 5e-324, 0]`, `[-0, 5e-324`, // one line per unit; missing is null
		`"controllable": false`,
		`"desirable": false`,
		`"roleGuessed": true`,
		`"returns": "bounded"`,
		`"leftOut": [`,
	} {
		if !strings.Contains(file, want) {
			t.Errorf("file lacks %s:\n%s", want, file)
		}
	}
	if strings.Contains(file, "<img") {
		t.Error("markup characters should be escaped in the file")
	}
	if !json.Valid(buf.Bytes()) {
		t.Error("file is not valid JSON")
	}
}

func TestWriteRefusesInfinity(t *testing.T) {
	s := Demo()
	s.Values[2][1] = math.Inf(1)
	err := s.Write(&bytes.Buffer{})
	var fe *FileError
	if !errors.As(err, &fe) || !errors.Is(err, ErrCannotWrite) || fe.Unit != 2 || fe.Measure != 1 {
		t.Fatalf("got %v, want ErrCannotWrite at unit 2, measure 1", err)
	}
	if !strings.Contains(err.Error(), `"Harbour Front"`) || !strings.Contains(err.Error(), `"Operating budget (thousands)"`) {
		t.Errorf("message should name unit and measure: %v", err)
	}
}

func TestWriteRefusesWhatReadRefuses(t *testing.T) {
	for _, tc := range []struct {
		name          string
		change        func(s *Study)
		unit, measure int
		message       string
	}{
		{"short row", func(s *Study) { s.Values[3] = s.Values[3][:2] }, 3, -1, `unit "Mill Lane" (row 4) has 2 values but the study has 5 measures`},
		{"missing row", func(s *Study) { s.Values = s.Values[:29] }, -1, -1, "lists 30 units but has 29 rows"},
		{"unknown role", func(s *Study) { s.Measures[4].Role = "both" }, -1, 4, `role "both"`},
		{"unknown left out", func(s *Study) { s.LeftOut = []string{"Nowhere"} }, -1, -1, `"Nowhere" is listed as left out`},
		{"settings", func(s *Study) { s.Settings.Returns = "" }, -1, -1, "unknown returns to scale"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := Demo()
			tc.change(s)
			var buf bytes.Buffer
			err := s.Write(&buf)
			var fe *FileError
			if !errors.As(err, &fe) || !errors.Is(err, ErrCannotWrite) {
				t.Fatalf("got %v, want ErrCannotWrite", err)
			}
			if fe.Unit != tc.unit || fe.Measure != tc.measure || !strings.Contains(fe.Message, tc.message) || buf.Len() != 0 {
				t.Errorf("got unit %d measure %d %q (wrote %d bytes), want %d %d %q", fe.Unit, fe.Measure, fe.Message, buf.Len(), tc.unit, tc.measure, tc.message)
			}
		})
	}
}

func TestInfiniteUpperIsWrittenAsNoBound(t *testing.T) {
	s := Demo()
	s.Settings = dea.Model{Returns: dea.Bounded, Lower: 0.5, Upper: math.Inf(1), Orientation: dea.Input}
	got, _ := roundTrip(t, s)
	if got.Settings.Upper != 0 || got.Settings.Lower != 0.5 {
		t.Errorf("settings read back as %+v, want lower 0.5 and upper 0 (no bound)", got.Settings)
	}
}

func TestReadDefaults(t *testing.T) {
	file := `{"format": 1, "units": ["A"], "measures": [{"name": "Staff", "role": "input"}], "values": [[2]]}`
	s, err := Read(strings.NewReader(file))
	if err != nil {
		t.Fatal(err)
	}
	if m := s.Measures[0]; !m.Controllable || !m.Desirable || m.RoleGuessed {
		t.Errorf("measure defaults: got %+v, want controllable and desirable, not guessed", m)
	}
	if s.Settings != dea.DefaultModel() {
		t.Errorf("settings default: got %+v", s.Settings)
	}
	if s.Format != 1 || s.Values[0][0] != 2 {
		t.Errorf("got %+v", s)
	}
}

func TestReadErrors(t *testing.T) {
	const head = `{"format": 1, "units": ["North", "South"], "measures": [{"name": "Staff", "role": "input"}, {"name": "Visits", "role": "output"}], `
	for _, tc := range []struct {
		name          string
		file          string
		sentinel      error
		line, column  int
		unit, measure int
		message       string
	}{
		{"newer format", `{"format": 3, "units": {"changed": true}}`, ErrNewerFormat, 0, 0, -1, -1,
			"this study file was written by a newer version of Peerlens (format 3); this page reads format 1"},
		{"syntax error", "{\n  \"format\": 1,\n  \"title\": ,\n}", ErrDamaged, 3, 12, -1, -1,
			"the study file is damaged: at line 3, column 12"},
		{"cut short", "{\n  \"format\": 1,\n  \"units\": [\"A\"", ErrDamaged, 3, 15, -1, -1, "line 3, column 15"},
		{"trailing text", `{"format": 1} x`, ErrDamaged, 1, 15, -1, -1, "line 1, column 15"},
		{"empty", "  \n", ErrNotStudy, 0, 0, -1, -1, "empty"},
		{"array", `[1, 2]`, ErrNotStudy, 0, 0, -1, -1, "not a Peerlens study file"},
		{"no format", `{"units": []}`, ErrNotStudy, 0, 0, -1, -1, "no format number"},
		{"format text", `{"format": "one"}`, ErrNotStudy, 0, 0, -1, -1, `format "one" is not a version number`},
		{"format zero", `{"format": 0}`, ErrNotStudy, 0, 0, -1, -1, "not a version number"},
		{"rows != units", head + `"values": [[1, 2]]}`, ErrShape, 0, 0, -1, -1, "lists 2 units but has 1 rows of values"},
		{"short row", head + `"values": [[1, 2], [3]]}`, ErrShape, 0, 0, 1, -1, `unit "South" (row 2) has 1 values but the study has 2 measures`},
		{"text value", head + `"values": [[1, 2], [3, "4"]]}`, ErrShape, 0, 0, 1, 1, `unit "South" (row 2), measure "Visits": the value "4" is not a number`},
		{"huge value", head + `"values": [[1e400, 2], [3, 4]]}`, ErrShape, 0, 0, 0, 0, "the number 1e400 is too large"},
		{"unknown role", `{"format": 1, "units": [], "measures": [{"name": "Staff", "role": "inptu"}], "values": []}`, ErrShape, 0, 0, -1, 0,
			`measure "Staff" has the role "inptu"; the roles are input, output and unused`},
		{"extra cells", head + `"values": [[1, 2], [3, 4]], "extra": [{"name": "Town", "cells": ["x"]}]}`, ErrShape, 0, 0, -1, -1,
			`text column "Town" has 1 cells but the file lists 2 units`},
		{"unknown left out", head + `"values": [[1, 2], [3, 4]], "leftOut": ["East"]}`, ErrShape, 0, 0, -1, -1, `"East" is listed as left out but is not among the units`},
		{"bad settings", head + `"values": [[1, 2], [3, 4]], "settings": {"returns": "sideways", "orientation": "input"}}`, ErrShape, 0, 0, -1, -1,
			`the model settings cannot be used: dea: unknown returns to scale "sideways"`},
		{"unknown field", `{"format": 1, "colour": "red"}`, ErrShape, 0, 0, -1, -1, `unknown field "colour"`},
		// The decoder reports the end of the wrong value: column 17 is the closing quote of "North".
		{"wrong type", "{\"format\": 1,\n \"units\": \"North\"}", ErrShape, 2, 17, -1, -1, "line 2, column 17, units should be a list, not string"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Read(strings.NewReader(tc.file))
			if err == nil {
				t.Fatalf("read %+v, want an error", s)
			}
			var fe *FileError
			if !errors.As(err, &fe) {
				t.Fatalf("got %T %v, want *FileError", err, err)
			}
			if !errors.Is(err, tc.sentinel) {
				t.Errorf("error %v is not %v", err, tc.sentinel)
			}
			if fe.Line != tc.line || fe.Column != tc.column || fe.Unit != tc.unit || fe.Measure != tc.measure {
				t.Errorf("place: line %d column %d unit %d measure %d, want %d %d %d %d (%v)",
					fe.Line, fe.Column, fe.Unit, fe.Measure, tc.line, tc.column, tc.unit, tc.measure, err)
			}
			if !strings.Contains(err.Error(), tc.message) {
				t.Errorf("message %q lacks %q", err.Error(), tc.message)
			}
		})
	}
}

// endless is a reader of endless spaces.
type endless struct{}

func (endless) Read(p []byte) (int, error) {
	for i := range p {
		p[i] = ' '
	}
	return len(p), nil
}

func TestReadRefusesHugeFiles(t *testing.T) {
	if testing.Short() {
		t.Skip("reads 64 MiB")
	}
	_, err := Read(endless{})
	if !errors.Is(err, ErrTooLarge) || !strings.Contains(err.Error(), "larger than 64 MB") {
		t.Fatalf("got %v, want ErrTooLarge", err)
	}
}

func TestStudyInsideJSON(t *testing.T) {
	type envelope struct {
		Kind  string `json:"kind"`
		Study *Study `json:"study"`
	}
	in := envelope{Kind: "save", Study: hostileStudy()}
	b, err := json.Marshal(in)
	if err != nil {
		t.Fatal(err)
	}
	var out envelope
	if err := json.Unmarshal(b, &out); err != nil {
		t.Fatal(err)
	}
	if d := sameStudy(in.Study, out.Study); d != "" {
		t.Error(d)
	}
}

// FuzzRead: reading arbitrary bytes never panics, and a study that reads
// writes a file that reads back to the same study and the same file.
func FuzzRead(f *testing.F) {
	var demo, hostile bytes.Buffer
	Demo().Write(&demo)
	hostileStudy().Write(&hostile)
	f.Add(demo.Bytes())
	f.Add(hostile.Bytes())
	f.Add([]byte(`{"format": 1, "units": ["A"], "measures": [{"name": "x", "role": "output"}], "values": [[null]]}`))
	f.Add([]byte(`{"format": 2}`))
	f.Add([]byte(`{"format": 1, "values": [[1e999]]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Read(bytes.NewReader(data))
		if err != nil {
			var fe *FileError
			if !errors.As(err, &fe) || fe.Message == "" {
				t.Fatalf("error %v is not a *FileError with a message", err)
			}
			return
		}
		Validate(s) // must not panic either
		var once bytes.Buffer
		if err := s.Write(&once); err != nil {
			t.Fatalf("a study that was read cannot be written: %v", err)
		}
		back, err := Read(bytes.NewReader(once.Bytes()))
		if err != nil {
			t.Fatalf("re-read: %v\n%s", err, once.Bytes())
		}
		if d := sameStudy(s, back); d != "" {
			t.Fatal(d)
		}
		var twice bytes.Buffer
		back.Write(&twice)
		if !bytes.Equal(once.Bytes(), twice.Bytes()) {
			t.Fatalf("second write differs:\n%s\n---\n%s", once.Bytes(), twice.Bytes())
		}
	})
}
