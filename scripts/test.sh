#!/usr/bin/env bash
# `npm test`: lint, type-check, unit, API, component and browser tests against a throw-away PostgreSQL.
set -euo pipefail
source "$(dirname "${BASH_SOURCE[0]}")/lib/bootstrap.sh"
dialsheet_bootstrap --with-chromium
# tsx as a loader, not its CLI: the CLI puts a wrapper process in between whose signal relay can
# SIGKILL this script when a Ctrl-C arrives twice (terminal + npm), cutting its clean-up short.
exec node --import tsx scripts/test.ts "$@"
