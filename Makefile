# Drawsift build and checks. Every target reduces to plain go commands,
# documented in DEVELOPERS.md.

GO       ?= go
PYTHON   ?= /usr/bin/python3
GOFLAGS  ?= -trimpath -buildvcs=false
WASMEXEC := $(shell $(GO) env GOROOT)/lib/wasm/go_js_wasm_exec
BIN      := bin

PORT ?= 8080

.PHONY: all build run demo demo-screen test test-native test-wasm vet check tidy staticcheck lint refcheck refdata bench bench-wasm clean

all: build

build:
	@echo "building $(BIN)/drawsift (native)…"
	$(GO) build $(GOFLAGS) -o $(BIN)/drawsift ./cmd/drawsift

# The main job on the built-in demo: the page (engine as WebAssembly in
# the browser) with the demo scenario loaded on first visit, served with
# the HTTP API on 127.0.0.1:$(PORT). The same screen on the terminal:
# make demo-screen.
# The two builds run side by side (-j2), each fetching only the modules it
# imports (not the test and lint tools); on a cold machine the first run
# fills the module and build caches, which dominates.
run:
	@echo "make run: building the CLI and the page's engine (WebAssembly) side by side."
	@echo "  A first run fetches Go modules and fills the build cache (minutes on a cold machine); later runs take seconds."
	@$(MAKE) --no-print-directory -j2 build wasm
	@echo "serving the page and the API at http://127.0.0.1:$(PORT)/ — Ctrl-C stops"
	./$(BIN)/drawsift serve --addr 127.0.0.1:$(PORT) --wasm $(PAGE_WASM)

# The ranked demo screen of a brackish-water field station, in the terminal.
demo-screen: build
	./$(BIN)/drawsift screen --demo --format table

# The osmotic-pressure table of six common draws, real vs van 't Hoff.
demo: build
	./$(BIN)/drawsift demo

# Everything CI checks.
test: vet check lint workerd test-native test-site test-wasm refcheck fuzz

vet:
	@test -z "$$(gofmt -l $$(git ls-files '*.go' 2>/dev/null || find . -name '*.go'))" || (echo 'gofmt needed:'; gofmt -l .; false)
	$(GO) vet ./...
	GOOS=js GOARCH=wasm $(GO) vet ./engine/... ./wasm/...

check: tidy staticcheck

# go.mod and go.sum are as go mod tidy leaves them.
tidy:
	$(GO) mod tidy -diff

# staticcheck, pinned as a tool in go.mod (go tool staticcheck), natively
# and for js/wasm. go tool would build the tool itself for GOOS=js, so the
# js/wasm run uses a native build of the same pinned version.
staticcheck:
	$(GO) tool staticcheck ./...
	$(GO) build -o $(BIN)/staticcheck honnef.co/go/tools/cmd/staticcheck
	GOOS=js GOARCH=wasm ./$(BIN)/staticcheck ./engine/... ./wasm/...

# The engine stays pure: no syscall/js, and only the standard library,
# gonum and our own packages (plus go-json behind engine/internal/jsonx).
lint:
	@! grep -rn '"syscall/js"' engine || (echo 'engine must not import syscall/js' && false)
	@bad=$$($(GO) list -deps -f '{{if .Module}}{{.Module.Path}}{{end}}' ./engine/... | sort -u | grep -v -x -E 'drawsift|gonum\.org/v1/gonum|github\.com/goccy/go-json' || true); \
	  test -z "$$bad" || (echo "engine imports modules outside the allow-list: $$bad"; false)

# Every package but the page's browser tests, which run in test-site
# (mk/page.mk) with their own timeout.
test-native:
	$(GO) test -count=1 $$($(GO) list ./... | grep -v -x 'drawsift/site')

# The engine's tests again as js/wasm under Node, so the page computes the
# same numbers.
test-wasm:
	GOOS=js GOARCH=wasm $(GO) test -count=1 -exec="$(WASMEXEC)" ./engine/...

# Regenerate the reference tables with Debian's python3 packages and check
# that they match the committed ones: text cells exactly, numbers to 1e-6
# relative (mk/csvclose.py; skipped where the packages are absent).
refcheck:
	@if $(PYTHON) -c 'import gsw, iapws, scipy' 2>/dev/null; then \
	  tmp=$$(mktemp -d); cp -r testdata $$tmp/; \
	  for s in testdata/*.py; do $(PYTHON) $$tmp/$$s >/dev/null || exit 1; done; \
	  for f in testdata/*.csv; do $(PYTHON) mk/csvclose.py $$f $$tmp/$$f || { echo "reference table $$f does not match its script"; diff $$f $$tmp/$$f | head; exit 1; }; done; \
	  rm -rf $$tmp; echo "refcheck: reference tables reproduce"; \
	else echo "refcheck: skipped (needs python3-gsw, python3-iapws, python3-scipy)"; fi

refdata:
	for s in testdata/*.py; do $(PYTHON) $$s; done

bench:
	$(GO) test -run '^$$' -bench . -benchmem ./engine/...

bench-wasm:
	GOOS=js GOARCH=wasm $(GO) test -run '^$$' -bench . -benchmem -exec="$(WASMEXEC)" ./engine/...

clean:
	rm -rf $(BIN) build

# Fragments owned by the page, the edge host and the server checks.
-include mk/*.mk
