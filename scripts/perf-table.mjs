#!/usr/bin/env node
// Writes the table of docs/performance.md from the figures the benchmarks left in bench/.out/*.json (`npm run bench`
// writes them; BENCH_JSON=file does for a single benchmark). Only the part between the two table markers changes;
// the notes around it (the runs quoted side by side among them) are kept by hand.
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import os from 'node:os';

const OUT = 'bench/.out';
const DOC = 'docs/performance.md';
const START = '<!-- perf-table:start (written by scripts/perf-table.mjs from npm run bench) -->';
const END = '<!-- perf-table:end -->';

const files = existsSync(OUT) ? readdirSync(OUT).filter((f) => f.endsWith('.json')).sort() : [];
if (!files.length) {
  console.error(`No figures in ${OUT}; run npm run bench first.`);
  process.exit(1);
}
const cell = (t) => String(t ?? '').replaceAll('|', '\\|');
const rows = [];
let latest = '';
for (const f of files) {
  const { date, figures } = JSON.parse(readFileSync(join(OUT, f), 'utf8'));
  if (date > latest) latest = date;
  for (const x of figures) rows.push(`| ${cell(x.figure)} | ${cell(x.target)} | ${cell(x.measured)} | ${cell(x.baseline)} | ${cell(x.ratio)} | ${x.pass === null ? '—' : x.pass ? 'PASS' : 'FAIL'} | ${date.slice(0, 16).replace('T', ' ')} UTC |`);
}
const table = [
  START,
  `Machine: ${os.cpus().length} cores (${cell(os.cpus()[0]?.model.trim() ?? 'unknown')}), shared with other work; ${Math.round(os.totalmem() / 2 ** 30)} GB memory; Node ${process.version}.`,
  '',
  '| figure | target | measured | baseline | ratio | result | date |',
  '| --- | --- | --- | --- | --- | --- | --- |',
  ...rows,
  END,
].join('\n');
const doc = existsSync(DOC) ? readFileSync(DOC, 'utf8') : `# Performance\n\n${START}\n${END}\n`;
const a = doc.indexOf(START);
const b = doc.indexOf(END);
if (a < 0 || b < a) throw new Error(`${DOC} lacks the table markers`);
writeFileSync(DOC, doc.slice(0, a) + table + doc.slice(b + END.length));
console.log(`${DOC}: ${rows.length} figures from ${files.join(', ')} (latest ${latest}).`);
