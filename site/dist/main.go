// Command dist writes Peerlens as one self-contained HTML file that works
// from a file:// address with no network at all:
//
//	go run ./site/dist -site site -wasm peerlens.wasm -wasm-exec wasm_exec.js -out dist/peerlens.html
//
// ./build.sh dist runs it. The file holds:
//
//   - the style sheets as <style> elements;
//   - the page's ES modules as data (a JSON <script> block, which browsers do
//     not run), each import rewritten to a placeholder; a small loader turns
//     them into blob: modules, leaves first, and imports the main one
//     (file:// pages cannot import modules from files);
//   - the engine's worker source (wasm_exec.js, then worker.js) as data, which
//     the loader starts as a blob: worker (file:// pages cannot start workers
//     from files either);
//   - the WebAssembly engine, gzip-compressed and base64-encoded, which the
//     loader unpacks with DecompressionStream and hands to the page as
//     globalThis.peerlensOffline = {workerURL, wasm, sheets} (promises of
//     ArrayBuffers; sheets is null without -sheets); engine.js passes the
//     bytes to the worker instead of fetching them;
//   - import.meta.url rewritten to document.baseURI, since a blob: module's
//     own address cannot resolve relative addresses.
//
// The Content Security Policy of the file allows only the loader and the
// styles by their SHA-256 hashes, blob: modules and workers, and WebAssembly;
// it forbids every connection (connect-src 'none').
package main

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/base64"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io/fs"
	"log"
	"os"
	"path"
	"path/filepath"
	"regexp"
	"strings"
)

func main() {
	site := flag.String("site", "site", "folder of the page")
	wasm := flag.String("wasm", "site/peerlens.wasm", "the engine compiled to WebAssembly")
	sheets := flag.String("sheets", "", "the spreadsheet module compiled to WebAssembly (optional)")
	wasmExec := flag.String("wasm-exec", "site/wasm_exec.js", "Go's wasm_exec.js")
	out := flag.String("out", "dist/peerlens.html", "file to write")
	flag.Parse()
	var sheetsWasm []byte
	if *sheets != "" {
		sheetsWasm = mustRead(*sheets)
	}
	page, err := Build(os.DirFS(*site), mustRead(*wasm), sheetsWasm, mustRead(*wasmExec))
	if err != nil {
		log.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Dir(*out), 0o755); err != nil {
		log.Fatal(err)
	}
	if err := os.WriteFile(*out, page, 0o644); err != nil {
		log.Fatal(err)
	}
	fmt.Printf("wrote %s (%d KiB)\n", *out, len(page)>>10)
}

func mustRead(name string) []byte {
	b, err := os.ReadFile(name)
	if err != nil {
		log.Fatal(err)
	}
	return b
}

var (
	cspMeta    = regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="[^"]*">`)
	styleLink  = regexp.MustCompile(`<link rel="stylesheet" href="([^"]+)"( media="[^"]+")?>`)
	iconLink   = regexp.MustCompile(`<link rel="icon" href="([^"]+)" type="([^"]+)">`)
	mainScript = regexp.MustCompile(`<script type="module" src="([^"]+)"></script>`)
	// importRe finds the module specifiers of static imports and re-exports:
	// `import x from './a.js'`, `import './a.js'`, `export {x} from './a.js'`.
	importRe = regexp.MustCompile(`(?m)^\s*(?:import|export)\b[^'"]*?(?:\bfrom\s*)?['"](\.{1,2}/[^'"]+)['"]`)
	dynamic  = regexp.MustCompile(`\bimport\s*\(`)
)

// module is one ES module of the page, with its imports pointed at the
// placeholders the loader fills in.
type module struct {
	Source string `json:"source"`
}

// Build returns the single-file page.
// sheets, when not nil, is the spreadsheet module, offered the same way
// as peerlensOffline.sheets.
func Build(site fs.FS, wasm, sheets, wasmExec []byte) ([]byte, error) {
	html, err := fs.ReadFile(site, "index.html")
	if err != nil {
		return nil, err
	}
	page := string(html)
	var styleHashes []string
	var failed error
	page = styleLink.ReplaceAllStringFunc(page, func(tag string) string {
		m := styleLink.FindStringSubmatch(tag)
		css, err := fs.ReadFile(site, m[1])
		if err != nil {
			failed = err
			return tag
		}
		text := "\n" + string(css) + "\n"
		styleHashes = append(styleHashes, hash(text))
		return "<style" + m[2] + ">" + text + "</style>"
	})
	page = iconLink.ReplaceAllStringFunc(page, func(tag string) string {
		m := iconLink.FindStringSubmatch(tag)
		icon, err := fs.ReadFile(site, m[1])
		if err != nil {
			failed = err
			return tag
		}
		return `<link rel="icon" href="data:` + m[2] + `;base64,` + base64.StdEncoding.EncodeToString(icon) + `">`
	})
	if failed != nil {
		return nil, failed
	}
	m := mainScript.FindStringSubmatch(page)
	if m == nil {
		return nil, errors.New("index.html has no <script type=\"module\" src=...>")
	}
	mods, err := collect(site, path.Clean(m[1]))
	if err != nil {
		return nil, err
	}
	worker, err := fs.ReadFile(site, "worker.js")
	if err != nil {
		return nil, err
	}
	packed, err := pack(wasm)
	if err != nil {
		return nil, err
	}
	packedSheets, err := pack(sheets)
	if err != nil {
		return nil, err
	}
	modsJSON, err := json.Marshal(mods) // escapes <, > and & as \u003c...
	if err != nil {
		return nil, err
	}
	workerJSON, err := json.Marshal(string(wasmExec) + "\n;\n" + string(worker))
	if err != nil {
		return nil, err
	}
	loader := "\n" + loaderJS + "\n"
	body := `<script type="application/json" id="peerlens-modules">` + string(modsJSON) + "</script>\n" +
		`<script type="application/json" id="peerlens-worker">` + string(workerJSON) + "</script>\n" +
		`<script type="application/octet-stream" id="peerlens-wasm">` + packed + "</script>\n" +
		`<script type="application/octet-stream" id="peerlens-sheets">` + packedSheets + "</script>\n" +
		"<script>" + loader + "</script>"
	page = strings.Replace(page, m[0], "", 1)
	page = strings.Replace(page, "</body>", body+"\n</body>", 1)

	csp := "default-src 'none'; script-src '" + hash(loader) + "' blob: 'wasm-unsafe-eval'; style-src"
	for _, h := range styleHashes {
		csp += " '" + h + "'"
	}
	csp += "; img-src data: blob:; worker-src blob:; connect-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'"
	if !cspMeta.MatchString(page) {
		return nil, errors.New("index.html has no Content Security Policy meta element")
	}
	page = cspMeta.ReplaceAllLiteralString(page, `<meta http-equiv="Content-Security-Policy" content="`+csp+`">`)
	return []byte(page), nil
}

// collect reads the module at name and everything it imports, and returns
// them leaves first, each import rewritten to "@@peerlens-module-N@@", the
// index of the module it names.
func collect(site fs.FS, name string) ([]module, error) {
	index := map[string]int{}
	state := map[string]int{} // 1 = being read, 2 = done
	var mods []module
	var visit func(name string, from []string) (int, error)
	visit = func(name string, from []string) (int, error) {
		switch state[name] {
		case 1:
			return 0, fmt.Errorf("modules import each other in a circle: %s -> %s", strings.Join(from, " -> "), name)
		case 2:
			return index[name], nil
		}
		state[name] = 1
		src, err := fs.ReadFile(site, name)
		if err != nil {
			return 0, err
		}
		// A blob: module's own address cannot resolve relative ones, so
		// addresses are made relative to the page instead.
		text := strings.ReplaceAll(string(src), "import.meta.url", "document.baseURI")
		if dynamic.MatchString(text) {
			return 0, fmt.Errorf("%s uses import(): the single-file build only follows static imports", name)
		}
		var ferr error
		text = importRe.ReplaceAllStringFunc(text, func(stmt string) string {
			sub := importRe.FindStringSubmatch(stmt)
			dep := path.Join(path.Dir(name), sub[1])
			k, err := visit(dep, append(from, name))
			if err != nil && ferr == nil {
				ferr = err
			}
			return strings.Replace(stmt, sub[1], fmt.Sprintf("@@peerlens-module-%d@@", k), 1)
		})
		if ferr != nil {
			return 0, ferr
		}
		mods = append(mods, module{Source: text})
		index[name] = len(mods) - 1
		state[name] = 2
		return index[name], nil
	}
	if _, err := visit(name, nil); err != nil {
		return nil, err
	}
	return mods, nil
}

// pack gzips and base64-encodes a WebAssembly module ("" for none).
func pack(wasm []byte) (string, error) {
	if len(wasm) == 0 {
		return "", nil
	}
	var gz bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&gz, gzip.BestCompression)
	if _, err := zw.Write(wasm); err != nil {
		return "", err
	}
	if err := zw.Close(); err != nil {
		return "", err
	}
	return base64.StdEncoding.EncodeToString(gz.Bytes()), nil
}

// hash is the CSP source expression for an inline element's text.
func hash(text string) string {
	h := sha256.Sum256([]byte(text))
	return "sha256-" + base64.StdEncoding.EncodeToString(h[:])
}

// loaderJS unpacks the engine, starts nothing itself (engine.js starts the
// worker from workerURL) and imports the page's modules from blob: URLs.
const loaderJS = `(() => {
  'use strict';
  const data = (id) => document.getElementById(id).textContent;
  const unpack = (id) => {
    const text = data(id);
    if (!text) return null;
    const packed = Uint8Array.from(atob(text), (c) => c.charCodeAt(0));
    return new Response(new Blob([packed]).stream().pipeThrough(new DecompressionStream('gzip'))).arrayBuffer();
  };
  const wasm = unpack('peerlens-wasm');
  const sheets = unpack('peerlens-sheets');
  const workerURL = URL.createObjectURL(new Blob([JSON.parse(data('peerlens-worker'))], { type: 'text/javascript' }));
  Object.defineProperty(globalThis, 'peerlensOffline', { value: Object.freeze({ workerURL, wasm, sheets }) });
  const urls = [];
  for (const m of JSON.parse(data('peerlens-modules'))) {
    const src = m.source.replace(/@@peerlens-module-(\d+)@@/g, (_, k) => urls[Number(k)]);
    urls.push(URL.createObjectURL(new Blob([src], { type: 'text/javascript' })));
  }
  import(urls[urls.length - 1]).catch((err) => {
    const s = document.getElementById('engine-status');
    if (s) s.textContent = 'The page could not start: ' + (err && err.message ? err.message : String(err));
    console.error(err);
  });
})();`
