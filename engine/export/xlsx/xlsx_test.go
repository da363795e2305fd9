package xlsx

import (
	"bytes"
	"math"
	"slices"
	"strconv"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"peerlens/engine/export"
	"peerlens/engine/export/internal/fixture"
)

// The workbook read back holds exactly the cells written: same sheets, same
// header, text as text (formula-like names stay strings), numbers as numbers
// with the same value to 15 significant digits, empty cells empty.
func TestWorkbookReadsBack(t *testing.T) {
	s, r := fixture.Study()
	meta := export.Meta{Date: time.Date(2026, 1, 2, 3, 4, 0, 0, time.UTC), Version: "test"}
	var b bytes.Buffer
	if err := Write(&b, s, r, meta); err != nil {
		t.Fatal(err)
	}
	tables, err := Tables(s, r, meta)
	if err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(&b)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if got := f.GetSheetList(); !slices.Equal(got, Sheets) {
		t.Fatalf("sheets %q, want %q", got, Sheets)
	}
	for _, tab := range tables {
		rows, err := f.GetRows(tab.Name, excelize.Options{RawCellValue: true})
		if err != nil {
			t.Fatal(err)
		}
		if len(rows) != len(tab.Rows)+1 {
			t.Errorf("%s: %d rows, want %d", tab.Name, len(rows), len(tab.Rows)+1)
			continue
		}
		if !slices.Equal(rows[0], tab.Header) {
			t.Errorf("%s: header %q, want %q", tab.Name, rows[0], tab.Header)
		}
		for i, row := range tab.Rows {
			for j, c := range row {
				name, _ := excelize.CoordinatesToCellName(j+1, i+2)
				got := ""
				if j < len(rows[i+1]) {
					got = rows[i+1][j]
				}
				typ, err := f.GetCellType(tab.Name, name)
				if err != nil {
					t.Fatal(err)
				}
				switch c.Kind {
				case export.Empty:
					if got != "" {
						t.Errorf("%s!%s = %q, want empty", tab.Name, name, got)
					}
				case export.Text:
					if got != c.Text {
						t.Errorf("%s!%s = %q, want %q", tab.Name, name, got, c.Text)
					}
					if typ == excelize.CellTypeFormula || typ == excelize.CellTypeNumber {
						t.Errorf("%s!%s: text stored as type %v", tab.Name, name, typ)
					}
					if formula, _ := f.GetCellFormula(tab.Name, name); formula != "" {
						t.Errorf("%s!%s: text %q became the formula %q", tab.Name, name, c.Text, formula)
					}
				case export.Number:
					// Spreadsheets keep 15 significant digits (Excel's documented
					// limit; excelize truncates to it), so the workbook holds each
					// number to within one part in 1e14. The CSV holds them exactly.
					v, err := strconv.ParseFloat(got, 64)
					if err != nil || math.Abs(v-c.Num) > 1e-14*math.Abs(c.Num) {
						t.Errorf("%s!%s = %q, want the number %v", tab.Name, name, got, c.Num)
					}
					if typ != excelize.CellTypeUnset && typ != excelize.CellTypeNumber {
						t.Errorf("%s!%s: number stored as type %v", tab.Name, name, typ)
					}
				}
			}
		}
	}
	// Spot checks against the fixture itself, not only against Tables.
	if v, _ := f.GetCellValue("Results", "A3"); v != `=HYPERLINK("x")` {
		t.Errorf("Results!A3 = %q", v)
	}
	if v, _ := f.GetCellValue("Results", "C5"); v != export.StatusLeftOut {
		t.Errorf("Results!C5 = %q, want %q", v, export.StatusLeftOut)
	}
	if v, _ := f.GetCellValue("Data", "B5"); v != export.StatusLeftOut {
		t.Errorf("Data!B5 = %q, want %q", v, export.StatusLeftOut)
	}
}

func TestMismatchIsAnError(t *testing.T) {
	s, r := fixture.Study()
	r.Units = r.Units[:1]
	if err := Write(&bytes.Buffer{}, s, r, export.Meta{}); err == nil {
		t.Error("Write accepted a result of another study")
	}
}
