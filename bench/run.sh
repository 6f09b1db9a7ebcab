#!/usr/bin/env bash
# Speed benchmarks: Stillfield's synthesis against straightforward NumPy implementations of the same
# jobs, on this machine in the same run; prints medians and the ratio (Stillfield / NumPy).
# Usage: bench/run.sh [SAMPLES_GRID] [SAMPLES_POINTS] [REPEATS]
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$here/.."
sg=${1:-20}; sp=${2:-200}; rep=${3:-5}
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

# (b) end to end: Stillfield's own command writing a float32 dataset, against NumPy writing .npy.
tmp_out="$(mktemp -d)"
t0=$(date +%s.%N)
java -jar "$jar" sample "$here/grid64.yaml" --samples "$sg" --output "$tmp_out/ds" > /dev/null
t1=$(date +%s.%N)
jrate=$(python3 -c "print($sg/($t1-$t0))")
echo "java grid64-io (whole command, JVM start included) samples=$sg median_samples_per_s=$jrate"
rm -rf "$tmp_out"
p=$(python3 "$here/numpy_reference.py" grid64-io "$sg" 1); echo "$p"
ratio grid64-io "$jrate" "$(echo "$p" | rate)"
