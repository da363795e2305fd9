package dea

// SetRestrictAbove changes the reference-set size above which programs are
// solved by column generation, and returns a function that restores it.
func SetRestrictAbove(n int) (restore func()) {
	old := restrictAbove
	restrictAbove = n
	return func() { restrictAbove = old }
}
