// Package static serves the Peerlens page from a folder on this machine, for
// development and for the browser tests.
//
// It binds to the loopback address only, sends the MIME types a browser needs
// for WebAssembly and ES modules (application/wasm, text/javascript), and asks
// the browser not to cache anything so that a rebuilt engine is always
// picked up. It is not a production server: Peerlens needs none.
//
//	srv, err := static.Start("site", "127.0.0.1:0")
//	if err != nil { ... }
//	defer srv.Close()
//	fmt.Println(srv.URL) // http://127.0.0.1:41234/
package static
