#!/usr/bin/env bash
# Peerlens build script. Usage: ./build.sh serve|test|dist|bench
set -euo pipefail
cd "$(dirname "$0")"
export GOFLAGS="${GOFLAGS:--buildvcs=false}"

# need_packages installs Debian packages that the tests need when missing.
need_packages() {
	local missing=()
	command -v chromium >/dev/null 2>&1 || missing+=(chromium)
	command -v glpsol >/dev/null 2>&1 || missing+=(glpk-utils)
	command -v node >/dev/null 2>&1 || missing+=(nodejs)
	command -v pdftotext >/dev/null 2>&1 || missing+=(poppler-utils)
	if [ ${#missing[@]} -gt 0 ]; then
		echo "build.sh: installing ${missing[*]} with apt-get" >&2
		if [ "$(id -u)" = 0 ]; then SUDO=""; else SUDO="sudo"; fi
		$SUDO apt-get update -qq
		DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq "${missing[@]}" >/dev/null
	fi
}

# build_wasm compiles the engine bridge and copies wasm_exec.js into site/.
build_wasm() {
	local out=${1:-site}
	GOOS=js GOARCH=wasm go build -trimpath -ldflags="-s -w" -o "$out/peerlens.wasm" ./wasm
	cp "$(go env GOROOT)/lib/wasm/wasm_exec.js" "$out/wasm_exec.js"
}

cmd=${1:-help}
shift || true
case "$cmd" in
serve)
	build_wasm site
	exec go run ./site/server -dir site "$@"
	;;
test)
	need_packages
	go mod download
	echo "== go vet"
	go vet ./...
	GOOS=js GOARCH=wasm go vet ./wasm/... ./engine/...
	echo "== native tests"
	go test -count=1 -timeout 40m ./...
	echo "== WebAssembly tests under Node"
	PATH="$(go env GOROOT)/lib/wasm:$PATH" GOOS=js GOARCH=wasm go test -count=1 -timeout 20m ./engine/... ./wasm/...
	;;
dist)
	# One self-contained HTML file, usable offline from a file:// address.
	tmp=$(mktemp -d)
	trap 'rm -rf "$tmp"' EXIT
	build_wasm "$tmp"
	go run ./site/dist -site site -wasm "$tmp/peerlens.wasm" -wasm-exec "$tmp/wasm_exec.js" -out dist/peerlens.html
	;;
bench)
	echo "build.sh bench: not yet" >&2
	exit 2
	;;
*)
	echo "usage: ./build.sh serve|test|dist|bench" >&2
	exit 2
	;;
esac
