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

// cpuSeconds is the CPU time (user and system) the Node process has used
// (process.cpuUsage(), in microseconds), or 0 outside Node.
func cpuSeconds() float64 {
	p := js.Global().Get("process")
	if p.IsUndefined() || p.Get("cpuUsage").IsUndefined() {
		return 0
	}
	u := p.Call("cpuUsage")
	return (u.Get("user").Float() + u.Get("system").Float()) / 1e6
}
