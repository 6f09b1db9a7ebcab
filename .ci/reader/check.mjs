// Independent reader check: opens a dataset with DuckDB and checks, without any of the tool's
// code, that (1) every Parquet file has the row count its manifest lists, (2) the footer of every
// file carries the run spec byte for byte as the spec file, and (3) a mean computed by DuckDB
// (the mean square of the first field component at the first analysed point) equals the estimate
// in the tool's own correlation table to 1e-9 relative.
// Usage: node check.mjs DATASET_DIR SPEC_FILE
import { DuckDBInstance } from '@duckdb/node-api';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

const [dir, specFile] = process.argv.slice(2);
if (!dir || !specFile) {
  console.error('usage: node check.mjs DATASET_DIR SPEC_FILE');
  process.exit(2);
}
const manifest = JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8'));
const specText = readFileSync(specFile, 'utf8');
const db = await (await DuckDBInstance.create(':memory:')).connect();
const q = async (sql) => (await db.runAndReadAll(sql)).getRowObjects();
const lit = (s) => "'" + s.replaceAll("'", "''") + "'";
let failures = 0;
const fail = (msg) => { console.error('FAIL ' + msg); failures++; };

for (const f of manifest.files.filter((f) => f.name.endsWith('.parquet'))) {
  const path = join(dir, f.name);
  const [{ n }] = await q(`select count(*)::BIGINT as n from read_parquet(${lit(path)})`);
  if (BigInt(n) !== BigInt(f.rows)) fail(`${f.name}: DuckDB counts ${n} rows, manifest says ${f.rows}`);
  const kv = await q(`select decode(key) as k, decode(value) as v from parquet_kv_metadata(${lit(path)})`);
  const spec = kv.find((r) => r.k === 'stillfield.spec');
  if (!spec) fail(`${f.name}: footer has no stillfield.spec`);
  else if (spec.v !== specText) fail(`${f.name}: footer spec differs from ${specFile}`);
}

const table = JSON.parse(readFileSync(join(dir, 'analysis', 'correlations.json'), 'utf8'));
const rows = table.rows ?? table.correlations ?? [];
const row = rows.find((r) => r.first === r.second && r.i === 'x' && r.j === 'x' && r.status !== 'zero_variance');
if (!row) {
  fail('no diagonal xx row in analysis/correlations.json');
} else {
  const col = `${row.field}_x`;
  const [{ m }] = await q(`select avg(${col} * ${col}) as m from read_parquet(${lit(join(dir, 'fields.parquet'))}) where point = ${row.first}`);
  const rel = Math.abs(m - row.estimate) / Math.abs(row.estimate);
  if (!(rel < 1e-9)) fail(`mean of ${col}^2 at point ${row.first}: DuckDB ${m}, tool ${row.estimate} (rel. diff ${rel})`);
  else console.log(`DuckDB mean of ${col}^2 at point ${row.first} = ${m} agrees with the tool's estimate (rel. diff ${rel.toExponential(2)})`);
}
console.log(`independent reader: ${failures === 0 ? 'all checks passed' : failures + ' check(s) failed'}`);
process.exit(failures === 0 ? 0 : 1);
