package static

import (
	"errors"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func startTemp(t *testing.T) (*Server, string) {
	t.Helper()
	dir := t.TempDir()
	files := map[string]string{
		"index.html":    "<!doctype html><title>t</title>",
		"engine.js":     "export const x = 1;",
		"mod.mjs":       "export {};",
		"peerlens.wasm": "\x00asm\x01\x00\x00\x00",
		"style.css":     "body{}",
	}
	for name, body := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	srv, err := Start(dir, "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { srv.Close() })
	return srv, dir
}

// MIME types the browser insists on: application/wasm for
// WebAssembly.instantiateStreaming and a JavaScript type for module scripts
// (HTML Living Standard, "JavaScript MIME type"; common practice).
func TestServesWithTypesAndNoCache(t *testing.T) {
	srv, _ := startTemp(t)
	tests := []struct{ path, typ, body string }{
		{"", "text/html; charset=utf-8", "<!doctype html>"},
		{"index.html", "text/html; charset=utf-8", "<!doctype html>"},
		{"engine.js", "text/javascript; charset=utf-8", "export const x"},
		{"mod.mjs", "text/javascript; charset=utf-8", "export {}"},
		{"peerlens.wasm", "application/wasm", "\x00asm"},
		{"style.css", "text/css; charset=utf-8", "body{}"},
	}
	for _, tc := range tests {
		res, err := http.Get(srv.URL + tc.path)
		if err != nil {
			t.Fatal(err)
		}
		body, _ := io.ReadAll(res.Body)
		res.Body.Close()
		if res.StatusCode != http.StatusOK {
			t.Errorf("%s: status %d", tc.path, res.StatusCode)
		}
		if got := res.Header.Get("Content-Type"); got != tc.typ {
			t.Errorf("%s: Content-Type %q, want %q", tc.path, got, tc.typ)
		}
		if got := res.Header.Get("Cache-Control"); !strings.Contains(got, "no-store") {
			t.Errorf("%s: Cache-Control %q, want no-store", tc.path, got)
		}
		if !strings.HasPrefix(string(body), tc.body) {
			t.Errorf("%s: body %q, want prefix %q", tc.path, body, tc.body)
		}
	}
}

func TestMissingFileAndTraversal(t *testing.T) {
	srv, _ := startTemp(t)
	for _, p := range []string{"nothing.js", "../static.go", "%2e%2e/static.go"} {
		res, err := http.Get(srv.URL + p)
		if err != nil {
			t.Fatal(err)
		}
		body, _ := io.ReadAll(res.Body)
		res.Body.Close()
		if res.StatusCode == http.StatusOK && strings.Contains(string(body), "package static") {
			t.Errorf("%s: served a file outside the folder", p)
		}
	}
}

func TestLoopbackOnly(t *testing.T) {
	dir := t.TempDir()
	for _, addr := range []string{"0.0.0.0:0", "192.0.2.1:0", ":0x"} {
		srv, err := Start(dir, addr)
		if err == nil {
			srv.Close()
			t.Errorf("Start(%q) listened; want an error", addr)
		}
	}
	if _, err := Start(dir, "0.0.0.0:0"); !errors.Is(err, ErrNotLoopback) {
		t.Errorf("Start(0.0.0.0:0) = %v, want ErrNotLoopback", err)
	}
	srv, err := Start(dir, ":0")
	if err != nil {
		t.Fatal(err)
	}
	defer srv.Close()
	if !strings.HasPrefix(srv.URL, "http://127.0.0.1:") || strings.HasSuffix(srv.URL, ":0/") {
		t.Errorf("URL %q, want a free port on 127.0.0.1", srv.URL)
	}
}

func TestNotAFolder(t *testing.T) {
	if _, err := Start(filepath.Join(t.TempDir(), "absent"), "127.0.0.1:0"); err == nil {
		t.Error("Start on a missing folder succeeded")
	}
}
