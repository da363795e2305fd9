package study_test

import (
	"bytes"
	"fmt"
	"testing"

	"peerlens/engine/bench"
	"peerlens/engine/dea"
	"peerlens/engine/study"
)

// Reading a study file and preparing its data (with every validation rule)
// takes time in proportion to the study's size: compare the two sizes.
func BenchmarkReadAndData(b *testing.B) {
	for _, n := range []int{10000, 100000} {
		s := bench.Study(bench.Config{Units: n, Seed: 1}, dea.Model{Returns: dea.Variable, Orientation: dea.Input})
		s.LeftOut = []string{s.Units[3], s.Units[n/2]}
		var file bytes.Buffer
		if err := s.Write(&file); err != nil {
			b.Fatal(err)
		}
		b.Run(fmt.Sprint(n), func(b *testing.B) {
			for b.Loop() {
				r, err := study.Read(bytes.NewReader(file.Bytes()))
				if err != nil {
					b.Fatal(err)
				}
				if _, _, err := r.Data(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
