#!/usr/bin/env bash
# `npm run bench [-- NAME]`: runs the benchmarks in bench/ (see bench/README.md).
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib/bootstrap.sh"
# The frame-stepping benchmark drives headless Chromium.
dialsheet_bootstrap --with-chromium
# tsx as a loader, not its CLI: the CLI puts a wrapper process in between whose signal relay can
# SIGKILL this script when a Ctrl-C arrives twice (terminal + npm), cutting its clean-up short.
exec node --import tsx scripts/bench.ts "$@"
