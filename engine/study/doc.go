// Package study holds one analysis as the user sets it up: the units, the
// measures with their roles (input, output or unused), the numbers, the
// units left out of the run, the text columns kept alongside, and the model
// settings (a dea.Model). It sits between the table reader and the models:
//
//	table.Parse -> FromTable -> (the user picks roles) -> Validate -> Data -> dea
//
// FromTable guesses each measure's role from its header words and marks the
// guess so the page can say so. Validate reports, in plain words that name
// units and measures, everything that stops a run (missing or negative
// values, no input or output, duplicate names) and everything that may
// mislead (zeros, constant or proportional measures, identical units, few
// units for the number of measures, magnitudes far apart), and notes who is
// left out. Data hands the models the inputs and outputs of the included
// units.
//
// A study is saved as a small JSON file, written by Write and read by Read:
//
//	{
//	  "format": 1,
//	  "title": "Clinics 2025",
//	  "units": ["North", "South"],
//	  "measures": [
//	    {"name": "Staff", "role": "input", "controllable": true, "desirable": true},
//	    {"name": "Visits", "role": "output", "controllable": true, "desirable": true}
//	  ],
//	  "values": [
//	    [12, 3400],
//	    [9, null]
//	  ],
//	  "extra": [],
//	  "leftOut": [],
//	  "settings": {"returns": "variable", "orientation": "input", "secondStage": true, "super": false, "scaleDetail": true},
//	  "notes": ""
//	}
//
// null is a missing value. "format" is the file version: a file from a newer
// version is refused with a message that says so, and every other problem
// is a *FileError that says where (line and column, or unit and measure).
//
// Demo returns the demo study: invented data about 30 community pharmacies
// (testdata/demo.csv holds the same table).
package study
