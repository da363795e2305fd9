package report

import (
	"math"
	"strconv"
	"strings"
)

// Number formats a measured amount for a sentence: whole numbers from 100
// up (with thousands separators), one decimal from 1 to 100, three
// significant digits below 1; trailing zeros are dropped.
func Number(v float64) string {
	switch {
	case math.IsNaN(v):
		return "not defined"
	case math.IsInf(v, 1):
		return "unbounded"
	case math.IsInf(v, -1):
		return "minus unbounded"
	}
	a := math.Abs(v)
	var s string
	switch {
	case a >= 100:
		s = group(strconv.FormatFloat(v, 'f', 0, 64))
	case a >= 1:
		s = trim(strconv.FormatFloat(v, 'f', 1, 64))
	case a == 0:
		s = "0"
	default:
		s = trim(strconv.FormatFloat(v, 'f', 2-int(math.Floor(math.Log10(a))), 64))
	}
	if s == "-0" {
		s = "0"
	}
	return s
}

// Percent formats a ratio (0.824) as a percentage with one decimal ("82.4%").
func Percent(ratio float64) string {
	if math.IsNaN(ratio) || math.IsInf(ratio, 0) {
		return Number(ratio)
	}
	return trim(strconv.FormatFloat(ratio*100, 'f', 1, 64)) + "%"
}

// trim drops trailing zeros after a decimal point, and the point itself.
func trim(s string) string {
	if !strings.Contains(s, ".") {
		return s
	}
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}

// group puts thousands separators into a whole number.
func group(s string) string {
	sign := ""
	if strings.HasPrefix(s, "-") {
		sign, s = "-", s[1:]
	}
	if len(s) <= 3 {
		return sign + s
	}
	var b strings.Builder
	head := len(s) % 3
	if head > 0 {
		b.WriteString(s[:head])
	}
	for i := head; i < len(s); i += 3 {
		if b.Len() > 0 {
			b.WriteByte(',')
		}
		b.WriteString(s[i : i+3])
	}
	return sign + b.String()
}

// list joins items as English prose: "A", "A and B", "A, B and C".
func list(items []string) string {
	switch len(items) {
	case 0:
		return ""
	case 1:
		return items[0]
	}
	return strings.Join(items[:len(items)-1], ", ") + " and " + items[len(items)-1]
}
