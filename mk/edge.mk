# Edge-worker host of the JSON API (wasm/edge) and the short fuzz run of the
# HTTP handler. Included by the main Makefile.
#
#   make edge       build/edge/: app.wasm + generated glue + wrangler.toml, ready to deploy
#   make edge-size  raw and gzip sizes of the bundle (budget: < 3 MiB gzip)
#   make test-edge  the edge bundle under Node and in workerd (the platform's own
#                   runtime) answering as the native handler does
#   make workerd    install the pinned workerd from npm under build/workerd/
#   make fuzz       every fuzz target of the handler for FUZZTIME each (CI: 100000 inputs)

EDGE_DIR  ?= build/edge
EDGE_TAGS ?= stdjson
# A count, not a duration: with a duration, Go 1.26's fuzz coordinator can
# fail a target with "context deadline exceeded" when a busy machine keeps
# a worker from answering before the deadline (golang/go issue 75804,
# fixed in Go 1.27); a count has no deadline to race.
FUZZTIME  ?= 100000x
FUZZ_PKG  := ./engine/api/httpapi/
FUZZ_TARGETS := FuzzOsmotic FuzzFlux FuzzScreen FuzzBatch FuzzOsmoticFields FuzzFluxFields FuzzTransport FuzzRobustnessMerge
# The module's valid requests cost milliseconds (an integration per
# shooting step): fewer inputs keep the run near the others' length.
FUZZTIME_MODULE ?= 20000x
# A system screen designs a module per candidate (milliseconds each;
# most fuzzed values are refused at once: about 6 s).
FUZZTIME_SYSTEM ?= 20000x

# workerd, the edge platform's open-source runtime: a binary shipped inside
# the npm package (@cloudflare/workerd-linux-64, pulled in by workerd).
WORKERD_VERSION ?= 1.20261117.1
WORKERD_DIR     := build/workerd
WORKERD         := $(WORKERD_DIR)/node_modules/.bin/workerd

.PHONY: edge edge-size test-edge fuzz workerd

# The edge build uses encoding/json (-tags stdjson): goccy/go-json would add
# ~1 MB gzip and leave too little room under the platform's 3 MiB; each edge
# request starts a fresh instance, so start-up, not JSON speed, dominates.
edge:
	$(GO) run github.com/syumai/workers/cmd/workers-assets-gen -mode=go -o $(EDGE_DIR)
	GOOS=js GOARCH=wasm $(GO) build $(GOFLAGS) -tags '$(EDGE_TAGS)' -ldflags='-s -w' -o $(EDGE_DIR)/app.wasm ./wasm/edge
	cp wasm/edge/wrangler.toml $(EDGE_DIR)/wrangler.toml
	@$(MAKE) --no-print-directory edge-size

edge-size:
	@total=0; for f in $(EDGE_DIR)/app.wasm $(EDGE_DIR)/wasm_exec.js $(EDGE_DIR)/worker.mjs $(EDGE_DIR)/runtime.mjs; do \
	  test -f $$f || { echo "$$f is missing: run make edge"; exit 1; }; \
	  raw=$$(wc -c < $$f); gz=$$(gzip -9 -c $$f | wc -c); total=$$((total + gz)); \
	  printf '%-28s %10d B raw %10d B gzip\n' $$f $$raw $$gz; done; \
	  printf 'edge bundle gzip total: %d B (budget 3145728 B)\n' $$total; \
	  test $$total -lt 3145728 || (echo 'edge bundle over budget' && false)

test-edge: workerd
	$(GO) test -count=1 -v -run 'TestEdge' ./wasm/edge/

# Installs workerd once (kept while its version matches); without npm the
# test in workerd skips, and says so.
workerd:
	@if [ -x $(WORKERD) ] && grep -qs '"version": "$(WORKERD_VERSION)"' $(WORKERD_DIR)/node_modules/workerd/package.json; then :; \
	elif command -v npm >/dev/null; then mkdir -p $(WORKERD_DIR) && \
	  npm install --prefix $(WORKERD_DIR) --no-save --no-audit --no-fund --loglevel=error workerd@$(WORKERD_VERSION) && \
	  $(WORKERD) --version; \
	else echo "workerd: npm not found; TestEdgeInWorkerd will skip (install Node.js and npm, then make workerd)"; fi

fuzz:
	@for t in $(FUZZ_TARGETS); do \
	  echo "fuzz $$t ($(FUZZTIME))"; \
	  $(GO) test -run '^$$' -fuzz "^$$t\$$" -fuzztime $(FUZZTIME) $(FUZZ_PKG) || exit 1; \
	done
	@echo "fuzz FuzzModuleFields ($(FUZZTIME_MODULE))"
	@$(GO) test -run '^$$' -fuzz '^FuzzModuleFields$$' -fuzztime $(FUZZTIME_MODULE) $(FUZZ_PKG)
	@echo "fuzz FuzzSystemFields ($(FUZZTIME_SYSTEM))"
	@$(GO) test -run '^$$' -fuzz '^FuzzSystemFields$$' -fuzztime $(FUZZTIME_SYSTEM) $(FUZZ_PKG)
