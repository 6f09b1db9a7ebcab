#!/usr/bin/env python3
"""Writes the malformed-spec corpus: each file is the demo spec with one thing broken and a first
line '# expect: SETTING' naming the setting the error message must name. Re-run after changing the
demo spec: python3 make_corpus.py ../../../../../runs/demo.yaml [../../../../../runs/noise-demo.yaml]
The ts-*.yaml cases break the timeseries and probes sections of the noise demo spec."""
import re, sys, os, glob

base = open(sys.argv[1] if len(sys.argv) > 1 else "../../../../../runs/demo.yaml").read()

def sub(old, new):
    def f(t):
        assert re.search(old, t, flags=re.M), old
        return re.sub(old, new, t, count=1, flags=re.M)
    return f

def drop(pattern):
    return sub(pattern + r".*\n", "")

cases = []
def case(name, expect, fn):
    cases.append((name, expect, fn))

# cavity sizes: zero, negative, NaN, infinite, text, missing
for key in ["a_m", "b_m", "d_m"]:
    for label, val in [("zero", "0"), ("negative", "-0.03"), ("nan", ".nan"), ("inf", ".inf"),
                       ("neginf", "-.inf"), ("text", "thirty"), ("list", "[0.03]"), ("null", "~")]:
        case(f"{key}-{label}", f"cavity.{key}" if label != "null" else f"cavity.{key}", sub(rf"^  {key}: [^ #\n]+", f"  {key}: {val}"))
    case(f"{key}-missing", f"cavity.{key}", drop(rf"^  {key}:"))
case("eps-below-one", "cavity.eps_r", sub(r"^  eps_r: [^ #\n]+", "  eps_r: 0.5"))
case("eps-nan", "cavity.eps_r", sub(r"^  eps_r: [^ #\n]+", "  eps_r: .nan"))
case("eps-text", "cavity.eps_r", sub(r"^  eps_r: [^ #\n]+", "  eps_r: glass"))
case("mu-zero", "cavity.mu_r", sub(r"^  eps_r:", "  mu_r: 0\n  eps_r:"))
case("shape-unknown", "cavity.shape", sub(r"^  shape: box", "  shape: torus"))
case("shape-typo", "cavity.shape", sub(r"^  shape: box", "  shape: bxo"))
case("shape-missing", "cavity.shape", drop(r"^  shape:"))
case("cavity-unknown-key", "cavity.radius", sub(r"^  a_m:", "  radius: 0.1\n  a_m:"))
case("cavity-typo-key", "cavity.a_mm", sub(r"^  a_m:", "  a_mm:"))
case("cavity-not-mapping", "cavity", sub(r"^cavity:\n(  .*\n)+", "cavity: box\n"))
case("cavity-missing", "cavity.shape", sub(r"^cavity:\n(  .*\n)+", ""))
# state
case("state-kind-unknown", "state.kind", sub(r"^  kind: vacuum", "  kind: squeezed"))
case("state-thermal-no-T", "state.temperature_K", sub(r"^  kind: vacuum.*", "  kind: thermal"))
case("state-thermal-negative-T", "state.temperature_K", sub(r"^  kind: vacuum.*", "  kind: thermal\n  temperature_K: -0.02"))
case("state-thermal-zero-T", "state.temperature_K", sub(r"^  kind: vacuum.*", "  kind: thermal\n  temperature_K: 0"))
case("state-thermal-nan-T", "state.temperature_K", sub(r"^  kind: vacuum.*", "  kind: thermal\n  temperature_K: .nan"))
case("state-thermal-text-T", "state.temperature_K", sub(r"^  kind: vacuum.*", "  kind: thermal\n  temperature_K: cold"))
case("state-vacuum-with-T", "state.temperature_K", sub(r"^  kind: vacuum.*", "  kind: vacuum\n  temperature_K: 4.2"))
case("state-unknown-key", "state.temperature", sub(r"^  kind: vacuum.*", "  kind: thermal\n  temperature: 4.2"))
# fields
case("fields-unknown", "fields", sub(r"^fields: .*", "fields: [E, H]"))
case("fields-empty", "fields", sub(r"^fields: .*", "fields: []"))
case("fields-not-list", "fields", sub(r"^fields: .*", "fields: E"))
case("fields-lowercase-typo", "fields", sub(r"^fields: .*", "fields: [e, bb]"))
# window
case("window-kind-unknown", "window.kind", sub(r"^  kind: gauss.*", "  kind: lorentz"))
case("window-kind-typo", "window.kind", sub(r"^  kind: gauss.*", "  kind: guass"))
case("window-no-cutoff", "window.cutoff_GHz", drop(r"^  cutoff_GHz:"))
case("window-two-cutoffs", "window.cutoff_GHz", sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: 20\n  cutoff_Hz: 2.0e10"))
case("window-cutoff-zero", "window.cutoff_GHz", sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: 0"))
case("window-cutoff-negative", "window.cutoff_GHz", sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: -20"))
case("window-cutoff-nan", "window.cutoff_GHz", sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: .nan"))
case("window-cutoff-inf", "window.cutoff_GHz", sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: .inf"))
case("window-cutoff-text", "window.cutoff_GHz", sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: twenty"))
case("window-cutoff-hz-negative", "window.cutoff_Hz", sub(r"^  cutoff_GHz: 20.*", "  cutoff_Hz: -1"))
case("window-omega-zero", "window.omega_c_rad_s", sub(r"^  cutoff_GHz: 20.*", "  omega_c_rad_s: 0"))
case("window-cutoff-below-lowest", "window.cutoff", sub(r"^  kind: gauss.*", "  kind: hard").__call__ if False else (lambda t: sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: 3")(sub(r"^  kind: gauss.*", "  kind: hard")(t))))
case("window-too-many-modes", "limits.max_modes", sub(r"^  cutoff_GHz: 20.*", "  cutoff_GHz: 2000"))
case("window-tolerance-zero", "window.tolerance", sub(r"^  tolerance: .*", "  tolerance: 0"))
case("window-tolerance-big", "window.tolerance", sub(r"^  tolerance: .*", "  tolerance: 0.9"))
case("window-tolerance-text", "window.tolerance", sub(r"^  tolerance: .*", "  tolerance: small"))
case("window-unknown-key", "window.cutoff_ghz", sub(r"^  cutoff_GHz:", "  cutoff_ghz:"))
# samples, seed, threads
for label, val, exp in [("zero", "0", "samples"), ("negative", "-5", "samples"), ("fraction", "10.5", "samples"),
                        ("text", "many", "samples"), ("huge", "100000000000", "samples"), ("nan", ".nan", "samples")]:
    case(f"samples-{label}", exp, sub(r"^samples: .*", f"samples: {val}"))
case("samples-missing", "samples", drop(r"^samples:"))
case("seed-text", "seed", sub(r"^seed: .*", "seed: lucky"))
case("seed-fraction", "seed", sub(r"^seed: .*", "seed: 1.5"))
case("seed-too-big", "seed", sub(r"^seed: .*", "seed: 99999999999999999999999"))
case("threads-negative", "threads", sub(r"^threads: .*", "threads: -1"))
case("threads-huge", "threads", sub(r"^threads: .*", "threads: 100000"))
case("threads-text", "threads", sub(r"^threads: .*", "threads: all"))
# evaluation points
case("point-outside", "evaluate.points[0].at", sub(r"at: \[0.015, 0.010, 0.008\]", "at: [0.015, 0.010, 0.048]"))
case("point-negative", "evaluate.points[0].at", sub(r"at: \[0.015, 0.010, 0.008\]", "at: [-0.001, 0.010, 0.008]"))
case("point-two-coords", "evaluate.points[0].at", sub(r"at: \[0.015, 0.010, 0.008\]", "at: [0.015, 0.010]"))
case("point-nan", "evaluate.points[0].at[1]", sub(r"at: \[0.015, 0.010, 0.008\]", "at: [0.015, .nan, 0.008]"))
case("point-text", "evaluate.points[0].at[2]", sub(r"at: \[0.015, 0.010, 0.008\]", "at: [0.015, 0.010, top]"))
case("point-missing-at", "evaluate.points[0].at", sub(r"^      at: \[0.015, 0.010, 0.008\]\n", ""))
case("point-no-name", "evaluate.points[0].name", sub(r"- name: antenna .*\n      at:", "- at:"))
case("point-bad-name", "evaluate.points[0].name", sub(r"- name: antenna", "- name: 'pin antenna'"))
case("point-unknown-key", "evaluate.points[0].position", sub(r"      at: \[0.015, 0.010, 0.008\]", "      position: [0.015, 0.010, 0.008]"))
case("duplicate-set-name", "evaluate.lines[0].name", sub(r"- name: axis ", "- name: antenna "))
case("line-n-one", "evaluate.lines[0].n", sub(r"^      n: 41", "      n: 1"))
case("line-n-zero", "evaluate.lines[0].n", sub(r"^      n: 41", "      n: 0"))
case("line-n-text", "evaluate.lines[0].n", sub(r"^      n: 41", "      n: lots"))
case("line-n-fraction", "evaluate.lines[0].n", sub(r"^      n: 41", "      n: 4.5"))
case("line-n-huge", "evaluate.lines[0].n", sub(r"^      n: 41", "      n: 100000000"))
case("line-from-outside", "evaluate.lines[0].from", sub(r"from: \[0.015, 0.010, 0.0\]", "from: [0.015, 0.010, -0.01]"))
case("line-to-outside", "evaluate.lines[0].to", sub(r"to:   \[0.015, 0.010, 0.040\]", "to:   [0.015, 0.030, 0.040]"))
case("line-missing-to", "evaluate.lines[0].to", sub(r"      to:   \[0.015, 0.010, 0.040\]\n", ""))
case("grid-two-dims", "evaluate.grids[0].n", sub(r"n: \[24, 1, 32\]", "n: [24, 32]"))
case("grid-zero-dim", "evaluate.grids[0].n[1]", sub(r"n: \[24, 1, 32\]", "n: [24, 0, 32]"))
case("grid-negative-dim", "evaluate.grids[0].n[0]", sub(r"n: \[24, 1, 32\]", "n: [-24, 1, 32]"))
case("grid-huge", "evaluate.grids[0].n", sub(r"n: \[24, 1, 32\]", "n: [2000, 2000, 2000]"))
case("grid-text-dim", "evaluate.grids[0].n[2]", sub(r"n: \[24, 1, 32\]", "n: [24, 1, many]"))
case("grid-to-outside", "evaluate.grids[0].to", sub(r"to:   \[0.030, 0.020, 0.040\]", "to:   [0.030, 0.020, 0.050]"))
case("evaluate-unknown-key", "evaluate.planes", sub(r"^  grids:", "  planes: []\n  grids:"))
case("evaluate-lines-not-list", "evaluate.lines", sub(r"^  lines:\n(    .*\n)+", "  lines: axis\n"))
# output
case("precision-unknown", "output.precision", sub(r"^  precision: float64.*", "  precision: float16"))
case("precision-typo", "output.precision", sub(r"^  precision: float64.*", "  precision: flaot32"))
case("compression-unknown", "output.compression", sub(r"^  precision: float64.*", "  precision: float64\n  compression: lz4"))
case("compression-number", "output.compression", sub(r"^  precision: float64.*", "  precision: float64\n  compression: 3"))
case("output-unknown-key", "output.format", sub(r"^  precision: float64.*", "  precision: float64\n  format: csv"))
case("output-folder-number", "output.folder", sub(r"^  folder: .*", "  folder: 42"))
# analysis
case("pairs-unknown-set", "analysis.pairs[0]", sub(r'- \["axis\[20\]", "axis"\]', '- ["axes[20]", "axis"]'))
case("pairs-index-out-of-range", "analysis.pairs[0]", sub(r'- \["axis\[20\]", "axis"\]', '- ["axis[41]", "axis"]'))
case("pairs-first-is-set", "analysis.pairs[0]", sub(r'- \["axis\[20\]", "axis"\]', '- ["axis", "axis"]'))
case("pairs-one-element", "analysis.pairs[0]", sub(r'- \["axis\[20\]", "axis"\]', '- ["axis[20]"]'))
case("pairs-not-list", "analysis.pairs", sub(r'^  pairs:\n(    .*\n)+', '  pairs: axis\n'))
case("false-alarm-zero", "analysis.false_alarm", sub(r"^  false_alarm: .*", "  false_alarm: 0"))
case("false-alarm-one", "analysis.false_alarm", sub(r"^  false_alarm: .*", "  false_alarm: 1"))
case("false-alarm-text", "analysis.false_alarm", sub(r"^  false_alarm: .*", "  false_alarm: low"))
case("analysis-unknown-key", "analysis.alpha", sub(r"^  false_alarm: .*", "  alpha: 0.01"))
# limits
case("max-modes-zero", "limits.max_modes", sub(r"^  max_modes: .*", "  max_modes: 0"))
case("max-modes-text", "limits.max_modes", sub(r"^  max_modes: .*", "  max_modes: lots"))
case("limits-unknown-key", "limits.max_mode", sub(r"^  max_modes:", "  max_mode:"))
# top level and syntax
case("unknown-top-key", "sample", sub(r"^samples:", "sample:"))
case("unknown-top-key-far", "colour", sub(r"^threads:", "colour: blue\nthreads:"))
case("name-with-space", "name", sub(r"^name: .*", "name: kl7 demo"))
case("name-number", "name", sub(r"^name: .*", "name: 7"))
case("yaml-bad-indent", "", sub(r"^  a_m: 0.030 ", "   a_m: 0.030\n b_m_wrong: 1 "))
case("yaml-unclosed-list", "", sub(r"^fields: \[E, B\]", "fields: [E, B"))
case("yaml-tab", "", sub(r"^  a_m:", "\ta_m:"))
case("yaml-duplicate-key", "", sub(r"^samples: 1000", "samples: 1000\nsamples: 2000"))
case("yaml-not-mapping", "", lambda t: "- just\n- a list\n")
case("yaml-empty", "", lambda t: "# nothing here\n")
case("yaml-scalar", "", lambda t: "hello\n")

# parts, shards and resource guards (appended so the numbers above stay)
po = lambda extra: sub(r"^  precision: float64.*", "  precision: float64\n" + extra)
for label, val in [("zero", "0"), ("negative", "-10"), ("fraction", "2.5"), ("text", "many"), ("huge", "10000000000")]:
    case(f"part-samples-{label}", "output.part_samples", po(f"  part_samples: {val}"))
case("part-samples-typo", "output.part_sample", po("  part_sample: 100"))
for label, val in [("index-equals-count", '"8/8"'), ("zero-count", '"1/0"'), ("negative", '"-1/4"'), ("text", '"a/b"'),
                   ("number", "3"), ("list", "[0, 8]"), ("three-parts", '"1/2/3"'), ("count-huge", '"0/1000000"')]:
    case(f"shard-{label}", "output.shard", po(f"  shard: {val}"))
case("shard-typo", "output.shards", po('  shards: "0/8"'))
for key in ["max_output_GB", "max_memory_GB"]:
    for label, val in [("zero", "0"), ("negative", "-1"), ("text", "lots"), ("nan", ".nan"), ("inf", ".inf")]:
        case(f"{key}-{label}", f"limits.{key}", sub(r"^  max_modes: .*", f"  max_modes: 200000\n  {key}: {val}"))
case("limits-gb-typo", "limits.max_output_gb", sub(r"^  max_modes: .*", "  max_modes: 200000\n  max_output_gb: 1"))
# resource guards: refused with the estimate before anything is written
case("output-over-limit", "limits.max_output_GB = 0.001", sub(r"^  max_modes: .*", "  max_modes: 200000\n  max_output_GB: 0.001"))
case("memory-over-limit", "limits.max_memory_GB = 0.01", sub(r"^  max_modes: .*", "  max_modes: 200000\n  max_memory_GB: 0.01"))
case("grid-large-disk-full", "output.folder", lambda t: sub(r"^samples: 1000", "samples: 1000000000")(
    sub(r"n: \[24, 1, 32\]", "n: [1000, 1000, 1]")(t)))
case("part-samples-too-many-parts", "output.part_samples", lambda t: sub(r"^samples: 1000", "samples: 1000000")(
    po("  part_samples: 1")(t)))

for f in glob.glob("[0-9][0-9][0-9]-*.yaml"):
    os.remove(f)
for i, (name, expect, fn) in enumerate(cases):
    text = fn(base)
    with open(f"{i:03d}-{name}.yaml", "w") as out:
        out.write(f"# expect: {expect}\n" + text)
print(len(cases), "cases")

# Noise time-series sections, from the noise demo spec.
noise = open(sys.argv[2] if len(sys.argv) > 2 else "../../../../../runs/noise-demo.yaml").read()
ts = []
def tcase(name, expect, fn):
    ts.append((name, expect, fn))

tcase("probes-without-timeseries", "probes", sub(r"^timeseries:\n(  .*\n|\n)+?(?=probes:)", ""))
tcase("timeseries-not-mapping", "timeseries", sub(r"^timeseries:\n(  .*\n|\n)+?(?=probes:)", "timeseries: 40\n"))
tcase("no-time-step", "timeseries.dt_s", drop(r"^  sample_rate_GHz:"))
tcase("two-time-steps", "timeseries.dt_s", sub(r"^  sample_rate_GHz: 40", "  sample_rate_GHz: 40\n  dt_s: 2.5e-11"))
tcase("rate-negative", "timeseries.sample_rate_GHz", sub(r"^  sample_rate_GHz: 40", "  sample_rate_GHz: -40"))
tcase("dt-text", "timeseries.dt_s", sub(r"^  sample_rate_GHz: 40", "  dt_s: fast"))
tcase("steps-missing", "timeseries.steps", drop(r"^  steps:"))
tcase("steps-zero", "timeseries.steps", sub(r"^  steps: \d+", "  steps: 0"))
tcase("steps-fraction", "timeseries.steps", sub(r"^  steps: \d+", "  steps: 1000.5"))
tcase("samples-one", "timeseries.samples", sub(r"^  samples: 16", "  samples: 1"))
tcase("unknown-key", "timeseries.step", sub(r"^  steps:", "  step:"))
tcase("loss-typo", "timeseries.loss.Q", sub(r"^    q: 2000", "    Q: 2000"))
tcase("loss-sigma-negative", "timeseries.loss.wall_sigma_S_per_m", sub(r"^    wall_sigma_S_per_m: .*", "    wall_sigma_S_per_m: -5.8e7"))
tcase("loss-q-zero", "timeseries.loss.q", sub(r"^    q: 2000", "    q: 0"))
tcase("loss-tan-delta-text", "timeseries.loss.tan_delta", sub(r"^    q: 2000", "    q: 2000\n    tan_delta: small"))
tcase("wall-loss-cylinder", "timeseries.loss.wall_sigma_S_per_m", sub(r"^  shape: box\n  a_m: .*\n  b_m: .*\n  d_m: .*\n",
      "  shape: cylinder\n  radius_m: 0.015\n  length_m: 0.040\n"))
tcase("record-unknown", "timeseries.record", sub(r"^  record: \[probes\]", "  record: [probes, fields]"))
tcase("aliasing-unknown", "timeseries.aliasing", sub(r"^  aliasing: fail", "  aliasing: ignore"))
tcase("segment-not-power-of-two", "timeseries.spectra.segment", sub(r"^    segment: \d+", "    segment: 30000"))
tcase("segment-above-steps", "timeseries.spectra.segment", sub(r"^    segment: \d+", "    segment: 262144"))
tcase("detrend-unknown", "timeseries.spectra.detrend", sub(r"^    detrend: none", "    detrend: linear"))
tcase("confidence-one", "timeseries.spectra.confidence", sub(r"^    confidence: .*", "    confidence: 1.0"))
tcase("lags-too-many", "timeseries.spectra.correlation_lags", sub(r"^    correlation_lags: \d+", "    correlation_lags: 131072"))
tcase("origins-unknown", "timeseries.spectra.origins", sub(r"^    origins: all", "    origins: some"))
tcase("spectra-unknown-key", "timeseries.spectra.window", sub(r"^    detrend: none", "    detrend: none\n    window: hann"))
tcase("no-probes", "probes", sub(r"^probes:\n(  .*\n|\n)+?(?=threads:)", "probes: []\n"))
tcase("probes-not-list", "probes", sub(r"^probes:\n(  .*\n|\n)+?(?=threads:)", "probes: pin\n"))
tcase("probe-kind-unknown", "probes[0].kind", sub(r"^    kind: dipole", "    kind: antenna"))
tcase("probe-kind-missing", "probes[0].kind", drop(r"^    kind: dipole"))
tcase("probe-outside", "probes[1].at", sub(r"at: \[0.004, 0.010, 0.020\]\n    normal", "at: [0.004, 0.030, 0.020]\n    normal"))
tcase("probe-zero-direction", "probes[0].direction", sub(r"direction: \[0, 1, 0\]", "direction: [0, 0, 0]"))
tcase("probe-length-negative", "probes[0].length_m", sub(r"length_m: 0.002", "length_m: -0.002"))
tcase("probe-duplicate-name", "probes[1].name", sub(r"- name: loop ", "- name: pin "))
tcase("probe-reserved-name", "probes[0].name", sub(r"- name: pin ", "- name: step "))
tcase("probe-bad-name", "probes[0].name", sub(r"- name: pin ", "- name: 'pin antenna' "))
tcase("probe-unknown-key", "probes[0].normal", sub(r"direction: \[0, 1, 0\]", "normal: [0, 1, 0]"))
tcase("loop-output-unknown", "probes[1].output", sub(r"output: emf", "output: current"))
tcase("loop-area-zero", "probes[1].area_m2", sub(r"area_m2: 1.0e-6", "area_m2: 0"))
tcase("field-probe-component", "probes[1].component", sub(r"- name: loop .*\n    kind: loop\n(    .*\n)+?(?=\n|threads:)",
      "- name: ez\n    kind: field\n    field: E\n    component: w\n    at: [0.004, 0.010, 0.020]\n"))

for f in glob.glob("ts-[0-9][0-9]-*.yaml"):
    os.remove(f)
for i, (name, expect, fn) in enumerate(ts):
    with open(f"ts-{i:02d}-{name}.yaml", "w") as out:
        out.write(f"# expect: {expect}\n" + fn(noise))
print(len(ts), "time-series cases")
