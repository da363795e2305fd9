package table

import (
	"errors"
	"math"
	"testing"
)

// TestParseNumber covers the number forms people type, one case a row. The
// conventions are common practice: English-speaking countries write
// 1,234.5; most of continental Europe 1.234,5; France and the SI style use
// spaces (also no-break and narrow no-break) for thousands; Switzerland
// apostrophes; accountants bracket negatives.
func TestParseNumber(t *testing.T) {
	cases := []struct {
		name  string
		text  string
		comma bool // the column's decimal mark
		want  float64
		err   error // nil, ErrMissing or ErrNotNumber
	}{
		{"plain", "1234.5", false, 1234.5, nil},
		{"integer", "42", false, 42, nil},
		{"comma thousands", "1,234.5", false, 1234.5, nil},
		{"comma thousands read in a comma column", "1,234.5", true, 1234.5, nil},
		{"two comma groups", "1,234,567", false, 1234567, nil},
		{"space thousands decimal comma", "1 234,5", true, 1234.5, nil},
		{"no-break space thousands", "1\u00A0234,5", true, 1234.5, nil},
		{"narrow no-break space thousands", "1\u202F234\u202F567,25", true, 1234567.25, nil},
		{"space thousands decimal point", "1 234.5", false, 1234.5, nil},
		{"space thousands only", "12 345", false, 12345, nil},
		{"apostrophe thousands", "1'234.5", false, 1234.5, nil},
		{"typographic apostrophe thousands", "1’234’567", false, 1234567, nil},
		{"dot thousands decimal comma", "1.234,5", true, 1234.5, nil},
		{"dot thousands decimal comma in a point column", "1.234,5", false, 1234.5, nil},
		{"dot groups", "1.234.567", true, 1234567, nil},
		{"decimal comma", "0,5", true, 0.5, nil},
		{"ambiguous read with point", "1,234", false, 1234, nil},
		{"ambiguous read with comma", "1,234", true, 1.234, nil},
		{"ambiguous dot read with point", "1.234", false, 1.234, nil},
		{"ambiguous dot read with comma", "1.234", true, 1234, nil},
		{"leading plus", "+12", false, 12, nil},
		{"leading minus", "-12.5", false, -12.5, nil},
		{"unicode minus", "\u221212.5", false, -12.5, nil},
		{"accounting negative", "(123)", false, -123, nil},
		{"accounting negative with thousands", "(1,234.50)", false, -1234.5, nil},
		{"accounting negative with currency", "($5)", false, -5, nil},
		{"currency then brackets", "$(5)", false, -5, nil},
		{"surrounding spaces", "  7.25 ", false, 7.25, nil},
		{"surrounding no-break spaces", "\u00A07\u00A0", false, 7, nil},
		{"scientific", "1.2e5", false, 120000, nil},
		{"scientific upper case negative exponent", "2.5E-3", false, 0.0025, nil},
		{"scientific decimal comma", "1,2e5", true, 120000, nil},
		{"percent kept as typed", "12%", false, 12, nil},
		{"percent with space", "12,5 %", true, 12.5, nil},
		{"dollar prefix", "$1,000", false, 1000, nil},
		{"euro suffix", "1.000,50 €", true, 1000.5, nil},
		{"pound", "£3", false, 3, nil},
		{"yen", "¥500", false, 500, nil},
		{"code prefix", "USD 12.5", false, 12.5, nil},
		{"code suffix", "12,5 EUR", true, 12.5, nil},
		{"minus before currency", "-$5", false, -5, nil},
		{"minus after currency", "$-5", false, -5, nil},
		{"half without leading zero", ".5", false, 0.5, nil},
		{"trailing point", "5.", false, 5, nil},
		{"indian grouping", "12,34,567", false, 1234567, nil},
		{"leading zeros", "007", false, 7, nil},
		{"zero before three digits is a decimal", "0,125", false, 0.125, nil},
		{"blank", "", false, math.NaN(), ErrMissing},
		{"spaces only", "   ", false, math.NaN(), ErrMissing},
		{"n/a", "n/a", false, math.NaN(), ErrMissing},
		{"NA", "NA", false, math.NaN(), ErrMissing},
		{"dash", "-", false, math.NaN(), ErrMissing},
		{"em dash", "—", false, math.NaN(), ErrMissing},
		{"spreadsheet not available", "#N/A", false, math.NaN(), ErrMissing},
		{"spreadsheet division by zero", "#DIV/0!", false, math.NaN(), ErrMissing},
		{"word", "twelve", false, math.NaN(), ErrNotNumber},
		{"number with unit", "12 kg", false, math.NaN(), ErrNotNumber},
		{"two decimal points", "1.2.3", false, math.NaN(), ErrNotNumber},
		{"bad grouping", "12,34", false, 12.34, nil}, // one comma before two digits: a decimal comma by itself
		{"bad grouping twice", "1,23,4", false, math.NaN(), ErrNotNumber},
		{"mixed grouping", "1,234 567.5", false, math.NaN(), ErrNotNumber},
		{"inf is text", "inf", false, math.NaN(), ErrNotNumber},
		{"nan marker", "NaN", false, math.NaN(), ErrMissing},
		{"hex is text", "0x1p3", false, math.NaN(), ErrNotNumber},
		{"overflow", "1e999", false, math.NaN(), ErrNotNumber},
		{"lone sign", "+", false, math.NaN(), ErrNotNumber},
		{"lone percent", "%", false, math.NaN(), ErrNotNumber},
		{"date is text", "2024-01-05", false, math.NaN(), ErrNotNumber},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, err := ParseNumber(c.text, c.comma)
			if c.err != nil {
				if !errors.Is(err, c.err) {
					t.Fatalf("ParseNumber(%q) error = %v, want %v", c.text, err, c.err)
				}
				if !math.IsNaN(got) {
					t.Errorf("ParseNumber(%q) = %v, want NaN with the error", c.text, got)
				}
				return
			}
			if err != nil {
				t.Fatalf("ParseNumber(%q): %v", c.text, err)
			}
			if math.Abs(got-c.want) > 1e-12*math.Max(1, math.Abs(c.want)) {
				t.Errorf("ParseNumber(%q, comma=%v) = %v, want %v", c.text, c.comma, got, c.want)
			}
		})
	}
}

// TestNumberVote checks what a single cell says about the decimal mark, the
// evidence each column's choice is built from.
func TestNumberVote(t *testing.T) {
	cases := []struct {
		text string
		want vote
	}{
		{"1234.5", votePoint},
		{"0.5", votePoint},
		{"1,234.5", votePoint},
		{"1,234,567", votePoint},
		{"1.234,5", voteComma},
		{"0,5", voteComma},
		{"1.234.567", voteComma},
		{"1 234,5", voteComma},
		{"1'234.5", votePoint},
		{"1,234", voteAmbiguous},
		{"1.234", voteAmbiguous},
		{"-123.456", voteAmbiguous},
		{"1234,567", voteComma}, // four digits before: cannot be a thousands separator
		{"0,123", voteComma},    // 0 cannot start a grouped number
		{"1,2345", voteComma},
		{"1.2e5", votePoint},
		{"1234", voteNone},
		{"1 234", voteNone},
	}
	for _, c := range cases {
		n := lexNumber(c.text)
		if n.kind != kindNumber {
			t.Errorf("lexNumber(%q).kind = %v, want a number", c.text, n.kind)
			continue
		}
		if n.mark != c.want {
			t.Errorf("lexNumber(%q).mark = %v, want %v", c.text, n.mark, c.want)
		}
	}
}

// TestMissingReasons checks that each missing marker says why.
func TestMissingReasons(t *testing.T) {
	cases := []struct{ text, reason string }{
		{"", "missing value: the cell is blank"},
		{"n/a", "missing value: marked as not available"},
		{"-", "missing value: marked with a dash (no value)"},
		{"—", "missing value: marked with a dash (no value)"},
		{"#N/A", "missing value: the spreadsheet shows #N/A (value not available)"},
		{"#DIV/0!", "missing value: the spreadsheet shows #DIV/0! (a division by zero)"},
		{"#VALUE!", "missing value: the spreadsheet shows #VALUE! (a formula error)"},
	}
	for _, c := range cases {
		_, err := ParseNumber(c.text, false)
		if err == nil || err.Error() != c.reason {
			t.Errorf("ParseNumber(%q) error = %v, want %q", c.text, err, c.reason)
		}
	}
}

// TestMarkerLength guards the shortcut in lexNumber that looks up missing
// markers only for short texts.
func TestMarkerLength(t *testing.T) {
	for m := range missingMarkers {
		if len(m) > maxMarker {
			t.Errorf("marker %q is longer than maxMarker (%d)", m, maxMarker)
		}
	}
}
