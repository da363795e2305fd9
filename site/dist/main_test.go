package main

import (
	"crypto/sha256"
	"encoding/base64"
	"encoding/json"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"
)

func page(files map[string]string) fstest.MapFS {
	fs := fstest.MapFS{}
	for name, text := range files {
		fs[name] = &fstest.MapFile{Data: []byte(text)}
	}
	return fs
}

var small = map[string]string{
	"index.html": `<!doctype html><html><head>
<meta http-equiv="Content-Security-Policy" content="default-src 'self'">
<link rel="icon" href="icon.svg" type="image/svg+xml">
<link rel="stylesheet" href="css/a.css">
<link rel="stylesheet" href="css/p.css" media="print">
<script type="module" src="js/main.js"></script>
</head><body><p id="engine-status"></p></body></html>`,
	"icon.svg":   `<svg xmlns="http://www.w3.org/2000/svg"/>`,
	"css/a.css":  `body { color: #000 }`,
	"css/p.css":  `.x { display: none }`,
	"js/main.js": "import { a } from './a.js';\nimport * as e from '../engine.js';\nconsole.log(a, e, '</script>');\n",
	"js/a.js":    "export const a = new URL('./', import.meta.url).href;\n",
	"engine.js":  "import { a } from './js/a.js';\nexport const e = a;\n",
	"worker.js":  "self.onmessage = () => {};\n",
}

// TestBuildSelfContained checks the single file: no address outside it, the
// policy allows exactly the inline loader and styles by hash and forbids
// connections, and the modules come leaves first with imports resolved.
func TestBuildSelfContained(t *testing.T) {
	out, err := Build(page(small), []byte("\x00asm-engine"), nil, []byte("// wasm_exec\n"))
	if err != nil {
		t.Fatal(err)
	}
	html := string(out)
	for _, ref := range regexp.MustCompile(`(?:src|href)="([^"]+)"`).FindAllStringSubmatch(html, -1) {
		if !strings.HasPrefix(ref[1], "data:") {
			t.Errorf("refers to %q outside the file", ref[1])
		}
	}
	csp := regexp.MustCompile(`content="(default-src[^"]+)"`).FindStringSubmatch(html)
	if csp == nil {
		t.Fatal("no policy")
	}
	if !strings.Contains(csp[1], "connect-src 'none'") || strings.Contains(csp[1], "unsafe-inline") {
		t.Errorf("policy %q", csp[1])
	}
	for _, block := range regexp.MustCompile(`(?s)<(script|style)(?: media="print")?>(.*?)</(?:script|style)>`).FindAllStringSubmatch(html, -1) {
		sum := sha256.Sum256([]byte(block[2]))
		if h := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"; !strings.Contains(csp[1], h) {
			t.Errorf("the inline %s is not allowed by hash %s", block[1], h)
		}
	}
	m := regexp.MustCompile(`<script type="application/json" id="peerlens-modules">(.*?)</script>`).FindStringSubmatch(html)
	if m == nil {
		t.Fatal("no modules")
	}
	var mods []module
	if err := json.Unmarshal([]byte(m[1]), &mods); err != nil {
		t.Fatal(err)
	}
	if len(mods) != 3 {
		t.Fatalf("%d modules, want 3 (a.js once, engine.js, main.js)", len(mods))
	}
	for i, mod := range mods {
		for _, ref := range regexp.MustCompile(`@@peerlens-module-(\d+)@@`).FindAllStringSubmatch(mod.Source, -1) {
			if k, _ := strconv.Atoi(ref[1]); k >= i {
				t.Errorf("module %d imports module %s, which is not before it", i, ref[1])
			}
		}
		if strings.Contains(mod.Source, "import.meta.url") || strings.Contains(mod.Source, "from '.") {
			t.Errorf("module %d still has a relative import or import.meta.url:\n%s", i, mod.Source)
		}
	}
	if !strings.Contains(mods[2].Source, "</script>") || strings.Contains(m[1], "</script>") {
		t.Error("a module's text could end the script block it travels in")
	}
}

func TestBuildRejectsCircles(t *testing.T) {
	files := map[string]string{}
	for k, v := range small {
		files[k] = v
	}
	files["js/a.js"] = "import { m } from './main.js';\nexport const a = 1;\n"
	if _, err := Build(page(files), []byte("x"), nil, nil); err == nil || !strings.Contains(err.Error(), "circle") {
		t.Errorf("err = %v, want one about a circle of imports", err)
	}
}
