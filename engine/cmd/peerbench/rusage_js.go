//go:build js

package main

import "syscall/js"

// maxRSSMB is the Node process's peak resident memory
// (process.resourceUsage().maxRSS, in kilobytes), or 0 outside Node.
func maxRSSMB() float64 {
	p := js.Global().Get("process")
	if p.IsUndefined() || p.Get("resourceUsage").IsUndefined() {
		return 0
	}
	return p.Call("resourceUsage").Get("maxRSS").Float() / 1024
}
