#!/usr/bin/env bash
# npm run backup | npm run restore -- FILE [--yes]: pg_dump and pg_restore of the installed server
# (found by lib.sh), then scripts/backup.ts. Relative paths are taken from where npm was run.
export INIT_CWD=${INIT_CWD:-$PWD}
source "$(dirname "$0")/lib.sh"
ensure_pg_bindir
exec node_modules/.bin/tsx scripts/backup.ts "$@"
