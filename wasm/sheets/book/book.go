// Package book is the call surface of the spreadsheet module
// (wasm/sheets): reading the cells of an .xlsx workbook and writing a run's
// results as one. It is separate from package api so that the main engine
// module does not link the spreadsheet library; the page loads this module
// only when a workbook is opened or exported.
package book

import (
	"bytes"
	"encoding/json"
	"time"

	"peerlens/engine/export"
	"peerlens/engine/export/xlsx"
	"peerlens/engine/sheet"
	"peerlens/wasm/api"
)

// Sheet is what Read returns: the names of the workbook's sheets, the one
// read, and its cells row by row (rows as in the sheet, trailing empty
// cells left out).
type Sheet struct {
	Sheets  []string   `json:"sheets"`
	Sheet   string     `json:"sheet"`
	Records [][]string `json:"records"`
}

// Read reads the named sheet (the first when name is "") of a workbook.
func Read(b []byte, name string) (*Sheet, error) {
	recs, names, err := sheet.ReadXLSXSheet(bytes.NewReader(b), name)
	if err != nil {
		return nil, err
	}
	if name == "" && len(names) > 0 {
		name = names[0]
	}
	if recs == nil {
		recs = [][]string{}
	}
	return &Sheet{Sheets: names, Sheet: name, Records: recs}, nil
}

// RecordsJSON is the sheet's cells as JSON text, the form the main module's
// parseRecords reads fastest.
func (s *Sheet) RecordsJSON() (string, error) {
	b, err := json.Marshal(s.Records)
	return string(b), err
}

// Write writes the workbook of a run (see package xlsx) from the study and
// result in the JSON forms the main module uses.
func Write(studyJSON, resultJSON []byte, date time.Time) ([]byte, error) {
	s, r, err := api.StudyAndResult(studyJSON, resultJSON)
	if err != nil {
		return nil, err
	}
	var b bytes.Buffer
	if err := xlsx.Write(&b, s, r, export.Meta{Date: date, Version: api.Version}); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}
