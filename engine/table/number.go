package table

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// cellKind is what a cell holds, before the column's decimal mark is known.
type cellKind uint8

const (
	kindBlank   cellKind = iota // empty or white space
	kindMissing                 // a marker such as n/a, -, #N/A
	kindText                    // not a number
	kindNumber
)

// vote is what a number's own separators say about the decimal mark.
type vote uint8

const (
	voteNone      vote = iota // no decimal mark, no thousands separators that say anything
	votePoint                 // only a decimal point fits (1,234.5 or 0.5)
	voteComma                 // only a decimal comma fits (1.234,5 or 0,5)
	voteAmbiguous             // one '.' or ',' before exactly three digits: 1,234 or 1.234
)

// numText is a cell read as far as possible without knowing the column's
// decimal mark.
type numText struct {
	kind     cellKind
	why      string // for kindMissing and kindText: the reason, in plain words
	neg      bool
	bracket  bool   // accounting negative: (123)
	percent  bool   // trailing %
	currency string // stripped currency sign or code
	mant     string // digits and separators, no sign
	exp      string // exponent, with its sign, without the 'e'; "" if none
	mark     vote
	sep      byte // for voteAmbiguous: the separator ('.' or ',')
}

// missingMarkers are texts people type for "no value", with the reason shown.
var missingMarkers = map[string]string{
	"n/a": "marked as not available", "na": "marked as not available",
	"n.a.": "marked as not available", "n.a": "marked as not available",
	"-": "marked with a dash (no value)", "--": "marked with a dash (no value)",
	"—": "marked with a dash (no value)", "–": "marked with a dash (no value)",
	"−":   "marked with a dash (no value)",
	"nan": "marked as missing", "null": "marked as missing", "none": "marked as missing",
	"missing": "marked as missing", "?": "marked as missing", ".": "marked as missing",
	"..": "marked as missing", "...": "marked as missing", "…": "marked as missing",
	"#n/a":    "the spreadsheet shows #N/A (value not available)",
	"#div/0!": "the spreadsheet shows #DIV/0! (a division by zero)",
	"#value!": "the spreadsheet shows #VALUE! (a formula error)",
	"#ref!":   "the spreadsheet shows #REF! (a formula error)",
	"#num!":   "the spreadsheet shows #NUM! (a formula error)",
	"#name?":  "the spreadsheet shows #NAME? (a formula error)",
	"#null!":  "the spreadsheet shows #NULL! (a formula error)",
	"#calc!":  "the spreadsheet shows #CALC! (a formula error)",
	"#spill!": "the spreadsheet shows #SPILL! (a formula error)",
}

// maxMarker is the length in bytes of the longest missing marker.
const maxMarker = 8

// currencySigns are stripped before or after a number; codes are ISO 4217.
var currencySigns = []string{
	"US$", "R$", "$", "€", "£", "¥", "₹", "₩", "₽", "₺", "₪", "₫", "₴", "₦", "₱", "฿", "₣",
}

var currencyCodes = map[string]bool{
	"USD": true, "EUR": true, "GBP": true, "JPY": true, "CHF": true, "CNY": true,
	"CAD": true, "AUD": true, "NZD": true, "SEK": true, "NOK": true, "DKK": true,
	"PLN": true, "CZK": true, "HUF": true, "INR": true, "BRL": true, "MXN": true,
	"ZAR": true, "KRW": true, "TRY": true, "ILS": true, "SGD": true, "HKD": true,
	"RON": true, "BGN": true, "ISK": true, "RUB": true,
}

// isSpace reports the spaces people and spreadsheets put around and inside
// numbers, which are Unicode's white space: ASCII space, tab and line
// breaks, no-break space (U+00A0), narrow no-break space (U+202F), thin
// space and the rest.
func isSpace(r rune) bool { return unicode.IsSpace(r) }

func trimSpace(s string) string { return strings.TrimFunc(s, isSpace) }

// lexNumber reads a cell's text as far as it can without the column's
// decimal mark.
func lexNumber(text string) numText {
	s := trimSpace(text)
	if s == "" {
		return numText{kind: kindBlank, why: "the cell is blank"}
	}
	if fast, ok := lexPlain(s); ok {
		return fast
	}
	if len(s) <= maxMarker {
		if why, ok := missingMarkers[strings.ToLower(s)]; ok {
			return numText{kind: kindMissing, why: why}
		}
	}
	var n numText
	s = n.stripAround(s)
	if s == "" {
		return numText{kind: kindText, why: "not a number"}
	}
	// Exponent: the last 'e' or 'E' followed by an optional sign and digits.
	if i := strings.LastIndexAny(s, "eE"); i > 0 {
		e := s[i+1:]
		d := strings.TrimLeft(e, "+-")
		if len(e)-len(d) <= 1 && d != "" && allDigits(d) {
			n.exp = e
			s = s[:i]
		}
	}
	n.mant = s
	if why := n.classify(); why != "" {
		return numText{kind: kindText, why: why}
	}
	n.kind = kindNumber
	return n
}

// lexPlain is the fast path for the common case: optional '-', digits and at
// most one '.', not three digits after it with a short whole part (ambiguous).
func lexPlain(s string) (numText, bool) {
	m := s
	neg := false
	if m[0] == '-' {
		neg, m = true, m[1:]
	}
	if m == "" {
		return numText{}, false
	}
	dot := -1
	for i := 0; i < len(m); i++ {
		c := m[i]
		if c == '.' {
			if dot >= 0 {
				return numText{}, false
			}
			dot = i
		} else if c < '0' || c > '9' {
			return numText{}, false
		}
	}
	n := numText{kind: kindNumber, neg: neg, mant: m}
	switch {
	case dot < 0:
		n.mark = voteNone
	case m == ".":
		return numText{}, false
	case dot >= 1 && dot <= 3 && len(m)-dot-1 == 3 && m[0] != '0':
		n.mark, n.sep = voteAmbiguous, '.'
	default:
		n.mark = votePoint
	}
	return n, true
}

// stripAround removes signs, accounting brackets, currency and percent signs
// around the number, recording each, and returns what is left.
func (n *numText) stripAround(s string) string {
	s = n.stripSign(s)
	s = n.stripBrackets(s)
	s = n.stripCurrencyPrefix(s)
	s = n.stripSign(s)
	s = n.stripBrackets(s)
	for range 2 {
		if t, ok := strings.CutSuffix(s, "%"); ok {
			n.percent, s = true, trimSpace(t)
		}
		s = n.stripCurrencySuffix(s)
	}
	return s
}

func (n *numText) stripSign(s string) string {
	if n.neg {
		return s
	}
	r, size := utf8.DecodeRuneInString(s)
	switch r {
	case '-', '−':
		n.neg = true
		return trimSpace(s[size:])
	case '+':
		return trimSpace(s[size:])
	}
	return s
}

func (n *numText) stripBrackets(s string) string {
	if n.bracket || len(s) < 2 || s[0] != '(' || s[len(s)-1] != ')' {
		return s
	}
	n.bracket = true
	return n.stripSign(trimSpace(s[1 : len(s)-1]))
}

func (n *numText) stripCurrencyPrefix(s string) string {
	if n.currency != "" || s == "" || s[0] >= '0' && s[0] <= '9' {
		return s
	}
	for _, c := range currencySigns {
		if t, ok := strings.CutPrefix(s, c); ok {
			n.currency = c
			return trimSpace(t)
		}
	}
	if len(s) > 3 && currencyCodes[s[:3]] && !isLetter(s[3]) {
		n.currency = s[:3]
		return trimSpace(s[3:])
	}
	return s
}

func (n *numText) stripCurrencySuffix(s string) string {
	if n.currency != "" || s == "" || s[len(s)-1] >= '0' && s[len(s)-1] <= '9' {
		return s
	}
	for _, c := range currencySigns {
		if t, ok := strings.CutSuffix(s, c); ok {
			n.currency = c
			return trimSpace(t)
		}
	}
	if k := len(s) - 3; k > 0 && currencyCodes[s[k:]] && !isLetter(s[k-1]) {
		n.currency = s[k:]
		return trimSpace(s[:k])
	}
	return s
}

func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }

func allDigits(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return true
}

// sepClass sorts the separators a number may hold.
func sepClass(r rune) byte {
	switch r {
	case '.', ',':
		return byte(r)
	case ' ', '\u00A0', '\u202F', '\u2009':
		return ' '
	case '\'', '’':
		return '\''
	}
	return 0
}

// classify checks the mantissa's digits and separators and sets n.mark. It
// returns a reason when the mantissa is not a number.
func (n *numText) classify() string {
	var runsBuf [8]string
	var sepsBuf [8]byte
	runs := runsBuf[:0] // digit runs between separators
	seps := sepsBuf[:0] // separator classes, len(runs)-1 of them
	start := 0
	for i, r := range n.mant {
		switch {
		case r >= '0' && r <= '9':
		case sepClass(r) != 0:
			runs = append(runs, n.mant[start:i])
			seps = append(seps, sepClass(r))
			start = i + utf8.RuneLen(r)
		default:
			return "not a number"
		}
	}
	runs = append(runs, n.mant[start:])
	const odd = "not a number: the separators are in odd places"
	switch {
	case len(seps) == 0:
		if runs[0] == "" {
			return "not a number"
		}
		n.mark = voteNone
		return ""
	case len(seps) == 1 && (seps[0] == '.' || seps[0] == ','):
		// One '.' or ',': a decimal mark, or a thousands separator before
		// exactly three digits (1,234), which is ambiguous.
		whole, frac := runs[0], runs[1]
		switch {
		case whole == "" && frac == "":
			return "not a number"
		case n.exp == "" && len(whole) >= 1 && len(whole) <= 3 && whole[0] != '0' && len(frac) == 3:
			n.mark, n.sep = voteAmbiguous, seps[0]
		case seps[0] == '.':
			n.mark = votePoint
		default:
			n.mark = voteComma
		}
		return ""
	}
	if n.exp != "" {
		return odd // no thousands separators with an exponent
	}
	for _, r := range runs {
		if r == "" {
			return odd
		}
	}
	first, last := seps[0], seps[len(seps)-1]
	same := true
	for _, s := range seps {
		same = same && s == first
	}
	if same {
		// Thousands separators only: 1 234 567, 1'234, 1,234,567, 1.234.567.
		if !validGroups(runs, first == ',') {
			return odd
		}
		switch first {
		case ',':
			n.mark = votePoint
		case '.':
			n.mark = voteComma
		default:
			n.mark = voteNone
		}
		return ""
	}
	// Thousands separators of one kind, then a decimal mark of another.
	for _, s := range seps[:len(seps)-1] {
		if s != first {
			return odd
		}
	}
	if (last != '.' && last != ',') || !validGroups(runs[:len(runs)-1], first == ',') {
		return odd
	}
	if last == '.' {
		n.mark = votePoint
	} else {
		n.mark = voteComma
	}
	return ""
}

// validGroups reports whether digit runs are thousands groups: a first group
// of one to three digits not starting with 0, then groups of three; with
// commas, the Indian grouping (12,34,567) is accepted too.
func validGroups(runs []string, comma bool) bool {
	if len(runs[0]) < 1 || len(runs[0]) > 3 || runs[0][0] == '0' {
		return false
	}
	threes := true
	for _, r := range runs[1:] {
		if len(r) != 3 {
			threes = false
		}
	}
	if threes {
		return true
	}
	if !comma || len(runs[0]) > 2 || len(runs[len(runs)-1]) != 3 {
		return false
	}
	for _, r := range runs[1 : len(runs)-1] {
		if len(r) != 2 {
			return false
		}
	}
	return true
}

// decimalMark is the mark the cell is read with, given the column's choice.
func (n *numText) decimalMark(comma bool) byte {
	switch n.mark {
	case votePoint:
		return '.'
	case voteComma:
		return ','
	case voteAmbiguous:
		if (n.sep == ',') == comma {
			return n.sep
		}
	}
	return 0
}

// value reads the number with the column's decimal mark. Thousands
// separators are dropped and the decimal mark becomes '.'.
func (n *numText) value(comma bool) (float64, error) {
	mark := n.decimalMark(comma)
	var buf [64]byte
	b := buf[:0]
	if n.neg || n.bracket {
		b = append(b, '-')
	}
	for i := 0; i < len(n.mant); i++ {
		c := n.mant[i]
		switch {
		case c >= '0' && c <= '9':
			b = append(b, c)
		case c == mark:
			b = append(b, '.')
		}
	}
	if n.exp != "" {
		b = append(b, 'e')
		b = append(b, n.exp...)
	}
	v, err := strconv.ParseFloat(string(b), 64)
	if err != nil || math.IsInf(v, 0) {
		return math.NaN(), fmt.Errorf("%w: too large to hold", ErrNotNumber)
	}
	return v, nil
}

// ParseNumber reads one number the way a column with the given decimal mark
// reads its cells (comma true: '1.234,5'; false: '1,234.5'). Signs, accounting
// brackets, currency signs, percent signs, spaces and thousands separators are
// handled as in Parse; percent values are kept as typed. Blank cells and
// missing markers return an error wrapping ErrMissing, anything else that is
// not a number an error wrapping ErrNotNumber.
func ParseNumber(text string, comma bool) (float64, error) {
	n := lexNumber(text)
	switch n.kind {
	case kindBlank, kindMissing:
		return math.NaN(), fmt.Errorf("%w: %s", ErrMissing, n.why)
	case kindText:
		return math.NaN(), n.textErr()
	}
	return n.value(comma)
}
