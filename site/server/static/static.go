package static

import (
	"errors"
	"fmt"
	"mime"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"strings"
)

// types are the MIME types set by file extension. The system's table is not
// trusted: some machines map .js to application/x-javascript, which browsers
// refuse for ES modules, and many know nothing of .wasm, which
// WebAssembly.instantiateStreaming needs as application/wasm.
var types = map[string]string{
	".html": "text/html; charset=utf-8",
	".css":  "text/css; charset=utf-8",
	".js":   "text/javascript; charset=utf-8",
	".mjs":  "text/javascript; charset=utf-8",
	".json": "application/json",
	".wasm": "application/wasm",
	".svg":  "image/svg+xml",
	".png":  "image/png",
	".ico":  "image/x-icon",
	".csv":  "text/csv; charset=utf-8",
	".txt":  "text/plain; charset=utf-8",
	".xlsx": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
}

// ContentType returns the MIME type served for a file name.
func ContentType(name string) string {
	ext := strings.ToLower(filepath.Ext(name))
	if t, ok := types[ext]; ok {
		return t
	}
	if t := mime.TypeByExtension(ext); t != "" {
		return t
	}
	return "application/octet-stream"
}

// Policy is the Content Security Policy sent with every file. It repeats
// the policy in index.html's meta element: only the page's own files, the
// engine's WebAssembly, workers from the page or blob: addresses, images
// from data: and blob: addresses, and no connection to anywhere else.
const Policy = "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; style-src 'self'; img-src 'self' data: blob:; worker-src 'self' blob:; connect-src 'self'; object-src 'none'; base-uri 'none'; form-action 'none'"

// Handler serves the files under dir with fixed MIME types and headers that
// turn caching off.
func Handler(dir string) http.Handler {
	files := http.FileServer(http.Dir(dir))
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		name := r.URL.Path
		if strings.HasSuffix(name, "/") {
			name += "index.html"
		}
		h := w.Header()
		h.Set("Content-Type", ContentType(name))
		h.Set("Cache-Control", "no-store, must-revalidate")
		h.Set("Pragma", "no-cache")
		h.Set("Expires", "0")
		h.Set("X-Content-Type-Options", "nosniff")
		h.Set("Content-Security-Policy", Policy)
		files.ServeHTTP(w, r)
	})
}

// ErrNotLoopback is returned by Start for an address that is not on the
// loopback interface: the development server never listens on the network.
var ErrNotLoopback = errors.New("static: the server only listens on 127.0.0.1 or ::1")

// Server is a running static server.
type Server struct {
	// URL is the address to open, with a trailing slash.
	URL  string
	Addr net.Addr
	srv  *http.Server
	done chan error
}

// Start serves dir at addr (for example "127.0.0.1:8080", or
// "127.0.0.1:0" for a free port) in the background. An empty host means
// 127.0.0.1; any other host must be a loopback address.
func Start(dir, addr string) (*Server, error) {
	st, err := os.Stat(dir)
	if err != nil {
		return nil, fmt.Errorf("static: %w", err)
	}
	if !st.IsDir() {
		return nil, fmt.Errorf("static: %s is not a folder", dir)
	}
	host, port, err := net.SplitHostPort(addr)
	if err != nil {
		return nil, fmt.Errorf("static: address %q: %w", addr, err)
	}
	if host == "" || host == "localhost" {
		host = "127.0.0.1"
	}
	if ip := net.ParseIP(host); ip == nil || !ip.IsLoopback() {
		return nil, fmt.Errorf("%w (got %q)", ErrNotLoopback, host)
	}
	ln, err := net.Listen("tcp", net.JoinHostPort(host, port))
	if err != nil {
		return nil, fmt.Errorf("static: %w", err)
	}
	s := &Server{
		URL:  "http://" + ln.Addr().String() + "/",
		Addr: ln.Addr(),
		srv:  &http.Server{Handler: Handler(dir)},
		done: make(chan error, 1),
	}
	go func() { s.done <- s.srv.Serve(ln) }()
	return s, nil
}

// Wait blocks until the server stops and returns why.
func (s *Server) Wait() error {
	err := <-s.done
	if errors.Is(err, http.ErrServerClosed) {
		return nil
	}
	return err
}

// Close stops the server at once.
func (s *Server) Close() error { return s.srv.Close() }
