#!/usr/bin/env bash
# The job worker (npm run worker; scripts/common.sh, the benchmarks and the tests start it through
# this file). WORKER_NODE_FLAGS replaces the V8 flags, e.g. to compare settings in a benchmark:
# - --max-semi-space-size=64: solving allocates many short-lived objects per line; V8's default young
#   generation made the garbage collector a fifth of a 10,000-line import (node CPU 7.3 / 6.4 s →
#   5.5 / 5.9 s for the import + solve job, about 50 MB more resident);
# - --max-old-space-size=512: V8 collects instead of growing (a 50,000-line import + solve peaked at
#   802 MB uncapped, 494 MB capped, no slower). Every job holds a bounded slice of its data (rows
#   read one by one above 5,000, results solved and written 250 at a time, the budget read 2,000
#   lines at a time), so the cap is room, not a squeeze; raise it here if a job ever needs more.
cd "$(dirname "$0")/.."
exec node ${WORKER_NODE_FLAGS:---max-semi-space-size=64 --max-old-space-size=512} --import tsx lib/jobs/worker.ts
