package sheet

import (
	"bytes"
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"peerlens/engine/table"
)

// workbook builds an invented two-sheet workbook in memory: depots with a
// name, staff, a currency-formatted budget, a percent-formatted share, an
// opening date and a true/false cell, and a blank row.
func workbook(t *testing.T) []byte {
	t.Helper()
	f := excelize.NewFile()
	defer f.Close()
	const s = "Depots"
	if err := f.SetSheetName("Sheet1", s); err != nil {
		t.Fatal(err)
	}
	if _, err := f.NewSheet("Notes"); err != nil {
		t.Fatal(err)
	}
	set := func(cell string, v any) {
		if err := f.SetCellValue(s, cell, v); err != nil {
			t.Fatal(err)
		}
	}
	style := func(cell string, st *excelize.Style) {
		id, err := f.NewStyle(st)
		if err != nil {
			t.Fatal(err)
		}
		if err := f.SetCellStyle(s, cell, cell, id); err != nil {
			t.Fatal(err)
		}
	}
	for j, h := range []string{"Depot", "Staff", "Budget", "Share", "Opened", "Audited"} {
		cell, _ := excelize.CoordinatesToCellName(j+1, 1)
		set(cell, h)
	}
	set("A2", "Harbour")
	set("B2", 12)
	set("C2", 1234.5)
	set("D2", 0.125)
	set("E2", time.Date(2024, 3, 31, 0, 0, 0, 0, time.UTC))
	set("F2", true)
	// Row 3 left blank.
	set("A4", "Hill, Annex")
	set("B4", 9.75)
	set("C4", 1.5e-7)
	set("D4", 0.5)
	set("E4", time.Date(2023, 11, 2, 8, 30, 0, 0, time.UTC))
	set("F4", false)
	set("A5", "Riverside")
	set("C5", 980)
	custom := "#,##0.00 \"EUR\""
	style("C2", &excelize.Style{CustomNumFmt: &custom})
	style("D2", &excelize.Style{NumFmt: 10}) // 0.00%
	style("D4", &excelize.Style{NumFmt: 9})  // 0%
	dateFmt := "dd.mm.yyyy"
	style("E2", &excelize.Style{CustomNumFmt: &dateFmt})
	style("E4", &excelize.Style{NumFmt: 22}) // m/d/yy h:mm
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestReadXLSX(t *testing.T) {
	rows, names, err := ReadXLSX(bytes.NewReader(workbook(t)))
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(names, []string{"Depots", "Notes"}) {
		t.Errorf("sheet names = %q", names)
	}
	want := [][]string{
		{"Depot", "Staff", "Budget", "Share", "Opened", "Audited"},
		{"Harbour", "12", "1234.5", "0.125", "2024-03-31", "TRUE"},
		nil,
		{"Hill, Annex", "9.75", "0.00000015", "0.5", "2023-11-02 08:30", "FALSE"},
		{"Riverside", "", "980"},
	}
	if len(rows) != len(want) {
		t.Fatalf("rows = %q, want %q", rows, want)
	}
	for i := range want {
		if len(rows[i]) == 0 && len(want[i]) == 0 {
			continue
		}
		if !reflect.DeepEqual(rows[i], want[i]) {
			t.Errorf("row %d = %q, want %q", i+1, rows[i], want[i])
		}
	}

	// Through the table reader: numbers as stored, a blank row and a blank
	// cell reported at their spreadsheet positions.
	tab, err := table.FromRecords(rows)
	if err != nil {
		t.Fatal(err)
	}
	if !tab.HasHeader || tab.NameColumn != 0 || len(tab.Rows) != 3 {
		t.Fatalf("table: header %v name column %d rows %d", tab.HasHeader, tab.NameColumn, len(tab.Rows))
	}
	staff, budget := tab.Columns[1].Values, tab.Columns[2].Values
	if staff[0] != 12 || staff[1] != 9.75 || !math.IsNaN(staff[2]) {
		t.Errorf("staff = %v", staff)
	}
	if budget[0] != 1234.5 || budget[1] != 1.5e-7 || budget[2] != 980 {
		t.Errorf("budget = %v", budget)
	}
	if tab.Columns[4].Numeric {
		t.Errorf("dates read as numbers: %v", tab.Columns[4].Values)
	}
	var blankRow, blankCell bool
	for _, p := range tab.Problems {
		blankRow = blankRow || p.Row == 3 && errors.Is(p, table.ErrBlankRow)
		blankCell = blankCell || p.Row == 5 && p.Column == 2 && errors.Is(p, table.ErrMissing)
		if errors.Is(p, table.ErrAmbiguousDecimal) || errors.Is(p, table.ErrRagged) {
			t.Errorf("unexpected problem for stored numbers: %v", p)
		}
	}
	if !blankRow || !blankCell {
		t.Errorf("want the blank row 3 and the blank cell at row 5 column 2 reported: %v", tab.Problems)
	}
}

func TestReadXLSXSheet(t *testing.T) {
	b := workbook(t)
	rows, _, err := ReadXLSXSheet(bytes.NewReader(b), "Notes")
	if err != nil || len(rows) != 0 {
		t.Errorf("empty sheet Notes: rows %q, err %v", rows, err)
	}
	_, names, err := ReadXLSXSheet(bytes.NewReader(b), "Missing")
	if !errors.Is(err, ErrNoSheet) || len(names) != 2 || !strings.Contains(err.Error(), `"Depots"`) {
		t.Errorf("missing sheet: names %q, err %v", names, err)
	}
}

func TestReadXLSXNotWorkbook(t *testing.T) {
	for _, in := range []string{"", "Depot\tStaff\n", "PK\x03\x04 not really a zip"} {
		if _, _, err := ReadXLSX(strings.NewReader(in)); !errors.Is(err, ErrNotWorkbook) {
			t.Errorf("ReadXLSX(%q) error = %v, want ErrNotWorkbook", in, err)
		}
	}
}

// TestDateCode checks the number-format codes read as dates or times.
func TestDateCode(t *testing.T) {
	cases := []struct {
		code string
		want bool
	}{
		{"dd.mm.yyyy", true},
		{"h:mm", true},
		{"[h]:mm:ss", true},
		{"yyyy\\-mm\\-dd", true},
		{"#,##0.00", false},
		{"#,##0.00 \"EUR\"", false},
		{"[$€-407] #,##0.00", false},
		{"0.00%", false},
		{"0.00E+00", false},
		{"_($* #,##0_);_($* (#,##0)", false},
		{"\"days\" 0", false},
	}
	for _, c := range cases {
		if got := dateCode(c.code); got != c.want {
			t.Errorf("dateCode(%q) = %v, want %v", c.code, got, c.want)
		}
	}
}
