# The page: the engine as js/wasm for the browser, the single-file offline
# bundle, and the page's size/speed benchmark. Included by the Makefile.
#
#   make wasm        build/drawsift.wasm + build/wasm_exec.js (same toolchain)
#   make bundle      build/drawsift.html, the page as one file for file://
#   make page-bench  wasm size, bundle size, navigation → first ranked result
#                    in headless Chromium (a benchmark, not a test)
#   make page-serve  the page and the API on 127.0.0.1:$(PORT)

PORT       ?= 8080
PAGE_WASM  := build/drawsift.wasm
PAGE_EXEC  := build/wasm_exec.js
PAGE_HTML  := build/drawsift.html
PAGE_SRC   := $(shell find engine data wasm/page -name '*.go' -o -name '*.json' 2>/dev/null)
SITE_SRC   := $(shell find site/static -type f 2>/dev/null)

.PHONY: wasm bundle page-bench page-serve

wasm: $(PAGE_WASM) $(PAGE_EXEC)

# -tags stdjson: encoding/json instead of go-json (about 1 MB gzip less).
$(PAGE_WASM): $(PAGE_SRC) go.mod go.sum
	@mkdir -p build
	GOOS=js GOARCH=wasm $(GO) build -tags stdjson -trimpath -buildvcs=false -ldflags='-s -w' -o $@ ./wasm/page
	gzip -9 -k -f $@
	@if command -v brotli >/dev/null; then brotli -q 11 -k -f $@; else rm -f $@.br; fi
	@printf 'page wasm: %s bytes, %s gzip, %s brotli\n' "$$(wc -c < $@)" "$$(wc -c < $@.gz)" "$$(test -f $@.br && wc -c < $@.br || echo -)"

# wasm_exec.js must come from the toolchain that built the wasm.
$(PAGE_EXEC): $(PAGE_WASM)
	cp "$$($(GO) env GOROOT)/lib/wasm/wasm_exec.js" $@

bundle: $(PAGE_HTML)

$(PAGE_HTML): build $(PAGE_WASM) $(PAGE_EXEC) $(SITE_SRC)
	./$(BIN)/drawsift bundle -o $@ --wasm $(PAGE_WASM)

page-bench: $(PAGE_WASM)
	$(GO) test -run '^$$' -bench PageFirstResult -benchtime 5x ./site/

page-serve: build wasm
	./$(BIN)/drawsift serve --addr 127.0.0.1:$(PORT) --wasm $(PAGE_WASM)
