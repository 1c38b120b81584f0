#!/usr/bin/env bash
# npm run start:cluster: `npm start` with two app processes behind nginx (CLUSTER_PROCESSES to
# change the count); see scripts/start.sh and docs/scaling.md.
exec bash "$(dirname "$0")/start.sh" --processes "${CLUSTER_PROCESSES:-2}" "$@"
