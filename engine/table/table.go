package table

import "fmt"

// Severity says how much a Problem matters.
type Severity string

const (
	Note    Severity = "note"    // something was read in a way the user should know about
	Warning Severity = "warning" // the value was read but may not be what was meant
	Error   Severity = "error"   // the cell could not be read; its value is missing
)

// Problem is one issue found in the user's table, tied to a cell, in the
// spirit of encoding/csv's ParseError: where, the cell's text, and why.
type Problem struct {
	Row      int      // 1-based row of the source text (record number, header included); 0 = whole table
	Column   int      // 1-based column; 0 = whole row
	Text     string   // the cell's text as typed
	Err      error    // a sentinel from this package, for errors.Is
	Severity Severity // note, warning or error
}

func (p *Problem) Error() string {
	switch {
	case p.Row == 0 && p.Column == 0:
		return fmt.Sprintf("table: %v", p.Err)
	case p.Column == 0:
		return fmt.Sprintf("row %d: %v", p.Row, p.Err)
	default:
		return fmt.Sprintf("row %d, column %d (%q): %v", p.Row, p.Column, p.Text, p.Err)
	}
}

func (p *Problem) Unwrap() error { return p.Err }

// Row is one data row as read, with its position in the source.
type Row struct {
	Line  int      // 1-based record number in the source (header counts as 1 when present)
	Cells []string // cell texts, padded to the table's width
}

// Column is one column with its numbers read.
type Column struct {
	Name         string
	Numeric      bool      // most non-blank cells read as numbers
	Values       []float64 // one per Table.Rows entry; NaN where blank or unreadable
	DecimalComma bool      // numbers were read with ',' as the decimal mark
	Percent      bool      // cells carried a trailing '%'; values are the numbers as typed (12% -> 12)
	Currency     string    // currency sign that was stripped, if any
	Note         string    // how the column was read, in plain words, for the page
}

// Table is a user's table as read: cells, numbers, and every problem found.
type Table struct {
	Delimiter  rune
	HasHeader  bool
	Header     []string // one name per column; invented ("Column 3") when there is no header
	Rows       []Row    // data rows; blank rows are left out here and reported in Problems
	Columns    []Column
	NameColumn int // index of the column offered as unit names, -1 if none
	Problems   []*Problem
}
