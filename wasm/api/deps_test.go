package api

import (
	"os"
	"os/exec"
	"strings"
	"testing"
)

// The main WebAssembly module must not link the spreadsheet library: it is
// what every page load fetches; workbooks go through wasm/sheets.
func TestMainModuleLeavesOutSpreadsheets(t *testing.T) {
	cmd := exec.Command("go", "list", "-deps", "peerlens/wasm")
	cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	out, err := cmd.Output()
	if err != nil {
		t.Skipf("go list unavailable: %v", err)
	}
	deps := string(out)
	if !strings.Contains(deps, "peerlens/wasm/api") {
		t.Fatalf("go list gave no dependencies of peerlens/wasm:\n%s", deps)
	}
	for _, banned := range []string{"github.com/xuri/excelize", "peerlens/engine/export/xlsx", "peerlens/engine/sheet"} {
		if strings.Contains(deps, banned) {
			t.Errorf("the main module links %s", banned)
		}
	}
}
