// Command server serves the Peerlens page on this machine for development:
//
//	go run ./site/server -dir site [-addr 127.0.0.1:8080]
//
// It prints the address to open. "-addr 127.0.0.1:0" picks a free port. It
// only ever listens on the loopback interface and turns caching off, so a
// rebuilt engine (./build.sh serve) is picked up on reload.
package main

import (
	"flag"
	"fmt"
	"log"
	"os"

	"peerlens/site/server/static"
)

func main() {
	dir := flag.String("dir", "site", "folder to serve")
	addr := flag.String("addr", "127.0.0.1:8080", "loopback address and port to listen on (port 0 picks a free one)")
	flag.Parse()
	srv, err := static.Start(*dir, *addr)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Fprintf(os.Stdout, "Peerlens is served at %s (folder %s); press Ctrl+C to stop.\n", srv.URL, *dir)
	log.Fatal(srv.Wait())
}
