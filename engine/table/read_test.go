package table

import (
	"errors"
	"reflect"
	"testing"
	"unicode/utf16"
)

// TestReadClipboard covers tab-separated text as spreadsheets put it on the
// clipboard (common practice: cells separated by tabs, rows ended by CRLF,
// a cell holding a tab, a line break or a quote wrapped in quotes with the
// quote doubled, as RFC 4180 does for CSV).
func TestReadClipboard(t *testing.T) {
	cases := []struct {
		name string
		text string
		want [][]string
	}{
		{"plain", "a\tb\n1\t2\n", [][]string{{"a", "b"}, {"1", "2"}}},
		{"no final line break", "a\tb\n1\t2", [][]string{{"a", "b"}, {"1", "2"}}},
		{"CRLF", "a\tb\r\n1\t2\r\n", [][]string{{"a", "b"}, {"1", "2"}}},
		{"lone CR", "a\tb\r1\t2\r", [][]string{{"a", "b"}, {"1", "2"}}},
		{"quoted tab", "\"a\tb\"\tc\n", [][]string{{"a\tb", "c"}}},
		{"quoted newline", "\"North\nWing\"\t1\n", [][]string{{"North\nWing", "1"}}},
		{"quoted CRLF becomes LF", "\"North\r\nWing\"\t1\r\n", [][]string{{"North\nWing", "1"}}},
		{"doubled quotes", "\"say \"\"hi\"\"\"\t1\n", [][]string{{"say \"hi\"", "1"}}},
		{"quote inside a cell is text", "5\" pipe\t1\n", [][]string{{"5\" pipe", "1"}}},
		{"trailing empty cells", "a\t\t\n", [][]string{{"a", "", ""}}},
		{"empty quoted cell", "\"\"\t1\n", [][]string{{"", "1"}}},
		{"blank line is a record", "a\n\nb\n", [][]string{{"a"}, {""}, {"b"}}},
		{"space before a quote", "x, \"1,5\"\n", nil}, // checked with ',' below
	}
	for _, c := range cases {
		if c.want == nil {
			continue
		}
		t.Run(c.name, func(t *testing.T) {
			got := fieldsOf(newReader(c.text, '\t').readAll(0))
			if !reflect.DeepEqual(got, c.want) {
				t.Errorf("read %q = %q, want %q", c.text, got, c.want)
			}
		})
	}
	got := fieldsOf(newReader("x, \"1,5\"\n", ',').readAll(0))
	if want := [][]string{{"x", "1,5"}}; !reflect.DeepEqual(got, want) {
		t.Errorf("space before quote: got %q, want %q", got, want)
	}
}

func fieldsOf(recs []record) [][]string {
	var out [][]string
	for _, r := range recs {
		out = append(out, append([]string(nil), r.fields...))
	}
	return out
}

// TestReadQuoteProblems checks the two quote slips the reader forgives and
// reports.
func TestReadQuoteProblems(t *testing.T) {
	cases := []struct {
		name      string
		text      string
		want      [][]string
		row, col  int
		wantProbs int
	}{
		{"unclosed quote is text", "a\tb\n\"12 inch\t3\nc\td\n", [][]string{{"a", "b"}, {"\"12 inch", "3"}, {"c", "d"}}, 2, 1, 1},
		{"text after closing quote", "\"ab\"cd\t1\n", [][]string{{"abcd", "1"}}, 1, 1, 1},
		{"spaces after closing quote are fine", "\"ab\"  \t1\n", [][]string{{"ab", "1"}}, 0, 0, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := newReader(c.text, '\t')
			got := fieldsOf(r.readAll(0))
			if !reflect.DeepEqual(got, c.want) {
				t.Errorf("read %q = %q, want %q", c.text, got, c.want)
			}
			if len(r.problems) != c.wantProbs {
				t.Fatalf("problems = %v, want %d", r.problems, c.wantProbs)
			}
			if c.wantProbs > 0 {
				p := r.problems[0]
				if p.Row != c.row || p.Column != c.col || !errors.Is(p, ErrQuote) || p.Severity != Warning {
					t.Errorf("problem = %+v, want ErrQuote warning at row %d column %d", p, c.row, c.col)
				}
			}
		})
	}
}

// TestDetectDelimiter: tab beats semicolon beats comma, judged by how
// consistently each splits the rows.
func TestDetectDelimiter(t *testing.T) {
	cases := []struct {
		name string
		text string
		want byte
	}{
		{"tabs", "a\tb\tc\n1\t2\t3\n", '\t'},
		{"tabs with commas in cells", "Name\tStaff\nSmith, J\t3\nLee, K\t4\n", '\t'},
		{"commas", "a,b,c\n1,2,3\n", ','},
		{"semicolons with decimal commas", "a;b\n1,5;2,5\n3,25;4\n", ';'},
		{"semicolons and commas equally consistent", "1,5;2,5\n3,5;4,5\n", ';'},
		{"commas with a semicolon in one cell", "name,a,b\nfoo; bar,1,2\nbaz,3,4\n", ','},
		{"commas with quoted decimal commas", "\"1,5\",\"2,5\"\n\"3,5\",\"4\"\n", ','},
		{"commas more consistent than semicolons", "n,a,b\nx;y,1,2\nz;w,3,4\nv,5,6\nu,7,8\n", ','},
		{"single column", "a\n1\n2\n", '\t'},
	}
	for _, c := range cases {
		if got := detectDelimiter(c.text); got != c.want {
			t.Errorf("%s: detectDelimiter(%q) = %q, want %q", c.name, c.text, got, c.want)
		}
	}
}

func utf16Bytes(s string, bigEndian, bom bool) []byte {
	u := utf16.Encode([]rune(s))
	if bom {
		u = append([]uint16{0xFEFF}, u...)
	}
	b := make([]byte, 0, 2*len(u))
	for _, c := range u {
		if bigEndian {
			b = append(b, byte(c>>8), byte(c))
		} else {
			b = append(b, byte(c), byte(c>>8))
		}
	}
	return b
}

// TestDecode covers the encodings spreadsheets save text in.
func TestDecode(t *testing.T) {
	const text = "Unit\tCost €\nNorth\t1,5\n"
	cases := []struct {
		name     string
		in       []byte
		want     string
		reported bool
	}{
		{"UTF-8", []byte(text), text, false},
		{"UTF-8 with BOM", append([]byte("\xEF\xBB\xBF"), text...), text, false},
		{"UTF-16 LE with BOM", utf16Bytes(text, false, true), text, false},
		{"UTF-16 BE with BOM", utf16Bytes(text, true, true), text, false},
		{"UTF-16 LE without BOM", utf16Bytes(text, false, false), text, false},
		{"Windows-1252", []byte("Unit\tCost \x80\nZ\xFCrich\t1\n"), "Unit\tCost €\nZürich\t1\n", true},
	}
	for _, c := range cases {
		got, p := decode(string(c.in))
		if got != c.want {
			t.Errorf("%s: decode = %q, want %q", c.name, got, c.want)
		}
		if (p != nil) != c.reported || p != nil && !errors.Is(p, ErrEncoding) {
			t.Errorf("%s: problem = %v, want reported=%v", c.name, p, c.reported)
		}
	}
}

// TestParseBytesUnicodeText reads a table saved as "Unicode text" (UTF-16
// LE with a byte order mark, tab-separated, CRLF) through ParseBytes.
func TestParseBytesUnicodeText(t *testing.T) {
	text := "Filiale\tKosten €\r\nZürich\t1.234,5\r\nGenève\t980,25\r\n"
	tab, err := ParseBytes(utf16Bytes(text, false, true))
	if err != nil {
		t.Fatal(err)
	}
	checkInvariants(t, tab)
	if tab.Header[1] != "Kosten €" || tab.Rows[1].Cells[0] != "Genève" {
		t.Errorf("header %q rows %+v", tab.Header, tab.Rows)
	}
	if v := tab.Columns[1].Values; !tab.Columns[1].DecimalComma || v[0] != 1234.5 || v[1] != 980.25 {
		t.Errorf("values %v comma %v", v, tab.Columns[1].DecimalComma)
	}
}
