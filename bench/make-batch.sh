#!/usr/bin/env bash
# Writes a batch of small invented load-cell calibration specs for trying `fitspec solve` on many fits:
#   bench/make-batch.sh DIR [COUNT] [SEED]      (defaults: 200 specs, seed 1)
# DIR/cellNNN.fit.yaml and DIR/data/cellNNN.csv; the losses cycle through l2, l1, huber and quantile,
# and every tenth spec carries an acceptance rule. The numbers come from a Park–Miller generator written
# out in awk, so one seed gives the same files with any awk. Then, for example:
#   dotnet run -c Release --project src/FitSpec.Cli -- solve DIR --out DIR/out        # solve all
#   dotnet run -c Release --project src/FitSpec.Cli -- solve DIR --out DIR/out        # again: all cached
#   sed -i '5s/,.*$/,0.5/' DIR/data/cell007.csv                                      # change one reading
#   dotnet run -c Release --project src/FitSpec.Cli -- solve DIR --out DIR/out        # one fit re-solved
set -euo pipefail

if [ $# -lt 1 ]; then
  echo "usage: $0 DIR [COUNT] [SEED]" >&2
  exit 2
fi

dir=$1
count=${2:-200}
seed=${3:-1}
mkdir -p "$dir/data"

awk -v dir="$dir" -v count="$count" -v seed="$seed" '
  function uniform() { state = (state * 16807) % 2147483647; return state / 2147483647 }
  function noise() { return uniform() + uniform() + uniform() - 1.5 }
  BEGIN {
    state = (seed * 7919 + 13) % 2147483647
    if (state <= 0) state = 1
    split("l2 l1 huber quantile", losses, " ")
    for (i = 0; i < count; i++) {
      name = sprintf("cell%03d", i)
      gain = 1.9 + 0.2 * uniform()           # mV/V per kN, invented
      offset = 0.05 * (uniform() - 0.5)
      bow = 0.002 * (uniform() - 0.5)
      csv = dir "/data/" name ".csv"
      print "load_kn,output_mv" > csv
      for (k = 0; k < 24; k++) {
        load = k * 0.5
        out = offset + gain * load + bow * load * load + 0.004 * noise()
        if (k == 17 && i % 7 == 3) out += 0.08   # an occasional bad reading
        printf "%.3f,%.6f\n", load, out > csv
      }
      close(csv)

      loss = losses[i % 4 + 1]
      spec = dir "/" name ".fit.yaml"
      print "fitspec: 1" > spec
      print "name: " name > spec
      print "title: Load cell " i " calibration (invented data)" > spec
      print "data:\n  path: data/" name ".csv" > spec
      print "model:\n  response: output_mv\n  terms:\n    offset: 1\n    gain: load_kn\n    bow: load_kn^2" > spec
      if (loss == "huber") print "loss: {kind: huber, width: 0.01}" > spec
      else if (loss == "quantile") print "loss: {kind: quantile, tau: 0.5}" > spec
      else print "loss: " loss > spec
      print "constraints:\n  - \"gain >= 0\"" > spec
      if (i % 10 == 0) print "report:\n  accept:\n    - \"max_abs_residual <= 0.05\"" > spec
      close(spec)
    }
  }'

echo "wrote $count specs to $dir (seed $seed)"
