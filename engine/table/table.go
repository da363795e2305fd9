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
//
// Row is the record number, not the line number: a quoted cell holding line
// breaks makes one record span several lines of text, and the record number is
// what a spreadsheet shows as its row number when the table was copied from
// row 1. Line gives the line of the text where that record starts.
//
// A problem about a whole column has Row 0, Column set and Text holding the
// column's name; a problem about a whole row has Column 0; a problem about the
// whole table has both 0.
type Problem struct {
	Row      int      // 1-based row of the source text (record number, header included); 0 = whole table or column
	Column   int      // 1-based column; 0 = whole row
	Text     string   // the cell's text as typed (the column's name for a whole-column problem)
	Err      error    // wraps a sentinel from this package, for errors.Is; its text is the plain reason
	Severity Severity // note, warning or error
	Line     int      // 1-based line of the text where the row starts; 0 when Row is 0
}

// Error gives the position and the reason, for logs and lists of problems.
func (p *Problem) Error() string {
	switch {
	case p.Row == 0 && p.Column == 0:
		return fmt.Sprintf("table: %v", p.Err)
	case p.Row == 0:
		return fmt.Sprintf("column %d (%q): %v", p.Column, p.Text, p.Err)
	case p.Column == 0:
		return fmt.Sprintf("row %d: %v", p.Row, p.Err)
	default:
		return fmt.Sprintf("row %d, column %d (%q): %v", p.Row, p.Column, p.Text, p.Err)
	}
}

// Reason is the plain-English reason alone, without the position, for
// showing on the cell itself in the page.
func (p *Problem) Reason() string {
	if p.Err == nil {
		return ""
	}
	return p.Err.Error()
}

func (p *Problem) Unwrap() error { return p.Err }

// Row is one data row as read, with its position in the source.
type Row struct {
	Line      int      // 1-based record number in the source (header counts as 1 when present)
	Cells     []string // cell texts, padded to the table's width
	StartLine int      // 1-based line of the text where the row starts (differs from Line after quoted line breaks)
}

// Column is one column with its numbers read.
type Column struct {
	Name         string
	Numeric      bool      // most non-blank cells read as numbers
	Values       []float64 // one per Table.Rows entry; NaN where blank or unreadable
	DecimalComma bool      // numbers were read with ',' as the decimal mark
	Percent      bool      // cells carried a trailing '%'; values are the numbers as typed (12% -> 12)
	Currency     string    // currency sign that was stripped, if any (several are joined by ", ")
	Note         string    // how the column was read, in plain words, for the page
}

// Table is a user's table as read: cells, numbers, and every problem found.
type Table struct {
	Delimiter  rune // '\t', ';' or ','; 0 when the cells came from FromRecords
	HasHeader  bool
	HeaderRow  int      // record number of the header row, 0 when there is none
	Header     []string // one name per column; invented ("Column 3") when there is no header
	Rows       []Row    // data rows; blank rows are left out here and reported in Problems
	Columns    []Column
	NameColumn int // index of the column offered as unit names, -1 if none
	Problems   []*Problem
}
