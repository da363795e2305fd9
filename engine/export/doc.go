// Package export writes a run's results in forms other programs read: CSV
// (one row per unit, every number of the run) and a JSON encoding that
// writes undefined numbers (NaN, infinities) as null. The spreadsheet form is
// in package xlsx, so programs that only need CSV do not link a spreadsheet
// library.
//
// The tables are built once (Results, Targets, Weights, Settings, Data) as
// typed cells and written by each format. Column and sheet names are
// Peerlens's own. Text cells that a spreadsheet would read as a formula
// (starting with = + - @, a tab or a carriage return) are written with a
// leading apostrophe in CSV; numbers are never altered.
package export
