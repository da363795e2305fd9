// Package api is the engine's call surface for the WebAssembly bridge: each
// function takes and returns JSON (the study file form for studies, the
// dea.Result form for results) and calls the engine packages, which do all
// the work. It holds no numerics and no browser code, so it builds and is
// tested natively; package main in wasm/ only moves values between
// JavaScript and these functions.
//
// Numbers that are not defined (NaN, infinities) travel as null (see
// export.JSON); ReadResult restores them.
package api
