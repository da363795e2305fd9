package table

import "errors"

// Sentinel errors. Every Problem's Err wraps one of these (test with
// errors.Is); the wrapping error's text adds the specific reason in plain
// words, ready to show to the person who typed the table.
var (
	// ErrEmpty is returned by Parse and friends when there is nothing to read.
	ErrEmpty = errors.New("no table found: the text is empty or holds only blank lines")

	// Cell problems.
	ErrNotNumber        = errors.New("not a number")
	ErrMissing          = errors.New("missing value")
	ErrAmbiguousDecimal = errors.New("decimal mark unclear")
	ErrMixedDecimal     = errors.New("decimal mark differs from the rest of the column")
	ErrBracketNegative  = errors.New("brackets read as a minus sign")
	ErrPercent          = errors.New("percent sign")
	ErrCurrency         = errors.New("currency sign")

	// Row problems.
	ErrBlankRow = errors.New("blank row")
	ErrRagged   = errors.New("row has fewer cells than the table")
	ErrTextRow  = errors.New("row holds text where the table holds numbers")
	ErrTooWide  = errors.New("row far wider than the table")

	// Header and column problems.
	ErrNoHeader        = errors.New("no header row")
	ErrEmptyHeader     = errors.New("column has no name")
	ErrDuplicateHeader = errors.New("column name used twice")
	ErrEmptyColumn     = errors.New("empty column")

	// Text problems.
	ErrQuote    = errors.New("quote out of place")
	ErrEncoding = errors.New("text encoding")
)
