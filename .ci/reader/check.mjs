// Independent reader check: opens a dataset with DuckDB and checks, without any of the tool's
// code, that (1) every Parquet file has the row count its manifest lists, each part holds
// samples-in-part x modes (amplitudes) or x points (fields) rows, and the parts together hold
// samples x modes and samples x points rows, read as a directory of part files (fields/*.parquet);
// (2) the footer of every file carries the run spec byte for byte as the spec file, and its part
// index and first sample as the manifest lists them; (3) a mean computed by DuckDB over all parts
// (the mean square of the first field component at the first analysed point) equals the estimate in
// the tool's own correlation table to 1e-9 relative. With --no-analysis, (3) is skipped.
// Usage: node check.mjs DATASET_DIR SPEC_FILE [--no-analysis]
import { DuckDBInstance } from '@duckdb/node-api';
import { readFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';

const [dir, specFile, flag] = process.argv.slice(2);
if (!dir || !specFile) {
  console.error('usage: node check.mjs DATASET_DIR SPEC_FILE [--no-analysis]');
  process.exit(2);
}
const manifest = JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8'));
const specText = readFileSync(specFile, 'utf8');
const db = await (await DuckDBInstance.create(':memory:')).connect();
const q = async (sql) => (await db.runAndReadAll(sql)).getRowObjects();
const lit = (s) => "'" + s.replaceAll("'", "''") + "'";
let failures = 0;
const fail = (msg) => { console.error('FAIL ' + msg); failures++; };

const S = BigInt(manifest.samples), M = BigInt(manifest.modes), P = BigInt(manifest.points);
const partSamples = BigInt(manifest.part_samples);
if (BigInt(manifest.part_count) !== (S + partSamples - 1n) / partSamples) {
  fail(`manifest: part_count ${manifest.part_count} does not split ${S} samples in parts of ${partSamples}`);
}
let checked = 0;
for (const f of manifest.files.filter((f) => f.name.endsWith('.parquet'))) {
  const path = join(dir, f.name);
  const [{ n }] = await q(`select count(*)::BIGINT as n from read_parquet(${lit(path)})`);
  if (BigInt(n) !== BigInt(f.rows)) fail(`${f.name}: DuckDB counts ${n} rows, manifest says ${f.rows}`);
  const kv = Object.fromEntries((await q(`select decode(key) as k, decode(value) as v from parquet_kv_metadata(${lit(path)})`))
    .map((r) => [r.k, r.v]));
  if (kv['stillfield.spec'] === undefined) fail(`${f.name}: footer has no stillfield.spec`);
  else if (kv['stillfield.spec'] !== specText) fail(`${f.name}: footer spec differs from ${specFile}`);
  if (kv['stillfield.run_key'] !== manifest.run_key) fail(`${f.name}: footer run key differs from the manifest's`);
  const part = f.name.match(/^(amplitudes|fields)\/part-(\d+)\.parquet$/);
  if (part) {
    const k = BigInt(part[2]);
    const first = k * partSamples;
    const inPart = (S - first < partSamples ? S - first : partSamples);
    const want = inPart * (part[1] === 'amplitudes' ? M : P);
    if (BigInt(n) !== want) fail(`${f.name}: ${n} rows, expected ${want} (${inPart} samples)`);
    if (kv['stillfield.part'] !== String(k) || kv['stillfield.first_sample'] !== String(first)) {
      fail(`${f.name}: footer says part ${kv['stillfield.part']}, first sample ${kv['stillfield.first_sample']}`);
    }
    const [{ lo, hi }] = await q(`select min(sample)::BIGINT lo, max(sample)::BIGINT hi from read_parquet(${lit(path)})`);
    if (BigInt(lo) !== first || BigInt(hi) !== first + inPart - 1n) fail(`${f.name}: samples ${lo}..${hi}`);
  }
  checked++;
}
// The part files as one table, the way a dataset-directory reader sees them.
for (const [table, per] of [['amplitudes', M], ['fields', P]]) {
  const [{ n, s }] = await q(`select count(*)::BIGINT as n, count(distinct sample)::BIGINT as s
    from read_parquet(${lit(join(dir, table, '*.parquet'))})`);
  if (BigInt(n) !== S * per || BigInt(s) !== S) fail(`${table}/*.parquet: ${n} rows of ${s} samples, expected ${S * per} of ${S}`);
  else console.log(`DuckDB reads ${table}/*.parquet as one table: ${n} rows, ${s} samples`);
}

// Nulls: a point outside the cavity has null field values in every sample, one inside never does
// (the points table's inside flag, joined by DuckDB, against the fields' first value column).
{
  const cols = (await q(`select name from parquet_schema(${lit(join(dir, 'fields', 'part-00000.parquet'))})`)).map((r) => r.name);
  const col = cols.find((c) => /^[AEB]_x$/.test(c));
  const [{ bad, inside }] = await q(`select
      count(*) filter (where (p.inside and f.${col} is null) or (not p.inside and f.${col} is not null))::BIGINT as bad,
      count(*) filter (where p.inside)::BIGINT as inside
    from read_parquet(${lit(join(dir, 'fields', '*.parquet'))}) f join read_parquet(${lit(join(dir, 'points.parquet'))}) p
      on f.point = p.point`);
  if (BigInt(bad) !== 0n) fail(`fields: ${bad} rows whose ${col} null-ness disagrees with the points table's inside flag`);
  else console.log(`DuckDB: ${col} is null exactly outside the cavity (${inside} values inside)`);
}

if (flag !== '--no-analysis') {
  const table = JSON.parse(readFileSync(join(dir, 'analysis', 'correlations.json'), 'utf8'));
  const rows = table.rows ?? table.correlations ?? [];
  const row = rows.find((r) => r.first === r.second && r.i === 'x' && r.j === 'x' && r.status !== 'zero_variance');
  if (!row) {
    fail('no diagonal xx row in analysis/correlations.json');
  } else {
    const col = `${row.field}_x`;
    const [{ m }] = await q(`select avg(${col} * ${col}) as m from read_parquet(${lit(join(dir, 'fields', '*.parquet'))})
      where point = ${row.first}`);
    const rel = Math.abs(m - row.estimate) / Math.abs(row.estimate);
    if (!(rel < 1e-9)) fail(`mean of ${col}^2 at point ${row.first}: DuckDB ${m}, tool ${row.estimate} (rel. diff ${rel})`);
    else console.log(`DuckDB mean of ${col}^2 at point ${row.first} = ${m} agrees with the tool's estimate (rel. diff ${rel.toExponential(2)})`);
  }
}
console.log(`independent reader: ${checked} files; ${failures === 0 ? 'all checks passed' : failures + ' check(s) failed'}`);
process.exit(failures === 0 ? 0 : 1);
