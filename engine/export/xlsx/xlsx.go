package xlsx

import (
	"fmt"
	"io"

	"github.com/xuri/excelize/v2"

	"peerlens/engine/dea"
	"peerlens/engine/export"
	"peerlens/engine/study"
)

// Sheets are the names of the workbook's sheets, in order.
var Sheets = []string{"Results", "Targets", "Weights", "Settings", "Data"}

// Tables builds the tables of the workbook, one per sheet, in Sheets order.
func Tables(s *study.Study, r *dea.Result, meta export.Meta) ([]*export.Table, error) {
	res, err := export.Results(s, r, false)
	if err != nil {
		return nil, err
	}
	tg, err := export.Targets(s, r)
	if err != nil {
		return nil, err
	}
	w, err := export.Weights(s, r)
	if err != nil {
		return nil, err
	}
	return []*export.Table{res, tg, w, export.Settings(s, r, meta), export.Data(s)}, nil
}

// Write writes the workbook for a run to w.
func Write(w io.Writer, s *study.Study, r *dea.Result, meta export.Meta) error {
	tables, err := Tables(s, r, meta)
	if err != nil {
		return err
	}
	return WriteTables(w, tables)
}

// WriteTables writes tables as the sheets of one workbook, each with its
// header in bold and frozen.
func WriteTables(w io.Writer, tables []*export.Table) (err error) {
	f := excelize.NewFile()
	defer func() {
		if cerr := f.Close(); err == nil {
			err = cerr
		}
	}()
	bold, err := f.NewStyle(&excelize.Style{Font: &excelize.Font{Bold: true}})
	if err != nil {
		return err
	}
	for i, t := range tables {
		if i == 0 {
			if err := f.SetSheetName("Sheet1", t.Name); err != nil {
				return err
			}
		} else if _, err := f.NewSheet(t.Name); err != nil {
			return err
		}
		if err := writeSheet(f, t, bold); err != nil {
			return fmt.Errorf("xlsx: sheet %s: %w", t.Name, err)
		}
	}
	f.SetActiveSheet(0)
	_, err = f.WriteTo(w)
	return err
}

func writeSheet(f *excelize.File, t *export.Table, bold int) error {
	sw, err := f.NewStreamWriter(t.Name)
	if err != nil {
		return err
	}
	if err := sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"}); err != nil {
		return err
	}
	header := make([]any, len(t.Header))
	for i, h := range t.Header {
		header[i] = excelize.Cell{StyleID: bold, Value: h}
	}
	if err := sw.SetRow("A1", header); err != nil {
		return err
	}
	vals := make([]any, len(t.Header))
	for i, row := range t.Rows {
		for j := range vals {
			vals[j] = nil
			if j < len(row) {
				switch c := row[j]; c.Kind {
				case export.Text:
					vals[j] = c.Text
				case export.Number:
					vals[j] = c.Num
				}
			}
		}
		cell, err := excelize.CoordinatesToCellName(1, i+2)
		if err != nil {
			return err
		}
		if err := sw.SetRow(cell, vals); err != nil {
			return err
		}
	}
	return sw.Flush()
}
