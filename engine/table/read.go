package table

import (
	"fmt"
	"strings"
	"unicode/utf16"
	"unicode/utf8"
)

// record is one record of the source text: its fields as typed (quotes
// removed) and where it starts.
type record struct {
	fields []string
	num    int // 1-based record number
	line   int // 1-based line of the text where the record starts
}

// reader splits text into records. It is lenient in the way a clipboard
// needs: rows may have any number of fields, a stray quote inside a cell is
// kept as text, and an opening quote that is never closed is read as text
// rather than swallowing the rest of the table. Each leniency that changes
// what the user might expect is reported as a Problem.
type reader struct {
	s        string
	pos      int
	line     int
	num      int
	delim    byte
	problems []*Problem
	quiet    bool     // do not record problems (delimiter detection)
	buf      []string // backing store for fields, handed out in chunks
}

func newReader(s string, delim byte) *reader {
	return &reader{s: s, line: 1, delim: delim}
}

// readAll reads up to limit records (all when limit <= 0).
func (r *reader) readAll(limit int) []record {
	n := limit
	if n <= 0 {
		n = strings.Count(r.s, "\n") + 1
	}
	recs := make([]record, 0, n)
	for r.pos < len(r.s) && (limit <= 0 || len(recs) < limit) {
		recs = append(recs, r.readRecord())
	}
	return recs
}

// readRecord reads one record; r.pos must be before the end of the text.
func (r *reader) readRecord() record {
	r.num++
	rec := record{num: r.num, line: r.line}
	start := len(r.buf)
	for {
		field, more := r.readField(len(r.buf) - start + 1)
		r.buf = append(r.buf, field)
		if !more {
			break
		}
	}
	rec.fields = r.buf[start:len(r.buf):len(r.buf)]
	if cap(r.buf)-len(r.buf) < 64 {
		// Start a fresh chunk so that earlier records keep their fields.
		r.buf = make([]string, 0, 4096)
	}
	r.endRecord()
	return rec
}

// endRecord consumes the line ending after a record, if any.
func (r *reader) endRecord() {
	if r.pos >= len(r.s) {
		return
	}
	switch r.s[r.pos] {
	case '\r':
		r.pos++
		if r.pos < len(r.s) && r.s[r.pos] == '\n' {
			r.pos++
		}
		r.line++
	case '\n':
		r.pos++
		r.line++
	}
}

// readField reads the field starting at r.pos and reports whether another
// field of the same record follows (a delimiter was consumed).
func (r *reader) readField(col int) (string, bool) {
	p := r.pos
	if r.delim != ' ' {
		for p < len(r.s) && r.s[p] == ' ' {
			p++
		}
	}
	if p < len(r.s) && r.s[p] == '"' {
		if f, ok := r.readQuoted(p+1, col); ok {
			return f, r.afterField()
		}
		r.report(col, r.s[r.pos:r.fieldEnd(r.pos)], Warning,
			fmt.Errorf("%w: the opening quote is never closed, so it is read as part of the text", ErrQuote))
	}
	end := r.fieldEnd(r.pos)
	f := r.s[r.pos:end]
	r.pos = end
	return f, r.afterField()
}

// fieldEnd is the index of the delimiter or line break that ends an unquoted
// field starting at p.
func (r *reader) fieldEnd(p int) int {
	s, d := r.s, r.delim
	for i := p; i < len(s); i++ {
		if c := s[i]; c == d || c == '\n' || c == '\r' {
			return i
		}
	}
	return len(s)
}

// afterField consumes the delimiter after a field and reports whether one was
// there; at a line break or the end of the text it consumes nothing.
func (r *reader) afterField() bool {
	if r.pos < len(r.s) && r.s[r.pos] == r.delim {
		r.pos++
		return true
	}
	return false
}

// readQuoted reads a quoted field whose text starts at p (just after the
// opening quote). Doubled quotes stand for one quote. It returns false, and
// leaves the reader where it was, when the quote is never closed.
func (r *reader) readQuoted(p, col int) (string, bool) {
	s := r.s
	var b strings.Builder
	seg := p
	i := p
	for {
		j := strings.IndexByte(s[i:], '"')
		if j < 0 {
			return "", false
		}
		i += j
		if i+1 < len(s) && s[i+1] == '"' {
			b.WriteString(s[seg : i+1])
			i += 2
			seg = i
			continue
		}
		break
	}
	// s[i] is the closing quote.
	var f string
	if b.Len() == 0 {
		f = s[seg:i]
	} else {
		b.WriteString(s[seg:i])
		f = b.String()
	}
	r.line += countLines(s[p:i])
	if strings.IndexByte(f, '\r') >= 0 {
		f = strings.ReplaceAll(strings.ReplaceAll(f, "\r\n", "\n"), "\r", "\n")
	}
	r.pos = i + 1
	// Spaces after the closing quote are fine; anything else is kept as text.
	end := r.fieldEnd(r.pos)
	if rest := s[r.pos:end]; trimSpace(rest) != "" {
		r.report(col, s[p-1:end], Warning,
			fmt.Errorf("%w: text follows the closing quote; it is kept as part of the cell", ErrQuote))
		f += rest
	}
	r.pos = end
	return f, true
}

func (r *reader) report(col int, text string, sev Severity, err error) {
	if r.quiet {
		return
	}
	r.problems = append(r.problems, &Problem{Row: r.num, Column: col, Text: text, Err: err, Severity: sev, Line: r.line})
}

// countLines counts line breaks (LF, CRLF or a lone CR) in s.
func countLines(s string) int {
	n := 0
	for i := 0; i < len(s); i++ {
		switch s[i] {
		case '\n':
			n++
		case '\r':
			if i+1 >= len(s) || s[i+1] != '\n' {
				n++
			}
		}
	}
	return n
}

// detectDelimiter picks tab, semicolon or comma by how consistently each
// splits the first records into the same number of fields. Tab wins whenever
// it splits rows at all (it is what spreadsheets put on the clipboard);
// between semicolon and comma the more consistent wins, and semicolon wins a
// tie because with semicolons, commas are usually decimal marks.
func detectDelimiter(s string) byte {
	const sample = 200
	type score struct {
		delim byte
		mode  int
		share float64
	}
	var scores []score
	for _, d := range []byte{'\t', ';', ','} {
		if strings.IndexByte(s, d) < 0 {
			continue
		}
		r := newReader(s, d)
		r.quiet = true
		counts := map[int]int{}
		n := 0
		for _, rec := range r.readAll(sample) {
			if isBlank(rec.fields) {
				continue
			}
			counts[len(rec.fields)]++
			n++
		}
		mode, best := 0, 0
		for k, c := range counts {
			if c > best || (c == best && k > mode) {
				mode, best = k, c
			}
		}
		if mode < 2 {
			continue
		}
		sc := score{d, mode, float64(best) / float64(n)}
		if d == '\t' {
			return '\t'
		}
		scores = append(scores, sc)
	}
	switch len(scores) {
	case 0:
		return '\t'
	case 1:
		return scores[0].delim
	}
	if scores[1].share > scores[0].share {
		return scores[1].delim
	}
	return scores[0].delim
}

// isBlank reports whether every field is empty or white space.
func isBlank(fields []string) bool {
	for _, f := range fields {
		if trimSpace(f) != "" {
			return false
		}
	}
	return true
}

// decode turns the bytes of a pasted or saved table into text: UTF-16 with a
// byte order mark (what spreadsheets save as "Unicode text"), UTF-8 with or
// without a byte order mark, and, when the bytes are not valid UTF-8,
// Windows-1252 (what spreadsheets save as plain CSV in Western Europe and the
// Americas), which is reported. It takes the bytes as a string so that Parse
// and ParseBytes read the same bytes the same way.
func decode(b string) (string, *Problem) {
	switch {
	case len(b) >= 2 && b[0] == 0xFF && b[1] == 0xFE:
		return fromUTF16(b[2:], false), nil
	case len(b) >= 2 && b[0] == 0xFE && b[1] == 0xFF:
		return fromUTF16(b[2:], true), nil
	case len(b) >= 4 && len(b)%2 == 0 && b[0] != 0 && b[1] == 0 && b[2] != 0 && b[3] == 0:
		// UTF-16 LE without a byte order mark: ASCII letters with zero high bytes.
		return fromUTF16(b, false), nil
	}
	return decodeString(b)
}

// decodeString removes a UTF-8 byte order mark and repairs text that is not
// UTF-8 by reading it as Windows-1252.
func decodeString(s string) (string, *Problem) {
	s = strings.TrimPrefix(s, "\uFEFF")
	if utf8.ValidString(s) {
		return s, nil
	}
	var b strings.Builder
	b.Grow(len(s) + len(s)/8)
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			b.WriteRune(windows1252(s[i]))
		} else {
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String(), &Problem{Severity: Note, Err: fmt.Errorf(
		"%w: the text is not UTF-8, so it was read as Windows-1252 (Western European); check accented letters and currency signs", ErrEncoding)}
}

func fromUTF16(b string, bigEndian bool) string {
	u := make([]uint16, len(b)/2)
	for i := range u {
		if bigEndian {
			u[i] = uint16(b[2*i])<<8 | uint16(b[2*i+1])
		} else {
			u[i] = uint16(b[2*i+1])<<8 | uint16(b[2*i])
		}
	}
	return strings.TrimPrefix(string(utf16.Decode(u)), "\uFEFF")
}

// cp1252 holds the characters of Windows-1252 bytes 0x80-0x9F; the other
// bytes above 0x7F are the same as in Latin-1.
var cp1252 = [32]rune{
	'€', 0x81, '‚', 'ƒ', '„', '…', '†', '‡', 'ˆ', '‰', 'Š', '‹', 'Œ', 0x8D, 'Ž', 0x8F,
	0x90, '‘', '’', '“', '”', '•', '–', '—', '˜', '™', 'š', '›', 'œ', 0x9D, 'ž', 'Ÿ',
}

func windows1252(c byte) rune {
	if c >= 0x80 && c < 0xA0 {
		return cp1252[c-0x80]
	}
	return rune(c)
}
