# earshot — see README.md and DEVELOPERS.md.
GO       ?= go
GOFILES   = $(shell find cmd propagation receiver assets wasm -name '*.go' 2>/dev/null)
# Packages that must build for the browser.
WASMPKGS  = ./propagation/... ./receiver/... ./assets/...
WASMEXEC  = $(shell $(GO) env GOROOT)/lib/wasm/go_js_wasm_exec

# The browser app's web files; make app writes its build outputs here.
SITE      = wasm/site/static

.PHONY: run app dist test fmt vet unit fuzz wasm e2e bench bench-wasm

## run: build the browser app and serve it on http://127.0.0.1:8417/
run: app
	$(GO) run ./cmd/earshot serve

## app: build the browser app into $(SITE) (app.wasm.gz, wasm_exec.js)
# Built and compressed in a temporary directory, then moved into place, so a
# failed build leaves nothing half-written.
app:
	@set -e; tmp=$$(mktemp -d); trap 'rm -rf "$$tmp"; rm -f $(SITE)/.app.wasm.gz.part $(SITE)/.wasm_exec.js.part' EXIT; \
	echo "GOOS=js GOARCH=wasm $(GO) build -trimpath -ldflags=\"-s -w\" -o $$tmp/app.wasm ./wasm/app"; \
	GOOS=js GOARCH=wasm $(GO) build -trimpath -ldflags="-s -w" -o "$$tmp/app.wasm" ./wasm/app; \
	gzip -9 -n -c "$$tmp/app.wasm" > "$$tmp/app.wasm.gz"; \
	cp "$$($(GO) env GOROOT)/lib/wasm/wasm_exec.js" "$$tmp/wasm_exec.js"; \
	cp "$$tmp/app.wasm.gz" $(SITE)/.app.wasm.gz.part; \
	cp "$$tmp/wasm_exec.js" $(SITE)/.wasm_exec.js.part; \
	mv -f $(SITE)/.app.wasm.gz.part $(SITE)/app.wasm.gz; \
	mv -f $(SITE)/.wasm_exec.js.part $(SITE)/wasm_exec.js; \
	echo "wrote $(SITE)/app.wasm.gz ($$(wc -c < $(SITE)/app.wasm.gz) bytes, $$(wc -c < "$$tmp/app.wasm") before gzip)"

## dist: the browser app as one offline HTML file, dist/earshot.html
dist: app
	@mkdir -p dist
	$(GO) run ./cmd/earshot dist --out dist/earshot.html

## test: formatting, vet, all tests, short fuzz runs, the WebAssembly
## build, and the browser app end to end
test: fmt vet unit fuzz wasm e2e

fmt:
	@bad=$$(gofmt -l $(GOFILES)); \
	if [ -n "$$bad" ]; then echo "gofmt needed on:"; echo "$$bad"; exit 1; fi

vet:
	$(GO) vet ./...

# Every package but the browser test, which e2e runs on its own.
unit:
	$(GO) test $$($(GO) list ./... | grep -v /wasm/e2e)

# Short fuzz runs of the file parsers (fixed counts: a time limit can trip
# a known go-test fuzzing deadline bug on Go 1.26).
fuzz:
	$(GO) test -run NONE -fuzz '^FuzzParseScenario$$' -fuzztime 30000x ./assets
	$(GO) test -run NONE -fuzz '^FuzzParseStationsCSV$$' -fuzztime 50000x ./assets

# wasm/app is built (output discarded) only once it exists.
wasm:
	GOOS=js GOARCH=wasm $(GO) build $(WASMPKGS) ./wasm/site
	@if [ -d wasm/app ]; then \
	  echo "GOOS=js GOARCH=wasm $(GO) build -o /dev/null ./wasm/app"; \
	  GOOS=js GOARCH=wasm $(GO) build -o /dev/null ./wasm/app; \
	fi

## e2e: the browser app end to end in headless Chromium (skips without it)
# The test runs make app itself, which go test's cache cannot see: -count=1.
e2e:
	$(GO) test -count=1 -v ./wasm/e2e/

## bench: native benchmarks of the hot paths
bench:
	$(GO) test -run NONE -bench . -benchmem ./propagation/... ./receiver/...

## bench-wasm: the same benchmarks under WebAssembly in node
bench-wasm:
	GOOS=js GOARCH=wasm $(GO) test -exec="$(WASMEXEC)" -run NONE -bench . -benchmem ./propagation/... ./receiver/...
