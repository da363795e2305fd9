package api

import (
	"context"
	"fmt"

	"peerlens/engine/dea"
	"peerlens/engine/export"
)

// The candidate set of frontier units can be found in one call (Frontier)
// or split over several workers, as the page does for large studies:
//
//	FrontierParts             how many independent parts the search has
//	FrontierPart(p)           the candidates of part p, on any worker
//	FrontierCheck(pool, lo, hi) with pool the sorted union of all parts'
//	                          candidates: the units of pool[lo:hi] that stay
//
// With one part, its candidates are the set; with several, the set is the
// answers of FrontierCheck over consecutive pieces of pool, joined in order.
// Either way it is the set Frontier returns (dea.Frontier does the same).

// FrontierSet is what Frontier returns: the candidate set (indices into
// the included units) and how many units are included.
type FrontierSet struct {
	Frontier []int `json:"frontier"`
	Units    int   `json:"units"`
}

// Frontier finds the candidate set of a study's included units
// (dea.Frontier), so that a run split over several workers computes it once.
func Frontier(ctx context.Context, studyJSON []byte) ([]byte, error) {
	l, err := loadChecked(studyJSON)
	if err != nil {
		return nil, err
	}
	f, err := dea.Frontier(ctx, &l.data)
	if err != nil {
		return nil, err
	}
	return export.JSON(FrontierSet{Frontier: nonNil(f), Units: len(l.data.X)})
}

// PartsInfo is what FrontierParts returns: the number of parts, how many
// units each covers (for progress) and how many units are included.
type PartsInfo struct {
	Parts int   `json:"parts"`
	Sizes []int `json:"sizes"`
	Units int   `json:"units"`
}

// FrontierParts says how the candidate search of a study is cut into
// independent parts (dea.FrontierParts).
func FrontierParts(studyJSON []byte) ([]byte, error) {
	l, err := loadChecked(studyJSON)
	if err != nil {
		return nil, err
	}
	ps := l.frontierParts()
	info := PartsInfo{Parts: len(ps), Sizes: make([]int, len(ps)), Units: len(l.data.X)}
	for p, units := range ps {
		info.Sizes[p] = len(units)
	}
	return export.JSON(info)
}

// Candidates is what FrontierPart returns (indices into the included units,
// in increasing order).
type Candidates struct {
	Candidates []int `json:"candidates"`
}

// FrontierPart finds the candidates of part p (from 0) of FrontierParts.
func FrontierPart(ctx context.Context, studyJSON []byte, p int) ([]byte, error) {
	l, err := loadChecked(studyJSON)
	if err != nil {
		return nil, err
	}
	ps := l.frontierParts()
	if p < 0 || p >= len(ps) {
		return nil, fmt.Errorf("the search for frontier units has no part %d: this study has %d (numbered from 0)", p, len(ps))
	}
	c, err := dea.FrontierPart(ctx, &l.data, ps[p])
	if err != nil {
		return nil, err
	}
	return export.JSON(Candidates{Candidates: nonNil(c)})
}

// Kept is what FrontierCheck returns: the units of the piece checked that
// stay candidates, in the order of the pool.
type Kept struct {
	Kept []int `json:"kept"`
}

// FrontierCheck checks the units pool[lo:hi] against all of pool, the
// candidates of every part of FrontierParts in increasing order, and
// returns those that stay candidates (dea.FrontierCheck).
func FrontierCheck(ctx context.Context, studyJSON []byte, pool []int, lo, hi int) ([]byte, error) {
	l, err := loadChecked(studyJSON)
	if err != nil {
		return nil, err
	}
	if err := checkUnitList(pool, len(l.data.X), "the pool of candidates to check", true); err != nil {
		return nil, err
	}
	if lo < 0 || hi < lo || hi > len(pool) {
		return nil, fmt.Errorf("the piece to check, from %d to %d, does not lie within the pool of %d candidates", lo, hi, len(pool))
	}
	kept, err := dea.FrontierCheck(ctx, &l.data, pool, pool[lo:hi])
	if err != nil {
		return nil, err
	}
	return export.JSON(Kept{Kept: nonNil(kept)})
}

// loadChecked is load for the frontier search, which needs data a model
// can use (a run checks the same itself).
func loadChecked(studyJSON []byte) (*loaded, error) {
	l, err := load(studyJSON)
	if err != nil {
		return nil, err
	}
	if err := l.check(); err != nil {
		return nil, err
	}
	return l, nil
}

// checkUnitList rejects a list of units (what names it) that cannot belong
// to a study of n included units: empty, out of range, repeated, or, when
// sorted is set, not in increasing order.
func checkUnitList(units []int, n int, what string, sorted bool) error {
	if len(units) == 0 {
		return fmt.Errorf("%s is empty", what)
	}
	seen := make([]bool, n)
	for k, j := range units {
		if j < 0 || j >= n {
			return fmt.Errorf("%s names unit %d, but the study has %d included units", what, j, n)
		}
		if seen[j] {
			return fmt.Errorf("%s names unit %d twice", what, j)
		}
		seen[j] = true
		if sorted && k > 0 && j < units[k-1] {
			return fmt.Errorf("%s must list its units in increasing order (unit %d comes after %d)", what, j, units[k-1])
		}
	}
	return nil
}
