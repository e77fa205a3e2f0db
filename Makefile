# earshot — see README.md and DEVELOPERS.md.
GO       ?= go
GOFILES   = $(shell find cmd propagation receiver assets wasm -name '*.go' 2>/dev/null)
# Packages that must build for the browser.
WASMPKGS  = ./propagation/... ./receiver/... ./assets/...
WASMEXEC  = $(shell $(GO) env GOROOT)/lib/wasm/go_js_wasm_exec

.PHONY: run test fmt vet unit fuzz wasm bench bench-wasm

## run: the main job on the embedded demo scenario
run:
	$(GO) run ./cmd/earshot predict

## test: formatting, vet, all tests, short fuzz runs, and the WebAssembly build
test: fmt vet unit fuzz wasm

fmt:
	@bad=$$(gofmt -l $(GOFILES)); \
	if [ -n "$$bad" ]; then echo "gofmt needed on:"; echo "$$bad"; exit 1; fi

vet:
	$(GO) vet ./...

unit:
	$(GO) test ./...

# Short fuzz runs of the file parsers (fixed counts: a time limit can trip
# a known go-test fuzzing deadline bug on Go 1.26).
fuzz:
	$(GO) test -run NONE -fuzz '^FuzzParseScenario$$' -fuzztime 30000x ./assets
	$(GO) test -run NONE -fuzz '^FuzzParseStationsCSV$$' -fuzztime 50000x ./assets

wasm:
	GOOS=js GOARCH=wasm $(GO) build $(WASMPKGS)

## bench: native benchmarks of the hot paths
bench:
	$(GO) test -run NONE -bench . -benchmem ./propagation/... ./receiver/...

## bench-wasm: the same benchmarks under WebAssembly in node
bench-wasm:
	GOOS=js GOARCH=wasm $(GO) test -exec="$(WASMEXEC)" -run NONE -bench . -benchmem ./propagation/... ./receiver/...
