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

# build_wasm compiles the engine bridge and the spreadsheet module (loaded
# only when a workbook is opened or exported) and copies wasm_exec.js into site/.
build_wasm() {
	local out=${1:-site}
	GOOS=js GOARCH=wasm go build -trimpath -ldflags="-s -w" -o "$out/peerlens.wasm" ./wasm
	GOOS=js GOARCH=wasm go build -trimpath -ldflags="-s -w" -o "$out/peerlens-sheets.wasm" ./wasm/sheets
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
	go run ./site/dist -site site -wasm "$tmp/peerlens.wasm" -sheets "$tmp/peerlens-sheets.wasm" -wasm-exec "$tmp/wasm_exec.js" -out dist/peerlens.html
	;;
bench)
	# Speed side by side: the engine natively and as WebAssembly under Node,
	# the per-unit HiGHS baseline and the floor, for each study size.
	# BENCH_SIZES (default 1000,10000,100000) and BENCH_SAMPLE_<n> (units the
	# baseline solves at size n) change the run; BENCH_BROWSER=0 leaves out
	# the run in headless Chromium. Everything goes to .cache/.
	command -v node >/dev/null 2>&1 || need_packages
	sizes=${BENCH_SIZES:-1000,10000,100000}
	cache=.cache/bench-node
	if [ ! -f "$cache/node_modules/highs/package.json" ]; then
		echo "== installing the npm package highs into $cache"
		mkdir -p "$cache"
		(cd "$cache" && npm install --no-audit --no-fund --silent highs@1.15.3)
	fi
	out=.cache/bench-run
	rm -rf "$out" && mkdir -p "$out"
	go build -o "$out/peerbench" ./engine/cmd/peerbench
	GOOS=js GOARCH=wasm go build -o "$out/peerbench.wasm" ./engine/cmd/peerbench
	wasmexec="$(go env GOROOT)/lib/wasm/go_js_wasm_exec"
	for n in ${sizes//,/ }; do
		echo "== $n units: engine, native"
		"$out/peerbench" -n "$n" | tee -a "$out/native.jsonl"
		echo "== $n units: engine, WebAssembly under Node"
		"$wasmexec" "$out/peerbench.wasm" -n "$n" | tee -a "$out/wasm.jsonl"
		echo "== $n units: HiGHS, one unit at a time"
		"$out/peerbench" -data "$out" -n "$n"
		var="BENCH_SAMPLE_$n"
		case "$n" in
		1000) def=50 ;;
		10000) def=10 ;;
		*) def=3 ;;
		esac
		NODE_PATH="$cache/node_modules" node engine/bench/highs_baseline.js "$out/study-$n.json" "${!var:-$def}" | tee -a "$out/highs.jsonl"
		rm -f "$out/study-$n.json"
	done
	echo
	echo "== Results (wall-clock seconds and CPU seconds; ratios measured in this run)"
	"$out/peerbench" -table "$out/native.jsonl" "$out/wasm.jsonl" "$out/highs.jsonl"
	# The page's own engine (engine.js and its pool of workers) in headless
	# Chromium, at the same sizes; BENCH_BROWSER=0 skips it.
	if [ "${BENCH_BROWSER:-1}" != 0 ]; then
		echo
		echo "== The page's engine in headless Chromium (wall time, workers, progress updates, peak memory)"
		go build -o "$out/browserbench" ./site/browserbench
		"$out/browserbench" -n "$sizes" | tee "$out/browser.txt"
	fi
	;;
*)
	echo "usage: ./build.sh serve|test|dist|bench" >&2
	exit 2
	;;
esac
