package sitecopy

import (
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
)

// skipped are the folders of site/ that hold Go programs and tests, not
// parts of the page.
var skipped = map[string]bool{"server": true, "browsertest": true, "browserbench": true, "sitecopy": true}

// ModuleRoot finds the folder holding go.mod, upwards from the working
// directory.
func ModuleRoot() (string, error) {
	dir, err := os.Getwd()
	if err != nil {
		return "", err
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			return dir, nil
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			return "", fmt.Errorf("no go.mod above %s", dir)
		}
		dir = parent
	}
}

// Prepare copies the page's files from root/site to dst and builds the
// engine bridge (and the spreadsheet module) to WebAssembly beside them.
func Prepare(root, dst string) error {
	src := filepath.Join(root, "site")
	err := filepath.WalkDir(src, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(src, path)
		if d.IsDir() {
			if skipped[rel] {
				return filepath.SkipDir
			}
			return os.MkdirAll(filepath.Join(dst, rel), 0o755)
		}
		if strings.HasSuffix(rel, ".wasm") || rel == "wasm_exec.js" {
			return nil // built fresh below
		}
		b, err := os.ReadFile(path)
		if err != nil {
			return err
		}
		return os.WriteFile(filepath.Join(dst, rel), b, 0o644)
	})
	if err != nil {
		return err
	}
	// The engine, and the spreadsheet module the page loads to read and
	// write .xlsx files (as build.sh's build_wasm does).
	for _, b := range []struct{ out, pkg string }{{"peerlens.wasm", "./wasm"}, {"peerlens-sheets.wasm", "./wasm/sheets"}} {
		if _, err := os.Stat(filepath.Join(root, b.pkg)); err != nil {
			continue
		}
		build := exec.Command("go", "build", "-o", filepath.Join(dst, b.out), b.pkg)
		build.Dir = root
		build.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
		if out, err := build.CombinedOutput(); err != nil {
			return fmt.Errorf("building %s: %v\n%s", b.pkg, err, out)
		}
	}
	goroot, err := exec.Command("go", "env", "GOROOT").Output()
	if err != nil {
		return fmt.Errorf("go env GOROOT: %v", err)
	}
	b, err := os.ReadFile(filepath.Join(strings.TrimSpace(string(goroot)), "lib", "wasm", "wasm_exec.js"))
	if err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(dst, "wasm_exec.js"), b, 0o644)
}
