#!/usr/bin/env bash
# The performance bench in one command: installs the reference implementations from Debian if missing,
# builds FitSpec in Release, copies the build aside (so that edits to the tree during the run do not change
# what is timed), and runs perf.py. Arguments go to perf.py (e.g. --quick, --only P3, --work DIR).
# Data and outputs go to ${FITSPEC_PERF_DIR:-/tmp/fitspec-perf}; nothing large is written into the repository.
set -euo pipefail
repo="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
work="${FITSPEC_PERF_DIR:-/tmp/fitspec-perf}"
mkdir -p "$work"

need=()
/usr/bin/python3 -c 'import numpy, scipy' 2>/dev/null || need+=(python3-numpy python3-scipy)
Rscript -e 'library(quantreg)' >/dev/null 2>&1 || need+=(r-cran-quantreg)
Rscript -e 'library(data.table)' >/dev/null 2>&1 || need+=(r-cran-data.table)
[ -x /usr/bin/time ] || need+=(time)
command -v eatmydata >/dev/null || need+=(eatmydata)
if [ ${#need[@]} -gt 0 ]; then
  echo "installing from Debian: ${need[*]}"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${need[@]}" >/dev/null
fi

cd "$repo"
dotnet build -c Release src/FitSpec.Cli -nologo -v q
dotnet build -c Release bench/FitSpec.Bench -nologo -v q
rm -rf "$work/bin-cli" "$work/bin-bench"
cp -r src/FitSpec.Cli/bin/Release/net10.0 "$work/bin-cli"
cp -r bench/FitSpec.Bench/bin/Release/net10.0 "$work/bin-bench"

exec /usr/bin/python3 "$repo/bench/perf/perf.py" --fitspec "$work/bin-cli/fitspec" --stages "$work/bin-bench/FitSpec.Bench" --work "$work" "$@"
