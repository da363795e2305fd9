// Package table reads the table an analyst pastes or loads: cells, numbers,
// and every problem found, each tied to its row and column.
//
// The input is usually what a spreadsheet puts on the clipboard: cells
// separated by tabs, rows ended by CRLF, and a cell that holds a tab, a line
// break or a quote wrapped in quotes with its quotes doubled:
//
//	Clinic⇥Staff⇥Budget⇥Visits
//	"North
//	Wing"⇥12⇥1,234.5⇥3400
//	South⇥⇥(200)⇥n/a
//
// (⇥ stands for a tab.) The same table saved as CSV, with commas or
// semicolons, is read the same way; the delimiter is detected:
//
//	Clinic;Staff;Budget;Visits
//	"North
//	Wing";12;1.234,5;3400
//
// Parse reads text, ParseBytes reads bytes (UTF-8, UTF-16 with a byte order
// mark as spreadsheets save "Unicode text", or Windows-1252), and FromRecords
// takes cells already split, such as those of a spreadsheet file (see
// package peerlens/engine/sheet). Options let the page overrule any guess.
//
// # What is decided, and how it is shown
//
// Header: the first non-blank row is the header when it holds text above
// columns of numbers; otherwise the columns are named "Column 1", "Column 2"
// and so on. Empty names are filled in and repeated names made unique
// ("Staff (2)").
//
// Numbers: a cell may carry a sign (+, - or the minus sign U+2212),
// accounting brackets for a negative, a currency sign or code before or
// after, a trailing percent sign (the number is kept as typed: 12% is 12),
// thousands separators (comma, point, space, no-break or narrow no-break
// space, apostrophe) and an exponent. Whether ',' or '.' is the decimal mark
// is decided per column from all of its cells: 1,234 alone could be either,
// but next to 0,5 it is 1.234 and next to 1,234.5 it is 1234. A column whose
// cells never settle it follows the table (semicolon-separated tables lean to
// the decimal comma) and gets a warning. The choice is always written in
// Column.Note.
//
// Unit names: the first column of mostly text is offered as the unit names
// (Table.NameColumn), or -1 when there is none.
//
// # Problems, not errors
//
// Only an empty input is an error. Everything else is a Problem in
// Table.Problems: a note (read in a way the user should know about), a
// warning (read, but perhaps not as meant) or an error (the cell could not be
// read; its value is NaN). Blank cells and markers such as n/a, -, #N/A and
// #DIV/0! in a numeric column are missing values (NaN, warning); text is
// "not a number" (NaN, error). Blank rows are left out and noted; short rows
// are padded and warned about; rows of text among numbers are kept and their
// cells reported. A row so much wider than the rest that padding every row
// to it would make the table mostly empty (a broken paste) is cut to the
// table's width with an error naming what was not read. Nothing typed is
// dropped without a word. Cell problems are reported for numeric columns;
// a text column's Values hold whatever of it reads as numbers, NaN elsewhere.
//
// Positions: Problem.Row and Row.Line are record numbers counted from 1
// with the header and blank rows included, which is the spreadsheet's row
// number when the table was copied from its first row. A quoted cell holding
// line breaks makes one record span several lines of text; Problem.Line and
// Row.StartLine give the line where the record starts. A problem about a
// whole column has Row 0 and the column's name as Text.
//
// Each Problem's Err wraps a sentinel such as ErrNotNumber or ErrMissing
// (test with errors.Is) and its text is a plain reason ready to show on the
// cell; Problem.Error adds the position.
package table
