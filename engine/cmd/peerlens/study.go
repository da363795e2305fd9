package main

import (
	"errors"

	"peerlens/engine/dea"
)

func loadStudy(path string) (*dea.Data, dea.Model, error) {
	return nil, dea.Model{}, errors.New("-study: not yet")
}
