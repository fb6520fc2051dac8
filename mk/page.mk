# The page: the engine as js/wasm for the browser, the single-file offline
# bundle, and the page's size/speed benchmark. Included by the Makefile.
#
#   make wasm        build/drawsift.wasm (the page's engine, without the fit
#                    operation: -tags nofit keeps it inside its download budget),
#                    build/drawsift-fit.wasm (the full engine, loaded by the Fit
#                    tab only) + build/wasm_exec.js (same toolchain)
#   make bundle      build/drawsift.html, the page as one file for file://
#   make page-bench  wasm size, bundle size, navigation → first ranked result
#                    (with its phases), the warm screen's round trip, and a
#                    robustness run on one and on every worker, in headless
#                    Chromium (benchmarks, not tests; medians of 5 runs)
#   make page-serve  the page and the API on 127.0.0.1:$(PORT)
#   make test-site   the page's browser tests (headless Chromium), part of make test

PORT       ?= 8080
PAGE_WASM  := build/drawsift.wasm
FIT_WASM   := build/drawsift-fit.wasm
PAGE_EXEC  := build/wasm_exec.js
PAGE_HTML  := build/drawsift.html
PAGE_SRC   := $(shell find engine data wasm/page -name '*.go' -o -name '*.json' 2>/dev/null)
SITE_SRC   := $(shell find site/static -type f 2>/dev/null)

.PHONY: wasm bundle page-bench page-serve test-site

# The browser tests wait for what the page signals, never for time; the
# timeout is a safety net far above their few minutes on an idle machine,
# so that they also pass on a machine loaded many times over (go test's
# default of 10 minutes is not).
SITE_TIMEOUT ?= 30m

test-site:
	$(GO) test -count=1 -timeout $(SITE_TIMEOUT) ./site/

wasm: $(PAGE_WASM) $(FIT_WASM) $(PAGE_EXEC)

# compress writes $@.gz and, where brotli is installed, $@.br. zopfli
# writes standard gzip (RFC 1952) about 4 % smaller than gzip -9; it is
# used when installed (apt: zopfli), else gzip -9.
define compress
@if command -v zopfli >/dev/null; then zopfli --i3 $@; else gzip -9 -k -f $@; fi
@if command -v brotli >/dev/null; then brotli -q 11 -k -f $@ && sha256sum $@ > $@.br.sha256; else rm -f $@.br $@.br.sha256; fi
endef

# -tags stdjson: encoding/json instead of go-json (about 1 MB gzip less);
# nofit: the fit operation (about 90 kB gzip) lives in $(FIT_WASM).
$(PAGE_WASM): $(PAGE_SRC) go.mod go.sum
	@mkdir -p build
	@echo "building the page's engine $@ (GOOS=js GOARCH=wasm)…"
	GOOS=js GOARCH=wasm $(GO) build -tags stdjson,nofit -trimpath -buildvcs=false -ldflags='-s -w' -o $@ ./wasm/page
	$(compress)
	@printf 'page wasm: %s bytes, %s gzip, %s brotli\n' "$$(wc -c < $@)" "$$(wc -c < $@.gz)" "$$(test -f $@.br && wc -c < $@.br || echo -)"

$(FIT_WASM): $(PAGE_SRC) go.mod go.sum
	@mkdir -p build
	GOOS=js GOARCH=wasm $(GO) build -tags stdjson -trimpath -buildvcs=false -ldflags='-s -w' -o $@ ./wasm/page
	$(compress)
	@printf 'fit-tab wasm: %s bytes, %s gzip, %s brotli\n' "$$(wc -c < $@)" "$$(wc -c < $@.gz)" "$$(test -f $@.br && wc -c < $@.br || echo -)"

# wasm_exec.js must come from the toolchain that built the wasm.
$(PAGE_EXEC): $(PAGE_WASM)
	cp "$$($(GO) env GOROOT)/lib/wasm/wasm_exec.js" $@

bundle: $(PAGE_HTML)

$(PAGE_HTML): build $(PAGE_WASM) $(PAGE_EXEC) $(SITE_SRC)
	./$(BIN)/drawsift bundle -o $@ --wasm $(PAGE_WASM)

page-bench: $(PAGE_WASM)
	$(GO) test -run '^$$' -bench 'Page(FirstResult|WarmScreen|Robustness)' -benchtime 5x -timeout 30m ./site/

page-serve: build wasm
	./$(BIN)/drawsift serve --addr 127.0.0.1:$(PORT) --wasm $(PAGE_WASM)
