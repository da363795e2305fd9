// Package sheet reads the cells of a spreadsheet file (.xlsx) as text, ready
// for table.FromRecords.
//
// Numbers come back in the form the file stores them (1234.5, 0.125,
// 0.00000015), never formatted for a locale, so that "1,234.50 €" on screen is
// "1234.5" here and the table reader has no decimal mark to guess. Cells
// formatted as dates or times come back as ISO text (2024-03-31,
// 2024-03-31 08:30, 08:30:15), true/false cells as TRUE and FALSE, formula
// cells as the value last saved with the file, and error cells as the
// spreadsheet shows them (#DIV/0!).
//
// The package depends on excelize and is kept apart from package table so
// that the main WebAssembly module, which reads pasted text, stays small.
package sheet
