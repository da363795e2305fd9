package table

import (
	"errors"
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"unicode"
)

// parseSeeds are texts that exercise every rule; they run as part of
// `go test` and seed `go test -fuzz`.
var parseSeeds = []string{
	"Unit\tStaff\tBudget\n\"North\nWing\"\t12\t1,234.5\n\nSouth\t\t(200)\nEast\t9\t$1,000\n",
	"a;b\n1,5;2,5\n3,25;4\n",
	"Unit,Cost,\nA,\"1,234.5\",\nB,2,\n",
	"\"unclosed\t1\n2\t3\n",
	"\"ab\"cd\t1\n",
	"1\t2\n3\n4\t5\t6\n",
	"\uFEFF\tStaff\tStaff\nA\t1%\t€2\n",
	"x\r\ny\rz\n",
	"\"\"\"\"\t\"\"\n",
	"1.2.3\t#N/A\t—\t1e999\t−4\n",
	"\t\t\n\t\n",
	"\"a\"\"\n",
	"A\tB\n\"x\ny\"\"\t\"\n",
	// Found by FuzzParse: a form feed is white space, so this text is empty.
	"\f",
	// Found by FuzzParse: not UTF-8, so read as Windows-1252, where 0xA0 is a
	// no-break space: empty too.
	"\xa0",
	// Found by FuzzParse: a UTF-16 byte order mark alone; Parse and
	// ParseBytes must agree that it is empty.
	"\xff\xfe",
	// Found by FuzzParse: one line far wider than many short ones made the
	// padded table quadratic in the size of the text.
	strings.Repeat("\t", 400) + "x\n" + strings.Repeat("1\t2\n", 400),
}

// FuzzParse checks that Parse never panics and always returns a table whose
// shape holds together (see checkInvariants).
func FuzzParse(f *testing.F) {
	for _, s := range parseSeeds {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, text string) {
		tab, err := Parse(text)
		if err != nil {
			if decoded, _ := decode(text); !errors.Is(err, ErrEmpty) || !onlyBlankRecords(decoded) {
				t.Fatalf("Parse(%q) error %v", text, err)
			}
			return
		}
		checkInvariants(t, tab)
		bt, err := ParseBytes([]byte(text))
		if err != nil {
			t.Fatalf("ParseBytes failed where Parse did not: %v", err)
		}
		checkInvariants(t, bt)
		if !reflect.DeepEqual(tab.Header, bt.Header) || !reflect.DeepEqual(tab.Rows, bt.Rows) || len(tab.Problems) != len(bt.Problems) {
			t.Fatalf("Parse and ParseBytes disagree on %q", text)
		}
	})
}

// onlyBlankRecords reports whether text holds nothing but white space,
// delimiters and quotes; such text is rightly empty.
func onlyBlankRecords(text string) bool {
	return strings.TrimFunc(text, func(r rune) bool {
		return unicode.IsSpace(r) || strings.ContainsRune(",;\"\uFEFF", r)
	}) == ""
}

// FuzzNumber checks that number reading never panics, that a value comes
// back exactly when there is no error, and that typing a number the plain
// way reads it back.
func FuzzNumber(f *testing.F) {
	for _, s := range []string{"1,234.5", "1 234,5", "(1'234)", "−3e-2", "12%", "$5", "EUR 1.000,5", ".5", "5.", "n/a", "#DIV/0!", "1,23,4", "1e999", "12,34,567"} {
		f.Add(s, false)
		f.Add(s, true)
	}
	f.Fuzz(func(t *testing.T, text string, comma bool) {
		v, err := ParseNumber(text, comma)
		if err != nil {
			if !math.IsNaN(v) {
				t.Fatalf("ParseNumber(%q) = %v with error %v", text, v, err)
			}
			if !errors.Is(err, ErrMissing) && !errors.Is(err, ErrNotNumber) {
				t.Fatalf("ParseNumber(%q) error %v wraps no sentinel", text, err)
			}
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("ParseNumber(%q) = %v without an error", text, v)
		}
		// A finite value written plainly reads back the same.
		plain := formatPlain(v, comma)
		w, err := ParseNumber(plain, comma)
		if err != nil || w != v {
			t.Fatalf("ParseNumber(%q) = %v; its plain form %q reads back as %v, %v", text, v, plain, w, err)
		}
	})
}

// formatPlain writes v with the column's decimal mark and no thousands
// separators, in exponent form (1.2345e+03), so that no three-digit fraction
// is ambiguous.
func formatPlain(v float64, comma bool) string {
	s := strconv.FormatFloat(v, 'e', -1, 64)
	if comma {
		s = strings.Replace(s, ".", ",", 1)
	}
	return s
}
