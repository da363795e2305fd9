package sheet

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"peerlens/engine/table"
)

// Sentinel errors, for errors.Is.
var (
	ErrNotWorkbook = errors.New("the file could not be read as an .xlsx workbook")
	ErrPassword    = errors.New("the workbook is protected by a password; save an unprotected copy and load that")
	ErrNoSheet     = errors.New("no sheet of that name in the workbook")
	ErrNoSheets    = errors.New("the workbook has no sheets")
)

// ReadXLSX reads the first sheet of an .xlsx workbook. It returns the
// sheet's cells row by row (row i of the result is the sheet's row i+1; rows
// leave out their empty trailing cells), and the names of all sheets, the
// first being the one read.
func ReadXLSX(r io.Reader) ([][]string, []string, error) {
	return ReadXLSXSheet(r, "")
}

// ReadXLSXSheet is ReadXLSX for the named sheet; an empty name reads the
// first sheet.
func ReadXLSXSheet(r io.Reader, name string) ([][]string, []string, error) {
	f, err := excelize.OpenReader(r)
	if err != nil {
		if errors.Is(err, excelize.ErrWorkbookPassword) || errors.Is(err, excelize.ErrWorkbookFileFormat) && isEncrypted(err) {
			return nil, nil, ErrPassword
		}
		return nil, nil, fmt.Errorf("%w: %v", ErrNotWorkbook, err)
	}
	defer f.Close()
	names := f.GetSheetList()
	if len(names) == 0 {
		return nil, nil, ErrNoSheets
	}
	if name == "" {
		name = names[0]
	} else if idx, _ := f.GetSheetIndex(name); idx < 0 {
		return nil, names, fmt.Errorf("%w: %q (the sheets are %s)", ErrNoSheet, name, strings.Join(quoteAll(names), ", "))
	}
	raw, err := f.GetRows(name, excelize.Options{RawCellValue: true})
	if err != nil {
		return nil, names, fmt.Errorf("%w: sheet %q: %v", ErrNotWorkbook, name, err)
	}
	shown, err := f.GetRows(name)
	if err != nil {
		return nil, names, fmt.Errorf("%w: sheet %q: %v", ErrNotWorkbook, name, err)
	}
	d := newDates(f)
	for i, row := range raw {
		for j, v := range row {
			row[j] = d.text(name, i, j, v, cellAt(shown, i, j))
		}
	}
	return raw, names, nil
}

func cellAt(rows [][]string, i, j int) string {
	if i < len(rows) && j < len(rows[i]) {
		return rows[i][j]
	}
	return ""
}

func isEncrypted(err error) bool { return strings.Contains(strings.ToLower(err.Error()), "encrypt") }

func quoteAll(names []string) []string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = strconv.Quote(n)
	}
	return q
}

// dates turns the stored value of a cell into its text: date and time cells
// into ISO text, true/false cells into TRUE/FALSE, other cells unchanged. It
// remembers which cell styles show dates.
type dates struct {
	f        *excelize.File
	date1904 bool
	isDate   map[int]bool // style index -> number format shows a date or time
}

func newDates(f *excelize.File) *dates {
	d := &dates{f: f, isDate: map[int]bool{}}
	if p, err := f.GetWorkbookProps(); err == nil && p.Date1904 != nil {
		d.date1904 = *p.Date1904
	}
	return d
}

// text chooses a cell's text from its stored value and the value as the
// spreadsheet shows it. The stored value is kept unless it is a number shown
// as TRUE or FALSE, or as something that is not a number; only then is the
// cell's number format looked up (which makes excelize read the whole sheet
// into memory), to turn a date or time into ISO text.
func (d *dates) text(sheet string, i, j int, stored, shown string) string {
	if stored == "" || stored == shown {
		return stored
	}
	num, err := strconv.ParseFloat(stored, 64)
	if err != nil {
		return stored // text, or an error such as #DIV/0!
	}
	if shown == "TRUE" || shown == "FALSE" {
		return shown
	}
	if _, err := table.ParseNumber(shown, false); err == nil {
		return stored // a number formatted with separators, currency or percent
	}
	if _, err := table.ParseNumber(shown, true); err == nil {
		return stored
	}
	cell, err := excelize.CoordinatesToCellName(j+1, i+1)
	if err != nil {
		return stored
	}
	style, err := d.f.GetCellStyle(sheet, cell)
	if err != nil || style == 0 {
		return stored
	}
	isDate, ok := d.isDate[style]
	if !ok {
		if st, err := d.f.GetStyle(style); err == nil {
			isDate = dateFormat(st)
		}
		d.isDate[style] = isDate
	}
	if !isDate {
		return stored
	}
	return isoDate(num, d.date1904, stored)
}

// isoDate writes a date serial as ISO text: the date, the time, or both.
func isoDate(serial float64, date1904 bool, stored string) string {
	t, err := excelize.ExcelDateToTime(serial, date1904)
	if err != nil || math.IsNaN(serial) {
		return stored
	}
	whole, frac := math.Modf(serial)
	switch {
	case whole == 0 && frac > 0:
		return t.Format("15:04:05")
	case frac == 0:
		return t.Format("2006-01-02")
	case t.Second() == 0:
		return t.Format("2006-01-02 15:04")
	}
	return t.Format("2006-01-02 15:04:05")
}

// dateFormat reports whether a cell style's number format shows a date or a
// time: the built-in date and time formats (ids 14-22, 27-36, 45-47, 50-58),
// or a custom format code with a year, month, day, hour or second part
// outside quoted text and [brackets].
func dateFormat(st *excelize.Style) bool {
	if st.CustomNumFmt != nil {
		return dateCode(*st.CustomNumFmt)
	}
	id := st.NumFmt
	return id >= 14 && id <= 22 || id >= 27 && id <= 36 || id >= 45 && id <= 47 || id >= 50 && id <= 58
}

func dateCode(code string) bool {
	for i := 0; i < len(code); i++ {
		switch c := code[i]; c {
		case '"':
			if j := strings.IndexByte(code[i+1:], '"'); j >= 0 {
				i += j + 1
			} else {
				return false
			}
		case '[':
			if j := strings.IndexByte(code[i+1:], ']'); j >= 0 {
				// Elapsed-time parts such as [h] are times.
				inner := strings.ToLower(code[i+1 : i+1+j])
				if inner == "h" || inner == "hh" || inner == "m" || inner == "mm" || inner == "s" || inner == "ss" {
					return true
				}
				i += j + 1
			} else {
				return false
			}
		case '\\', '_', '*':
			i++ // escaped, padding or fill character
		case 'y', 'Y', 'd', 'D', 'h', 'H', 's', 'S', 'm', 'M':
			return true
		}
	}
	return false
}
