package api

import (
	"bytes"
	"sync"

	"peerlens/engine/dea"
	"peerlens/engine/study"
)

// loaded is a study read from its file form, with the data of its included
// units. It is never changed once made, so calls may share it.
type loaded struct {
	json  []byte // the exact bytes it was read from
	study *study.Study
	data  dea.Data

	checkOnce sync.Once
	checkErr  error // dea.CheckData(&data), worked out when first asked for

	partsOnce sync.Once
	parts     [][]int // dea.FrontierParts(&data), worked out when first asked for
}

// check reports data that no model can use (dea.CheckData).
func (l *loaded) check() error {
	l.checkOnce.Do(func() { l.checkErr = dea.CheckData(&l.data) })
	return l.checkErr
}

// frontierParts returns how the candidate search cuts the units into parts
// (the same every time: it depends on the data alone).
func (l *loaded) frontierParts() [][]int {
	l.partsOnce.Do(func() { l.parts = dea.FrontierParts(&l.data) })
	return l.parts
}

// last is the study read most recently. A worker sharing a large run is
// asked several times about the same study (its parts of the frontier
// search, a piece of the last check, its share of the units); reading
// 100,000 units of JSON each time would cost more than some of the work.
// Only one study is kept, and only a study of exactly the same bytes is
// served from it.
var last struct {
	sync.Mutex
	l *loaded
}

// load reads a study and the data of its included units, or returns the
// one read last if studyJSON is byte for byte the same.
func load(studyJSON []byte) (*loaded, error) {
	last.Lock()
	defer last.Unlock()
	if last.l != nil && bytes.Equal(last.l.json, studyJSON) {
		return last.l, nil
	}
	s, err := ReadStudy(studyJSON)
	if err != nil {
		return nil, err
	}
	d, _, err := s.Data()
	if err != nil {
		return nil, err
	}
	// A copy: the caller may reuse its buffer.
	last.l = &loaded{json: bytes.Clone(studyJSON), study: s, data: d}
	return last.l, nil
}
