# The two set-up commands of the README are `make page` and `make test`.
.PHONY: page serve pkg test bench setup

# Builds dist/tacit.html, the offline page (installs what it needs first).
page: pkg
	node scripts/build-page.mjs
	@echo "Open dist/tacit.html in a browser (double-click it; no server needed)."

# Serves dist/ on http://127.0.0.1:8451/ for those who prefer a server.
serve: page
	node scripts/serve-page.mjs

# Builds the ES-module package into dist/pkg/.
pkg: setup
	TACIT_SETUP_DONE=1 bash scripts/build-pkg.sh

setup:
	bash scripts/setup.sh

# Every test: formatting, lints, native tests, wasm tests in Node and Chromium,
# the package used from Node, and the page end to end in headless Chromium.
test:
	bash scripts/test-all.sh

# Figures, not timed tests.
bench:
	bash scripts/bench-all.sh
