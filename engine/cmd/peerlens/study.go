package main

import (
	"fmt"
	"os"

	"peerlens/engine/dea"
	"peerlens/engine/study"
)

// loadStudy reads a study file; its settings choose the model and its
// left-out units stay out. Validation warnings go to standard error.
func loadStudy(path string) (*dea.Data, dea.Model, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, dea.Model{}, err
	}
	defer f.Close()
	s, err := study.Read(f)
	if err != nil {
		return nil, dea.Model{}, fmt.Errorf("%s: %w", path, err)
	}
	d, issues, err := s.Data()
	for _, is := range issues {
		if is.Severity != study.Error {
			fmt.Fprintf(os.Stderr, "peerlens: %s: %s\n", is.Severity, is.Message)
		}
	}
	if err != nil {
		return nil, dea.Model{}, fmt.Errorf("%s: %w", path, err)
	}
	return &d, s.Settings, nil
}
