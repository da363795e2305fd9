package kernel

// Dots sets dst[k] to the dot product of y with column k, for every k:
// column k is cols[k*len(y) : (k+1)*len(y)], and cols must hold at least
// len(dst)*len(y) values.
func Dots(dst, cols, y []float64) {
	if len(y) == 0 {
		clear(dst)
		return
	}
	if dotsFixed(dst, cols, y) {
		return
	}
	m := len(y)
	cols = cols[:m*len(dst)]
	for k := range dst {
		c := cols[k*m : (k+1)*m]
		t := 0.0
		for i, v := range c {
			t += v * y[i]
		}
		dst[k] = t
	}
}
