#!/usr/bin/env bash
# Speed benchmarks: Stillfield's synthesis against straightforward NumPy implementations of the same
# jobs, on this machine in the same run; prints medians and the ratio (Stillfield / NumPy).
# Usage: bench/run.sh [SAMPLES_GRID] [SAMPLES_POINTS] [REPEATS] [SAMPLES_END_TO_END]
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$here/.."
sg=${1:-20}; sp=${2:-200}; rep=${3:-5}; se=${4:-200}
(cd "$root" && mvn -q -B package -DskipTests)
jar="$root/viz/target/stillfield.jar"
classes="$(mktemp -d)"
trap 'rm -rf "$classes"' EXIT
javac -d "$classes" -cp "$jar" $(find "$here/src" -name '*.java')
ratio() { python3 -c "import sys; print(f'ratio stillfield/numpy {sys.argv[1]}: {float(sys.argv[2])/float(sys.argv[3]):.2f}')" "$@"; }
rate() { sed -n 's/.*median_samples_per_s=\([0-9.e+-]*\).*/\1/p'; }
for case in grid64:$sg points:$sp; do
  name=${case%%:*}; n=${case##*:}
  j=$(java -Xmx8g -cp "$jar:$classes" org.stillfield.bench.SynthesisBench "$name" "$n" "$rep"); echo "$j"
  p=$(python3 "$here/numpy_reference.py" "$name" "$n" "$rep"); echo "$p"
  ratio "$name" "$(echo "$j" | rate)" "$(echo "$p" | rate)"
done

# (b) end to end, both timed from outside as whole processes (interpreter or JVM start, mode set-up
# and all writes included): Stillfield's own command writing a float32 dataset with uncompressed pages,
# against NumPy writing one raw float32 .npy; medians over REPEATS runs of each.
tmp_out="$(mktemp -d)"
wall() { local t0 t1; t0=$(date +%s.%N); "$@" > /dev/null; t1=$(date +%s.%N); python3 -c "print($se/($t1-$t0))"; }
median() { python3 -c "import statistics, sys; print(statistics.median(map(float, sys.argv[1:])))" "$@"; }
jr=(); pr=()
for r in $(seq "$rep"); do
  rm -rf "$tmp_out/ds"
  jr+=("$(wall java -jar "$jar" sample "$here/grid64.yaml" --samples "$se" --output "$tmp_out/ds")")
  pr+=("$(wall python3 "$here/numpy_reference.py" grid64-io "$se" 0)")
done
rm -rf "$tmp_out" /tmp/stillfield-bench-grid64.npy
jrate=$(median "${jr[@]}"); prate=$(median "${pr[@]}")
echo "java grid64-io (whole process) samples=$se runs=$rep median_samples_per_s=$jrate"
echo "numpy grid64-io (whole process) samples=$se runs=$rep median_samples_per_s=$prate"
ratio grid64-io "$jrate" "$prate"
