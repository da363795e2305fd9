package table

import (
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"
)

// problemAt finds the problem at row, col wrapping want, or nil.
func problemAt(tab *Table, row, col int, want error) *Problem {
	for _, p := range tab.Problems {
		if p.Row == row && p.Column == col && errors.Is(p, want) {
			return p
		}
	}
	return nil
}

func mustParse(t *testing.T, text string) *Table {
	t.Helper()
	tab, err := Parse(text)
	if err != nil {
		t.Fatalf("Parse(%q): %v", text, err)
	}
	checkInvariants(t, tab)
	return tab
}

// sameValues compares float slices treating NaN as equal to NaN.
func sameValues(got, want []float64) bool {
	if len(got) != len(want) {
		return false
	}
	for i := range got {
		if math.IsNaN(got[i]) != math.IsNaN(want[i]) || !math.IsNaN(want[i]) && math.Abs(got[i]-want[i]) > 1e-9*math.Max(1, math.Abs(want[i])) {
			return false
		}
	}
	return true
}

var nan = math.NaN()

// TestDecimalPerColumn: the decimal mark is decided per column from all of
// its cells, shown in the column's note, and warned about when the column
// alone cannot tell.
func TestDecimalPerColumn(t *testing.T) {
	cases := []struct {
		name      string
		text      string
		comma     bool
		values    []float64
		ambiguous bool   // a Warning ErrAmbiguousDecimal on the column
		note      string // a piece of Column.Note
	}{
		{"point evidence decides an ambiguous cell", "A\tB\nx\t1,234\ny\t1,234.5\n", false, []float64{1234, 1234.5}, false, "decimal point"},
		{"comma evidence decides an ambiguous cell", "A\tB\nx\t1,234\ny\t0,5\n", true, []float64{1.234, 0.5}, false, "decimal comma"},
		{"dot groups decide comma", "A\tB\nx\t1.234\ny\t1.234,5\n", true, []float64{1234, 1234.5}, false, "decimal comma"},
		{"alone, 1,234 is read with a point and warned", "A\tB\nx\t1,234\ny\t2,500\n", false, []float64{1234, 2500}, true, "1,234 is 1234"},
		{"alone, 1.234 is read with a point and warned", "A\tB\nx\t1.234\ny\t2.500\n", false, []float64{1.234, 2.5}, true, "1.234 is 1.234"},
		{"semicolons lean to a decimal comma", "A;B\nx;1,234\ny;2,500\n", true, []float64{1.234, 2.5}, true, "semicolons"},
		{"other columns lean to a decimal comma", "A\tB\tC\nx\t1,234\t0,5\ny\t2,500\t1,5\n", true, []float64{1.234, 2.5}, true, "other columns"},
		{"whole numbers", "A\tB\nx\t1\ny\t2\n", false, []float64{1, 2}, false, "whole numbers"},
		{"space thousands with decimal comma", "A\tB\nx\t1 234,5\ny\t12\n", true, []float64{1234.5, 12}, false, "decimal comma"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			tab := mustParse(t, c.text)
			col := tab.Columns[1]
			if col.DecimalComma != c.comma || !sameValues(col.Values, c.values) {
				t.Errorf("column B: comma=%v values=%v, want comma=%v values=%v", col.DecimalComma, col.Values, c.comma, c.values)
			}
			p := problemAt(tab, 0, 2, ErrAmbiguousDecimal)
			if (p != nil) != c.ambiguous {
				t.Errorf("ambiguity warning = %v, want %v (problems %v)", p, c.ambiguous, tab.Problems)
			}
			if p != nil && p.Severity != Warning {
				t.Errorf("ambiguity severity = %s, want warning", p.Severity)
			}
			if !strings.Contains(col.Note, c.note) {
				t.Errorf("note %q does not mention %q", col.Note, c.note)
			}
		})
	}
}

// TestMixedDecimal: a cell whose separators contradict its column is read by
// its own form and warned about.
func TestMixedDecimal(t *testing.T) {
	tab := mustParse(t, "A\tB\nx\t1,5\ny\t2,25\nz\t3.5\n")
	col := tab.Columns[1]
	if !col.DecimalComma || !sameValues(col.Values, []float64{1.5, 2.25, 3.5}) {
		t.Fatalf("column B = %+v", col)
	}
	if p := problemAt(tab, 4, 2, ErrMixedDecimal); p == nil || p.Severity != Warning || p.Text != "3.5" {
		t.Errorf("want a mixed decimal warning at row 4 column 2, got %v", tab.Problems)
	}
}

// TestCellProblems: blank, missing markers and unreadable cells in a
// numeric column, each with its severity and value NaN.
func TestCellProblems(t *testing.T) {
	cases := []struct {
		cell   string
		err    error
		sev    Severity
		reason string
	}{
		{"", ErrMissing, Warning, "the cell is blank"},
		{"n/a", ErrMissing, Warning, "not available"},
		{"NA", ErrMissing, Warning, "not available"},
		{"-", ErrMissing, Warning, "dash"},
		{"—", ErrMissing, Warning, "dash"},
		{"#N/A", ErrMissing, Warning, "#N/A"},
		{"#DIV/0!", ErrMissing, Warning, "division by zero"},
		{"abc", ErrNotNumber, Error, "not a number"},
		{"1.2.3,4", ErrNotNumber, Error, "odd places"},
	}
	for _, c := range cases {
		t.Run(c.cell, func(t *testing.T) {
			tab := mustParse(t, "Unit\tCost\nA\t1\nB\t"+c.cell+"\nC\t3\n")
			if v := tab.Columns[1].Values[1]; !math.IsNaN(v) {
				t.Errorf("value = %v, want NaN", v)
			}
			p := problemAt(tab, 3, 2, c.err)
			if p == nil {
				t.Fatalf("no %v problem at row 3 column 2: %v", c.err, tab.Problems)
			}
			if p.Severity != c.sev || p.Text != c.cell || !strings.Contains(p.Error(), c.reason) {
				t.Errorf("problem = %q (%s), want severity %s mentioning %q", p.Error(), p.Severity, c.sev, c.reason)
			}
		})
	}
}

// TestSignsAndMarks: brackets, percent and currency signs are read and
// reported, per cell or per column.
func TestSignsAndMarks(t *testing.T) {
	cases := []struct {
		name     string
		cells    []string
		values   []float64
		percent  bool
		currency string
		reports  []error // problems expected in column 2 (any row)
	}{
		{"accounting negative", []string{"(123)", "5"}, []float64{-123, 5}, false, "", []error{ErrBracketNegative}},
		{"percent", []string{"12%", "7,5%"}, []float64{12, 7.5}, true, "", []error{ErrPercent}},
		{"percent on some cells", []string{"12%", "8"}, []float64{12, 8}, true, "", []error{ErrPercent}},
		{"dollar", []string{"$1,000", "$2,500.50"}, []float64{1000, 2500.5}, false, "$", []error{ErrCurrency}},
		{"euro code suffix", []string{"1.000,50 EUR", "3 EUR"}, []float64{1000.5, 3}, false, "EUR", []error{ErrCurrency}},
		{"mixed currencies", []string{"$5", "€6"}, []float64{5, 6}, false, "$, €", []error{ErrCurrency}},
		{"unicode minus and plus", []string{"\u22122.5", "+3"}, []float64{-2.5, 3}, false, "", nil},
		{"scientific", []string{"1.2e5", "3E-2"}, []float64{120000, 0.03}, false, "", nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			tab := mustParse(t, "Unit\tX\nA\t"+c.cells[0]+"\nB\t"+c.cells[1]+"\n")
			col := tab.Columns[1]
			if !sameValues(col.Values, c.values) || col.Percent != c.percent || col.Currency != c.currency {
				t.Errorf("column = values %v percent %v currency %q, want %v %v %q", col.Values, col.Percent, col.Currency, c.values, c.percent, c.currency)
			}
			for _, e := range c.reports {
				found := false
				for _, p := range tab.Problems {
					found = found || p.Column == 2 && errors.Is(p, e)
				}
				if !found {
					t.Errorf("no %v problem in column 2: %v", e, tab.Problems)
				}
			}
			for _, p := range tab.Problems {
				if p.Severity == Error {
					t.Errorf("unexpected error: %v", p)
				}
			}
		})
	}
}

// TestHeaderDetection: a first row of text over columns of numbers is a
// header; a first row of numbers is data and the columns get invented names,
// with a note.
func TestHeaderDetection(t *testing.T) {
	cases := []struct {
		name   string
		text   string
		header bool
		names  []string
		rows   int
	}{
		{"text over numbers", "Unit\tStaff\tCases\nA\t1\t2\nB\t3\t4\n", true, []string{"Unit", "Staff", "Cases"}, 2},
		{"numbers only", "1\t2\n3\t4\n", false, []string{"Column 1", "Column 2"}, 2},
		{"names and numbers, no header", "A\t1\t2\nB\t3\t4\n", false, []string{"Column 1", "Column 2", "Column 3"}, 2},
		{"blank first rows", "\n\nUnit\tStaff\nA\t1\n", true, []string{"Unit", "Staff"}, 1},
		{"header only", "Unit\tStaff\n", true, []string{"Unit", "Staff"}, 0},
		{"all text", "Unit\tCity\nA\tX\n", true, []string{"Unit", "City"}, 1},
		{"header names with line breaks", "Unit\t\"Staff\n(FTE)\"\nA\t1\n", true, []string{"Unit", "Staff (FTE)"}, 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			tab := mustParse(t, c.text)
			if tab.HasHeader != c.header || !reflect.DeepEqual(tab.Header, c.names) || len(tab.Rows) != c.rows {
				t.Errorf("header=%v names=%q rows=%d, want %v %q %d", tab.HasHeader, tab.Header, len(tab.Rows), c.header, c.names, c.rows)
			}
			if p := problemAt(tab, 0, 0, ErrNoHeader); (p != nil) == c.header {
				t.Errorf("no-header note = %v, want present=%v", p, !c.header)
			}
		})
	}
}

// TestHeaderNames: empty names are filled and duplicates made unique, each
// reported at its header cell.
func TestHeaderNames(t *testing.T) {
	tab := mustParse(t, "\tStaff\tStaff\t\tStaff\nA\t1\t2\t3\t4\nB\t5\t6\t7\t8\n")
	want := []string{"Column 1", "Staff", "Staff (2)", "Column 4", "Staff (3)"}
	if !reflect.DeepEqual(tab.Header, want) {
		t.Fatalf("header = %q, want %q", tab.Header, want)
	}
	for _, c := range []struct {
		col int
		err error
		sev Severity
	}{{1, ErrEmptyHeader, Note}, {3, ErrDuplicateHeader, Warning}, {4, ErrEmptyHeader, Note}, {5, ErrDuplicateHeader, Warning}} {
		if p := problemAt(tab, 1, c.col, c.err); p == nil || p.Severity != c.sev {
			t.Errorf("column %d: want %v %s, problems %v", c.col, c.err, c.sev, tab.Problems)
		}
	}
}

// TestNameColumn: the first mostly-text column is offered as unit names.
func TestNameColumn(t *testing.T) {
	cases := []struct {
		name string
		text string
		want int
	}{
		{"first column", "Unit\tStaff\nA\t1\nB\t2\n", 0},
		{"second column", "Id\tUnit\tStaff\n1\tA\t1\n2\tB\t2\n", 1},
		{"none", "Staff\tCases\n1\t2\n3\t4\n", -1},
		{"names with a stray number", "Unit\tStaff\nA\t1\n42\t2\nC\t3\n", 0},
	}
	for _, c := range cases {
		tab := mustParse(t, c.text)
		if tab.NameColumn != c.want {
			t.Errorf("%s: NameColumn = %d, want %d", c.name, tab.NameColumn, c.want)
		}
		if c.want >= 0 && tab.Columns[c.want].Numeric {
			t.Errorf("%s: name column marked numeric", c.name)
		}
	}
}

// TestRowsKeptAndReported: blank rows are left out with a note; short rows
// padded with a warning; rows of text in a numeric table kept with each cell
// reported; trailing empty columns left out with a note.
func TestRowsKeptAndReported(t *testing.T) {
	cases := []struct {
		name  string
		text  string
		rows  int
		probs []struct {
			row, col int
			err      error
			sev      Severity
		}
	}{
		{"blank row", "Unit\tX\nA\t1\n\t\nB\t2\n", 2, []struct {
			row, col int
			err      error
			sev      Severity
		}{{3, 0, ErrBlankRow, Note}}},
		{"trailing blank lines are not rows", "Unit\tX\nA\t1\n\n\n", 1, nil},
		{"short row", "Unit\tX\tY\nA\t1\t2\nB\t3\n", 2, []struct {
			row, col int
			err      error
			sev      Severity
		}{{3, 0, ErrRagged, Warning}, {3, 3, ErrMissing, Warning}}},
		{"second header line", "Unit\tX\tY\n(name)\tkg\tEUR\nA\t1\t2\n", 2, []struct {
			row, col int
			err      error
			sev      Severity
		}{{2, 0, ErrTextRow, Warning}, {2, 2, ErrNotNumber, Error}, {2, 3, ErrNotNumber, Error}}},
		{"trailing delimiter on every row", "Unit,X,\nA,1,\nB,2,\n", 2, []struct {
			row, col int
			err      error
			sev      Severity
		}{{0, 0, ErrEmptyColumn, Note}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			tab := mustParse(t, c.text)
			if len(tab.Rows) != c.rows {
				t.Errorf("rows = %d, want %d", len(tab.Rows), c.rows)
			}
			if len(tab.Problems) != len(c.probs) {
				t.Errorf("problems = %v, want %d", tab.Problems, len(c.probs))
			}
			for _, w := range c.probs {
				if p := problemAt(tab, w.row, w.col, w.err); p == nil || p.Severity != w.sev {
					t.Errorf("want %v (%s) at row %d column %d; problems %v", w.err, w.sev, w.row, w.col, tab.Problems)
				}
			}
		})
	}
}

// TestTooWide: one line far wider than a long table (a broken paste) does
// not blow the table up; the cells past the table's width are reported.
func TestTooWide(t *testing.T) {
	text := "Unit\tX\n" + strings.Repeat("\t", 40000) + "stray\n" + strings.Repeat("A\t1\n", 20000)
	tab := mustParse(t, text)
	if w := len(tab.Header); w < 2 || w > 10 || len(tab.Rows)*w > 2*80003 { // 80003 cells typed
		t.Fatalf("width %d for %d rows", w, len(tab.Rows))
	}
	p := problemAt(tab, 2, 0, ErrTooWide)
	if p == nil || p.Severity != Error || p.Text != "stray" {
		t.Errorf("want a too-wide error at row 2 naming the stray cell, got %v", p)
	}
	if v := tab.Columns[1].Values[len(tab.Rows)-1]; v != 1 {
		t.Errorf("last value = %v, want 1", v)
	}
}

// TestPositions: Row is the record number (what a spreadsheet shows as the
// row number), StartLine the line of text where it starts; they differ after
// a quoted cell holding line breaks.
func TestPositions(t *testing.T) {
	text := "Unit\tStaff\tCost\r\n" + // record 1, line 1
		"\"North\r\nWing\"\t3\t4\r\n" + // record 2, lines 2-3
		"South\tx\t5\r\n" + // record 3, line 4
		"\r\n" + // record 4 (blank), line 5
		"\"East\nWing\nAnnex\"\t6\t\"bad\nnumber\"\r\n" + // record 5, lines 6-9
		"West\t7\t8\r\n" // record 6, line 10
	tab := mustParse(t, text)
	var lines, starts []int
	for _, r := range tab.Rows {
		lines = append(lines, r.Line)
		starts = append(starts, r.StartLine)
	}
	if !reflect.DeepEqual(lines, []int{2, 3, 5, 6}) || !reflect.DeepEqual(starts, []int{2, 4, 6, 10}) {
		t.Errorf("row numbers %v, start lines %v; want [2 3 5 6], [2 4 6 10]", lines, starts)
	}
	want := []struct {
		row, col, line int
		err            error
		text           string
	}{
		{3, 2, 4, ErrNotNumber, "x"},
		{4, 0, 5, ErrBlankRow, ""},
		{5, 3, 6, ErrNotNumber, "bad\nnumber"},
	}
	if len(tab.Problems) != len(want) {
		t.Fatalf("problems = %v, want %d", tab.Problems, len(want))
	}
	for i, w := range want {
		p := tab.Problems[i]
		if p.Row != w.row || p.Column != w.col || p.Line != w.line || !errors.Is(p, w.err) || p.Text != w.text {
			t.Errorf("problem %d = %+v, want row %d col %d line %d %v %q", i, p, w.row, w.col, w.line, w.err, w.text)
		}
	}
	if got := tab.Problems[0].Error(); got != `row 3, column 2 ("x"): not a number` {
		t.Errorf("Error() = %q", got)
	}
}

// TestProblemText: the plain-English text of a problem, by where it is.
func TestProblemText(t *testing.T) {
	cases := []struct {
		p    Problem
		want string
	}{
		{Problem{Err: ErrNoHeader}, "table: no header row"},
		{Problem{Column: 2, Text: "Cost", Err: ErrPercent}, `column 2 ("Cost"): percent sign`},
		{Problem{Row: 4, Err: ErrBlankRow}, "row 4: blank row"},
		{Problem{Row: 4, Column: 2, Text: "abc", Err: ErrNotNumber}, `row 4, column 2 ("abc"): not a number`},
	}
	for _, c := range cases {
		if got := c.p.Error(); got != c.want {
			t.Errorf("Error() = %q, want %q", got, c.want)
		}
	}
}

// TestCSV: comma- and semicolon-separated text with quotes.
func TestCSV(t *testing.T) {
	cases := []struct {
		name   string
		text   string
		delim  rune
		names  []string
		values []float64 // second column
	}{
		{"comma", "Unit,Cost\nA,\"1,234.5\"\nB,2\n", ',', []string{"Unit", "Cost"}, []float64{1234.5, 2}},
		{"semicolon", "Unit;Cost\nA;1.234,5\nB;2\n", ';', []string{"Unit", "Cost"}, []float64{1234.5, 2}},
		{"quoted names", "\"Unit, site\";\"Cost\"\n\"A; north\";1,5\n\"B\";2,5\n", ';', []string{"Unit, site", "Cost"}, []float64{1.5, 2.5}},
		{"BOM", "\uFEFFUnit,Cost\nA,1\n", ',', []string{"Unit", "Cost"}, []float64{1}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			tab := mustParse(t, c.text)
			if tab.Delimiter != c.delim || !reflect.DeepEqual(tab.Header, c.names) || !sameValues(tab.Columns[1].Values, c.values) {
				t.Errorf("delim %q header %q values %v, want %q %q %v", tab.Delimiter, tab.Header, tab.Columns[1].Values, c.delim, c.names, c.values)
			}
		})
	}
}

// TestOptions: settings overrule the guesses.
func TestOptions(t *testing.T) {
	text := "1,234\t2\n5,000\t6\n"
	tab, err := Options{Decimal: DecimalComma, Header: HeaderNo}.Parse(text)
	if err != nil {
		t.Fatal(err)
	}
	if !sameValues(tab.Columns[0].Values, []float64{1.234, 5}) || problemAt(tab, 0, 1, ErrAmbiguousDecimal) != nil {
		t.Errorf("decimal comma by choice: %v %v", tab.Columns[0].Values, tab.Problems)
	}
	tab, err = Options{Header: HeaderYes, Delimiter: ','}.Parse("1,2\n3,4\n")
	if err != nil {
		t.Fatal(err)
	}
	if !tab.HasHeader || !reflect.DeepEqual(tab.Header, []string{"1", "2"}) || len(tab.Rows) != 1 {
		t.Errorf("header by choice: %+v", tab)
	}
}

// TestEmpty: only empty input is an error.
func TestEmpty(t *testing.T) {
	for _, text := range []string{"", "\n\n", " \t \r\n", "\uFEFF"} {
		if _, err := Parse(text); !errors.Is(err, ErrEmpty) {
			t.Errorf("Parse(%q) error = %v, want ErrEmpty", text, err)
		}
	}
}

// TestFromRecords: cells from a spreadsheet file, rows of different
// lengths, numbers in the spreadsheet's stored form.
func TestFromRecords(t *testing.T) {
	tab, err := FromRecords([][]string{
		{"Unit", "Staff", "Share"},
		{"A", "1.234", "0.25"},
		{"B", "12"},
		{},
		{"C", "3", "1e-3"},
	})
	if err != nil {
		t.Fatal(err)
	}
	checkInvariants(t, tab)
	if tab.Delimiter != 0 || !tab.HasHeader || len(tab.Rows) != 3 {
		t.Fatalf("table = %+v", tab)
	}
	if !sameValues(tab.Columns[1].Values, []float64{1.234, 12, 3}) || !sameValues(tab.Columns[2].Values, []float64{0.25, nan, 0.001}) {
		t.Errorf("values %v %v", tab.Columns[1].Values, tab.Columns[2].Values)
	}
	for _, p := range tab.Problems {
		if errors.Is(p, ErrRagged) || errors.Is(p, ErrAmbiguousDecimal) {
			t.Errorf("unexpected problem for spreadsheet cells: %v", p)
		}
	}
	if problemAt(tab, 4, 0, ErrBlankRow) == nil || problemAt(tab, 3, 3, ErrMissing) == nil {
		t.Errorf("want blank row 4 and missing cell row 3 column 3: %v", tab.Problems)
	}
}
