package study

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"unicode/utf8"

	"peerlens/engine/dea"
)

// Sentinels beneath every *FileError, for errors.Is.
var (
	ErrNewerFormat = errors.New("study file from a newer version")
	ErrNotStudy    = errors.New("not a study file")
	ErrDamaged     = errors.New("study file damaged")
	ErrShape       = errors.New("study file does not fit together")
	ErrTooLarge    = errors.New("study file too large")
	ErrCannotWrite = errors.New("study cannot be written")
)

// MaxFileSize is the largest study file Read accepts (64 MiB).
const MaxFileSize = 64 << 20

// FileError is a problem reading or writing a study file: which sentinel,
// where in the file (for a damaged file), which unit and measure (for a
// shape problem), and a message in plain words for the page.
type FileError struct {
	Err     error // one of the sentinels above
	Line    int   // 1-based line in the file; 0 when not tied to a place
	Column  int   // 1-based column (in characters) on that line; 0 when unknown
	Unit    int   // 0-based index into the file's units; -1 when not about one unit
	Measure int   // 0-based index into the file's measures; -1 when not about one measure
	Message string
}

func (e *FileError) Error() string { return e.Message }
func (e *FileError) Unwrap() error { return e.Err }

func fileErr(err error, unit, measure int, format string, args ...any) *FileError {
	return &FileError{Err: err, Unit: unit, Measure: measure, Message: fmt.Sprintf(format, args...)}
}

// The file's wire form: our own plain field names.
type fileMeasure struct {
	Name         string `json:"name"`
	Role         Role   `json:"role"`
	RoleGuessed  bool   `json:"roleGuessed,omitempty"`
	Controllable *bool  `json:"controllable,omitempty"` // absent means true
	Desirable    *bool  `json:"desirable,omitempty"`    // absent means true
}

type fileText struct {
	Name  string   `json:"name"`
	Cells []string `json:"cells"`
}

type fileStudy struct {
	Format   int                 `json:"format"`
	Title    string              `json:"title"`
	Units    []string            `json:"units"`
	Measures []fileMeasure       `json:"measures"`
	Values   [][]json.RawMessage `json:"values"` // numbers, null for missing
	Extra    []fileText          `json:"extra"`
	LeftOut  []string            `json:"leftOut"`
	Settings *dea.Model          `json:"settings"` // absent means dea.DefaultModel()
	Notes    string              `json:"notes"`
}

// Write writes s as a study file: indented JSON with one line per unit's
// values, missing values as null. It fails with ErrCannotWrite, writing
// nothing, when Read would refuse the file: for numbers JSON cannot hold
// (infinite values or settings bounds) and for parts that do not fit
// together (a row of values per unit, a value per measure, known roles,
// left-out units among the units, usable settings).
// An infinite Settings.Upper means "no upper bound" and is written as 0,
// which means the same.
func (s *Study) Write(w io.Writer) error {
	settings := s.Settings
	if math.IsInf(settings.Upper, 1) {
		settings.Upper = 0
	}
	if !finite(settings.Lower) || !finite(settings.Upper) {
		return fileErr(ErrCannotWrite, -1, -1, "the bounds on the sum of peer weights must be numbers (got %g and %g)", settings.Lower, settings.Upper)
	}
	var b bytes.Buffer
	field := func(name string, v any, last bool) {
		js, err := json.MarshalIndent(v, "  ", "  ")
		if err != nil { // cannot happen for the types written here
			panic(err)
		}
		fmt.Fprintf(&b, "  %q: %s", name, js)
		if !last {
			b.WriteString(",")
		}
		b.WriteString("\n")
	}
	b.WriteString("{\n")
	field("format", FormatVersion, false)
	field("title", s.Title, false)
	field("units", nonNil(s.Units), false)
	ms := make([]fileMeasure, len(s.Measures))
	for j, m := range s.Measures {
		ms[j] = fileMeasure{Name: m.Name, Role: m.Role, RoleGuessed: m.RoleGuessed,
			Controllable: &m.Controllable, Desirable: &m.Desirable}
	}
	field("measures", ms, false)
	b.WriteString("  \"values\": [")
	for i, row := range s.Values {
		if i > 0 {
			b.WriteString(",")
		}
		b.WriteString("\n    [")
		for j, v := range row {
			if j > 0 {
				b.WriteString(", ")
			}
			switch {
			case missing(v):
				b.WriteString("null")
			case math.IsInf(v, 0):
				return fileErr(ErrCannotWrite, i, j, "%s has an infinite value for %s; only finite numbers can be saved",
					nameAt(s.Units, i, "unit"), nameOf(s.Measures, j))
			default:
				b.Write(formatNumber(v))
			}
		}
		b.WriteString("]")
	}
	if len(s.Values) > 0 {
		b.WriteString("\n  ")
	}
	b.WriteString("],\n")
	ex := make([]fileText, len(s.Extra))
	for k, t := range s.Extra {
		ex[k] = fileText{Name: t.Name, Cells: nonNil(t.Cells)}
	}
	field("extra", ex, false)
	field("leftOut", nonNil(s.LeftOut), false)
	field("settings", settings, false)
	field("notes", s.Notes, true)
	b.WriteString("}\n")
	// Never write a file that Read refuses (parts that do not fit together,
	// unknown roles or settings).
	if _, err := Read(bytes.NewReader(b.Bytes())); err != nil {
		e := &FileError{Err: ErrCannotWrite, Unit: -1, Measure: -1, Message: "the study cannot be saved: " + err.Error()}
		if fe, ok := err.(*FileError); ok {
			e.Unit, e.Measure = fe.Unit, fe.Measure
		}
		return e
	}
	_, err := w.Write(b.Bytes())
	return err
}

func formatNumber(v float64) []byte {
	js, _ := json.Marshal(v) // finite: cannot fail; shortest form that reads back exactly
	return js
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func nonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}

// Read reads a study file written by Write (or by hand). Every failure is a
// *FileError: ErrDamaged (not JSON; Line and Column say where),
// ErrNotStudy, ErrNewerFormat, ErrShape (the parts do not fit together;
// Unit and Measure say where) or ErrTooLarge.
func Read(r io.Reader) (*Study, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxFileSize+1))
	if err != nil {
		return nil, err
	}
	if len(data) > MaxFileSize {
		return nil, fileErr(ErrTooLarge, -1, -1, "this study file is larger than %d MB; Peerlens reads study files up to that size", MaxFileSize>>20)
	}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, fileErr(ErrNotStudy, -1, -1, "the study file is empty")
	}
	if !json.Valid(data) {
		return nil, damaged(data)
	}
	var probe map[string]json.RawMessage
	if json.Unmarshal(data, &probe) != nil {
		return nil, fileErr(ErrNotStudy, -1, -1, "this is not a Peerlens study file: it is JSON, but not an object with named parts")
	}
	raw, ok := probe["format"]
	if !ok {
		return nil, fileErr(ErrNotStudy, -1, -1, "this is not a Peerlens study file: it has no format number")
	}
	format, err := strconv.Atoi(string(raw))
	if err != nil || format < 1 {
		return nil, fileErr(ErrNotStudy, -1, -1, "this is not a Peerlens study file: its format %s is not a version number", clip(string(raw)))
	}
	if format > FormatVersion {
		return nil, fileErr(ErrNewerFormat, -1, -1, "this study file was written by a newer version of Peerlens (format %d); this page reads format %d", format, FormatVersion)
	}

	var f fileStudy
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&f); err != nil {
		return nil, misfit(data, err)
	}
	return f.study()
}

// study checks that the parts of f fit together and builds the Study.
func (f *fileStudy) study() (*Study, error) {
	s := &Study{Format: f.Format, Title: f.Title, Units: f.Units, Notes: f.Notes, LeftOut: f.LeftOut}
	for j, m := range f.Measures {
		switch m.Role {
		case Input, Output, Unused:
		default:
			return nil, fileErr(ErrShape, -1, j, "measure %q has the role %q; the roles are input, output and unused", m.Name, clip(string(m.Role)))
		}
		s.Measures = append(s.Measures, Measure{Name: m.Name, Role: m.Role, RoleGuessed: m.RoleGuessed,
			Controllable: m.Controllable == nil || *m.Controllable,
			Desirable:    m.Desirable == nil || *m.Desirable})
	}
	if len(f.Values) != len(f.Units) {
		return nil, fileErr(ErrShape, -1, -1, "the file lists %d units but has %d rows of values; each unit needs one row", len(f.Units), len(f.Values))
	}
	if len(f.Values) > 0 {
		s.Values = make([][]float64, len(f.Values))
	}
	for i, row := range f.Values {
		if len(row) != len(f.Measures) {
			return nil, fileErr(ErrShape, i, -1, "%s has %d values but the study has %d measures",
				nameAt(f.Units, i, "unit"), len(row), len(f.Measures))
		}
		s.Values[i] = make([]float64, len(row))
		for j, cell := range row {
			v, err := readNumber(cell)
			if err != nil {
				return nil, fileErr(ErrShape, i, j, "%s, %s: %v", nameAt(f.Units, i, "unit"), nameOf(s.Measures, j), err)
			}
			s.Values[i][j] = v
		}
	}
	for k, t := range f.Extra {
		if len(t.Cells) != len(f.Units) {
			return nil, fileErr(ErrShape, -1, -1, "the text column %q has %d cells but the file lists %d units", t.Name, len(t.Cells), len(f.Units))
		}
		s.Extra = append(s.Extra, Text(f.Extra[k]))
	}
	known := make(map[string]bool, len(f.Units))
	for _, u := range f.Units {
		known[u] = true
	}
	for _, name := range f.LeftOut {
		if !known[name] {
			return nil, fileErr(ErrShape, -1, -1, "the unit %q is listed as left out but is not among the units", name)
		}
	}
	s.Settings = dea.DefaultModel()
	if f.Settings != nil {
		s.Settings = *f.Settings
		if err := s.Settings.Validate(); err != nil {
			return nil, fileErr(ErrShape, -1, -1, "the model settings cannot be used: %v", err)
		}
	}
	return s, nil
}

func readNumber(cell json.RawMessage) (float64, error) {
	if string(cell) == "null" {
		return math.NaN(), nil
	}
	var v float64
	if err := json.Unmarshal(cell, &v); err != nil {
		if len(cell) > 0 && (cell[0] == '-' || cell[0] >= '0' && cell[0] <= '9') {
			return 0, fmt.Errorf("the number %s is too large to hold", clip(string(cell)))
		}
		return 0, fmt.Errorf("the value %s is not a number (write null for a missing value)", clip(string(cell)))
	}
	return v, nil
}

// damaged explains a JSON syntax error with its line and column.
func damaged(data []byte) *FileError {
	var v any
	err := json.Unmarshal(data, &v)
	var se *json.SyntaxError
	offset := int64(len(data))
	if errors.As(err, &se) {
		offset = se.Offset
	}
	line, col := position(data, offset)
	e := fileErr(ErrDamaged, -1, -1, "the study file is damaged: at line %d, column %d: %v", line, col, err)
	e.Line, e.Column = line, col
	return e
}

// misfit explains a decoding error of valid JSON.
func misfit(data []byte, err error) *FileError {
	var te *json.UnmarshalTypeError
	if errors.As(err, &te) {
		line, col := position(data, te.Offset)
		what := te.Field
		if what == "" {
			what = "the study"
		}
		e := fileErr(ErrShape, -1, -1, "the study file does not fit format %d: at line %d, column %d, %s should be %s, not %s",
			FormatVersion, line, col, what, plainType(te.Type.Kind().String()), te.Value)
		e.Line, e.Column = line, col
		return e
	}
	return fileErr(ErrShape, -1, -1, "the study file does not fit format %d: %v", FormatVersion, err)
}

func plainType(kind string) string {
	switch kind {
	case "string":
		return "text"
	case "slice":
		return "a list"
	case "struct", "map", "ptr":
		return "a group of named parts"
	case "bool":
		return "true or false"
	case "int", "float64":
		return "a number"
	}
	return kind
}

// position turns the byte offset of a JSON error (bytes read up to and
// including the bad one) into a 1-based line and a 1-based column counted
// in characters.
func position(data []byte, offset int64) (line, col int) {
	if offset > int64(len(data)) {
		offset = int64(len(data))
	}
	at := int(offset) - 1 // the byte the decoder stopped on
	if at < 0 {
		at = 0
	}
	start := bytes.LastIndexByte(data[:at], '\n') + 1
	line = bytes.Count(data[:at], []byte{'\n'}) + 1
	col = utf8.RuneCount(data[start:at]) + 1
	return line, col
}

// clip shortens text from a file for a message.
func clip(s string) string {
	if utf8.RuneCountInString(s) <= 40 {
		return s
	}
	r := []rune(s)
	return string(r[:37]) + "..."
}

// nameAt names element i of names for a message: `unit "North" (row 3)`;
// the row number is 1-based and is there because names may repeat or be blank.
func nameAt(names []string, i int, kind string) string {
	if i < len(names) {
		return fmt.Sprintf("%s %q (row %d)", kind, names[i], i+1)
	}
	return fmt.Sprintf("%s %d", kind, i+1)
}

func nameOf(ms []Measure, j int) string {
	if j < len(ms) {
		return fmt.Sprintf("measure %q", ms[j].Name)
	}
	return fmt.Sprintf("measure %d", j+1)
}

// MarshalJSON writes the study in its file form, so a Study can be embedded
// in other JSON.
func (s *Study) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	if err := s.Write(&b); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// UnmarshalJSON reads the study's file form, with the checks of Read.
func (s *Study) UnmarshalJSON(data []byte) error {
	got, err := Read(bytes.NewReader(data))
	if err != nil {
		return err
	}
	*s = *got
	return nil
}
