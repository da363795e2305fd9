package table

import (
	"math"
	"testing"
)

// checkInvariants asserts what every Table must satisfy, whatever the input.
func checkInvariants(t *testing.T, tab *Table) {
	t.Helper()
	w := len(tab.Header)
	if len(tab.Columns) != w {
		t.Fatalf("%d columns for %d header names", len(tab.Columns), w)
	}
	maxRow := 0
	seen := map[string]bool{}
	for _, h := range tab.Header {
		if h == "" || seen[h] {
			t.Errorf("header name %q empty or repeated in %q", h, tab.Header)
		}
		seen[h] = true
	}
	for i, r := range tab.Rows {
		if len(r.Cells) != w {
			t.Fatalf("row %d has %d cells, header %d", i, len(r.Cells), w)
		}
		if r.Line <= maxRow || r.StartLine < r.Line {
			t.Errorf("row %d: record %d start line %d after record %d", i, r.Line, r.StartLine, maxRow)
		}
		maxRow = r.Line
	}
	for j, c := range tab.Columns {
		if len(c.Values) != len(tab.Rows) {
			t.Fatalf("column %d has %d values for %d rows", j, len(c.Values), len(tab.Rows))
		}
		if c.Name != tab.Header[j] {
			t.Errorf("column %d named %q, header %q", j, c.Name, tab.Header[j])
		}
	}
	if tab.NameColumn < -1 || tab.NameColumn >= w || tab.NameColumn >= 0 && tab.Columns[tab.NameColumn].Numeric {
		t.Errorf("NameColumn %d out of range or numeric", tab.NameColumn)
	}
	last := tab.HeaderRow
	if len(tab.Rows) > 0 {
		last = tab.Rows[len(tab.Rows)-1].Line
	}
	if tab.HasHeader != (tab.HeaderRow > 0) || len(tab.Rows) > 0 && tab.Rows[0].Line <= tab.HeaderRow {
		t.Errorf("HasHeader %v with HeaderRow %d", tab.HasHeader, tab.HeaderRow)
	}
	for _, p := range tab.Problems {
		if p.Row < 0 || p.Column < 0 || p.Column > w || p.Err == nil || p.Severity == "" {
			t.Errorf("problem out of range or empty: %+v (width %d)", p, w)
		}
		if p.Row > last {
			t.Errorf("problem row %d after the last row %d: %v", p.Row, last, p)
		}
		if p.Error() == "" || p.Reason() == "" {
			t.Errorf("problem without text: %+v", p)
		}
	}
	// Never silent: a numeric column's NaN always has a problem at its cell.
	type at struct{ row, col int }
	flagged := map[at]bool{}
	for _, p := range tab.Problems {
		flagged[at{p.Row, p.Column}] = true
	}
	for j, c := range tab.Columns {
		if !c.Numeric {
			continue
		}
		for i, v := range c.Values {
			if math.IsNaN(v) && !flagged[at{tab.Rows[i].Line, j + 1}] {
				t.Errorf("row %d, column %d (%q) is NaN with no problem reported", tab.Rows[i].Line, j+1, tab.Rows[i].Cells[j])
			}
		}
	}
}
