// Package xlsx writes a run's results as a spreadsheet workbook (.xlsx) with
// the sheets Results, Targets, Weights, Settings and Data (see package
// export for what each holds). It is separate from package export so that
// only programs that write workbooks link the spreadsheet library
// (github.com/xuri/excelize/v2).
//
// Numbers are stored as numbers (to the 15 significant digits spreadsheets
// keep; the CSV export keeps every digit) and text as text: a unit named
// "=1+1" is a string cell, never a formula, so no apostrophe is added here.
package xlsx
