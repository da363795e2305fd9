package export

import (
	"encoding/csv"
	"io"
	"strconv"
	"strings"

	"peerlens/engine/dea"
	"peerlens/engine/study"
)

// CSV writes the results of a run, one row per study unit with every number
// of the run (Results with wide set), as comma-separated text with a header
// row.
func CSV(w io.Writer, s *study.Study, r *dea.Result) error {
	t, err := Results(s, r, true)
	if err != nil {
		return err
	}
	return WriteCSV(w, t)
}

// WriteCSV writes one table as CSV. Numbers are written in full precision
// (they read back to the same float64); text that a spreadsheet would take
// for a formula gets a leading apostrophe (see Guard).
func WriteCSV(w io.Writer, t *Table) error {
	cw := csv.NewWriter(w)
	header := make([]string, len(t.Header))
	for i, h := range t.Header {
		header[i] = Guard(h)
	}
	if err := cw.Write(header); err != nil {
		return err
	}
	rec := make([]string, len(t.Header))
	for _, row := range t.Rows {
		for i := range rec {
			rec[i] = ""
			if i < len(row) {
				rec[i] = cellText(row[i])
			}
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

func cellText(c Cell) string {
	switch c.Kind {
	case Text:
		return Guard(c.Text)
	case Number:
		return formatNum(c.Num)
	}
	return ""
}

// formatNum is the shortest text that reads back as the same float64.
func formatNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Guard protects a text cell against being run as a formula when the CSV
// file is opened in a spreadsheet (CSV or formula injection): text starting
// with = + - @, a tab or a carriage return gets a leading apostrophe. Use it
// only for text; numbers such as -3 are written as they are.
func Guard(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}
