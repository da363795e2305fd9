package api

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"

	"peerlens/engine/dea"
	"peerlens/engine/export"
	"peerlens/engine/report"
	"peerlens/engine/study"
	"peerlens/engine/table"
)

// Version is the Peerlens version written into exports.
const Version = "0.1.0"

// TableView is the table as read, for the page's preview: the cell texts
// with their source lines and how each column was read. The numbers travel
// in the study, not here.
type TableView struct {
	Delimiter  string       `json:"delimiter"`
	HasHeader  bool         `json:"hasHeader"`
	Header     []string     `json:"header"`
	Rows       []rowView    `json:"rows"`
	Columns    []columnView `json:"columns"`
	NameColumn int          `json:"nameColumn"`
}

type rowView struct {
	Line  int      `json:"line"`
	Cells []string `json:"cells"`
}

type columnView struct {
	Name         string `json:"name"`
	Numeric      bool   `json:"numeric"`
	DecimalComma bool   `json:"decimalComma"`
	Percent      bool   `json:"percent"`
	Currency     string `json:"currency"`
	Note         string `json:"note"`
}

// Problem is a table problem for the page: where, the cell's text, and the
// reason in plain words (Message includes the position, Reason does not).
type Problem struct {
	Row      int    `json:"row"`
	Column   int    `json:"column"`
	Text     string `json:"text"`
	Severity string `json:"severity"`
	Message  string `json:"message"`
	Reason   string `json:"reason"`
}

// Issue is a study issue for the page (study.Issue with JSON names).
type Issue struct {
	Severity string `json:"severity"`
	Code     string `json:"code"`
	Message  string `json:"message"`
	Units    []int  `json:"units"`
	Measures []int  `json:"measures"`
}

// Parsed is what Parse returns: the table view, the study made from it (in
// its file form) and every problem found while reading.
type Parsed struct {
	Table    *TableView      `json:"table"`
	Study    json.RawMessage `json:"study"`
	Problems []Problem       `json:"problems"`
}

// Parse reads pasted or file text (CSV, TSV, ...) into a table and a study.
func Parse(text string) ([]byte, error) {
	t, err := table.Parse(text)
	return parsed(t, err)
}

// ParseBytes reads the bytes of a text file, working out its encoding
// (UTF-8, UTF-16 with a byte-order mark, or Windows-1252).
func ParseBytes(b []byte) ([]byte, error) {
	t, err := table.ParseBytes(b)
	return parsed(t, err)
}

// ParseRecords reads records already split into cells (from a spreadsheet).
func ParseRecords(records [][]string) ([]byte, error) {
	t, err := table.FromRecords(records)
	return parsed(t, err)
}

func parsed(t *table.Table, err error) ([]byte, error) {
	if t == nil {
		if err == nil {
			err = errors.New("the table could not be read")
		}
		return nil, err
	}
	out := Parsed{Table: view(t), Problems: problems(t.Problems)}
	if err == nil {
		var b bytes.Buffer
		if werr := study.FromTable(t).Write(&b); werr != nil {
			return nil, werr
		}
		out.Study = b.Bytes()
	} else {
		// The table was read in part: show it and its problems, with the
		// reason it cannot become a study.
		out.Study = json.RawMessage("null")
		out.Problems = append(out.Problems, Problem{Severity: string(table.Error), Message: err.Error(), Reason: err.Error()})
	}
	return export.JSON(out)
}

func view(t *table.Table) *TableView {
	v := &TableView{Delimiter: string(t.Delimiter), HasHeader: t.HasHeader, Header: nonNil(t.Header), NameColumn: t.NameColumn}
	if t.Delimiter == 0 {
		v.Delimiter = ""
	}
	v.Rows = make([]rowView, len(t.Rows))
	for i, r := range t.Rows {
		v.Rows[i] = rowView{Line: r.Line, Cells: nonNil(r.Cells)}
	}
	v.Columns = make([]columnView, len(t.Columns))
	for j, c := range t.Columns {
		v.Columns[j] = columnView{Name: c.Name, Numeric: c.Numeric, DecimalComma: c.DecimalComma, Percent: c.Percent, Currency: c.Currency, Note: c.Note}
	}
	return v
}

func problems(ps []*table.Problem) []Problem {
	out := make([]Problem, 0, len(ps))
	for _, p := range ps {
		out = append(out, Problem{Row: p.Row, Column: p.Column, Text: p.Text, Severity: string(p.Severity), Message: p.Error(), Reason: p.Reason()})
	}
	return out
}

func nonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}

// Demo returns the demo study in its file form.
func Demo() ([]byte, error) { return writeStudy(study.Demo()) }

func writeStudy(s *study.Study) ([]byte, error) {
	var b bytes.Buffer
	if err := s.Write(&b); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// ReadStudy reads a study in its file form.
func ReadStudy(data []byte) (*study.Study, error) {
	return study.Read(bytes.NewReader(data))
}

// Validate checks a study and returns its issues.
func Validate(studyJSON []byte) ([]byte, error) {
	s, err := ReadStudy(studyJSON)
	if err != nil {
		return nil, err
	}
	return export.JSON(issues(study.Validate(s)))
}

func issues(is []study.Issue) []Issue {
	out := make([]Issue, len(is))
	for i, x := range is {
		out[i] = Issue{Severity: string(x.Severity), Code: x.Code, Message: x.Message, Units: nonNil(x.Units), Measures: nonNil(x.Measures)}
	}
	return out
}

// ReadResult reads a result in the form Run writes, putting back the
// numbers that travelled as null: the percentage change of a measure whose
// value is zero, and the score of a unit that was not solved, are NaN.
func ReadResult(data []byte) (*dea.Result, error) {
	var r dea.Result
	if err := json.Unmarshal(data, &r); err != nil {
		return nil, fmt.Errorf("the results could not be read: %w", err)
	}
	for k := range r.Units {
		u := &r.Units[k]
		if u.Status == dea.NotSolved {
			u.Score = math.NaN()
		}
		for _, ts := range [][]dea.Target{u.Inputs, u.Outputs} {
			for i := range ts {
				if ts[i].Value == 0 {
					ts[i].Change = math.NaN()
				}
			}
		}
	}
	return &r, nil
}

// Explain returns the plain-words report of one unit's result under model.
func Explain(modelJSON, unitJSON []byte) ([]byte, error) {
	var m dea.Model
	if err := json.Unmarshal(modelJSON, &m); err != nil {
		return nil, fmt.Errorf("the model settings could not be read: %w", err)
	}
	r, err := ReadResult([]byte(`{"units":[` + string(unitJSON) + `]}`))
	if err != nil {
		return nil, err
	}
	if len(r.Units) != 1 {
		return nil, errors.New("no unit to explain")
	}
	return export.JSON(report.Unit(r.Units[0], m))
}

// Method describes a model in plain words, with sources and the cautions.
type Method struct {
	report.Method
	Cautions []string `json:"cautions"`
}

// Describe explains model settings in plain words.
func Describe(modelJSON []byte) ([]byte, error) {
	var m dea.Model
	if err := json.Unmarshal(modelJSON, &m); err != nil {
		return nil, fmt.Errorf("the model settings could not be read: %w", err)
	}
	return export.JSON(Method{Method: report.Describe(m), Cautions: report.Cautions})
}

// ExportCSV writes a run's results as CSV text.
func ExportCSV(studyJSON, resultJSON []byte) (string, error) {
	s, r, err := StudyAndResult(studyJSON, resultJSON)
	if err != nil {
		return "", err
	}
	var b bytes.Buffer
	if err := export.CSV(&b, s, r); err != nil {
		return "", err
	}
	return b.String(), nil
}

// StudyAndResult reads a study and the result of its run.
func StudyAndResult(studyJSON, resultJSON []byte) (*study.Study, *dea.Result, error) {
	s, err := ReadStudy(studyJSON)
	if err != nil {
		return nil, nil, err
	}
	r, err := ReadResult(resultJSON)
	if err != nil {
		return nil, nil, err
	}
	return s, r, nil
}
