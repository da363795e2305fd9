package api

import (
	"context"
	"errors"
	"fmt"

	"peerlens/engine/dea"
	"peerlens/engine/export"
)

// Run runs a study's model on its included units and returns the result.
// units, when not nil, restricts the run to those units (indices into the
// included units), each still compared with all of them; progress is
// called now and then with the units done.
func Run(ctx context.Context, studyJSON []byte, units []int, progress func(done, total int)) ([]byte, error) {
	return RunShare(ctx, studyJSON, Share{Units: units}, progress)
}

// RunPart is Run for one share of a run split over several workers:
// frontier, when not nil, is the candidate set Frontier returned for the
// same study, so that no worker computes it again. Its indices must lie
// among the included units, each once.
func RunPart(ctx context.Context, studyJSON []byte, units, frontier []int, progress func(done, total int)) ([]byte, error) {
	return RunShare(ctx, studyJSON, Share{Units: units, Frontier: frontier}, progress)
}

// Share says which part of a run one worker does.
type Share struct {
	// Units, when not nil, are the only units evaluated (indices into the
	// included units), in this order.
	Units []int
	// Frontier, when not nil, is the candidate set of the study (Frontier,
	// or FrontierPart and FrontierCheck), so that no worker computes it again.
	Frontier []int
	// Part of Parts (Parts above 1, Part from 0 to Parts-1): this worker
	// evaluates every Parts-th chunk of units, starting with chunk Part
	// (dea.Options.Parts). The Parts results merged are identical, bit for
	// bit, to one whole run. Cannot be combined with Units.
	Part, Parts int
}

// RunShare runs one share of a study's run (see Share).
func RunShare(ctx context.Context, studyJSON []byte, sh Share, progress func(done, total int)) ([]byte, error) {
	l, err := load(studyJSON)
	if err != nil {
		return nil, err
	}
	if sh.Frontier != nil {
		if err := checkUnitList(sh.Frontier, len(l.data.X), "the frontier handed to the run", false); err != nil {
			return nil, fmt.Errorf("%w; it must come from the same study", err)
		}
	}
	if sh.Parts != 0 || sh.Part != 0 {
		switch {
		case sh.Parts < 1:
			return nil, fmt.Errorf("a run cannot be shared among %d workers", sh.Parts)
		case sh.Part < 0 || sh.Part >= sh.Parts:
			return nil, fmt.Errorf("share %d of a run shared among %d workers does not exist (shares are numbered from 0 to %d)", sh.Part, sh.Parts, sh.Parts-1)
		case sh.Units != nil && sh.Parts > 1:
			return nil, errors.New("a share of a run cannot also have its own list of units")
		}
	}
	opt := dea.Options{Units: sh.Units, Frontier: sh.Frontier, Progress: progress}
	if sh.Parts > 1 {
		opt.Part, opt.Parts = sh.Part, sh.Parts
	}
	r, err := dea.RunWith(ctx, &l.data, l.study.Settings, opt)
	if err != nil {
		return nil, err
	}
	return export.JSON(r)
}
