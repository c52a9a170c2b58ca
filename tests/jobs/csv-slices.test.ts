/** Parsing a CSV text in slices gives exactly what Papa gives for the whole text (the reference). */
import { expect, it } from 'vitest';
import Papa from 'papaparse';
import { parseCsvInSlices } from '../../src/lib/server/field/csv-parse';

function reference(text: string) {
  const p = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: 'greedy' });
  return { fields: p.meta.fields ?? [], data: p.data, errors: p.errors.map((e) => ({ row: e.row, message: e.message })) };
}

const tricky = [
  'Tag,Name,Notes',
  'A-1,"Drive, main","two\nlines"',
  'A-2,Scale 5" display,plain',
  '',
  'A-3,"quoted ""inner"" text",',
  'A-4,short',
  'A-5,"ends with newline\r\n",x',
  'A-6,too,many,cells',
  '\u0000\u007f\u0080\u00ff,bytes,ok',
].join('\r\n');

it.each([1, 7, 16, 64, 1024])('slices of %i characters match the whole parse', async (size) => {
  expect(await parseCsvInSlices(tricky, size)).toEqual(reference(tricky));
});

it('semicolon files, a file without data rows, and empty text', async () => {
  const semi = 'Tag;Name\nB-1;"x;y"\nB-2;z\n';
  expect(await parseCsvInSlices(semi, 4)).toEqual(reference(semi));
  expect(await parseCsvInSlices('Tag,Name\n', 2)).toEqual(reference('Tag,Name\n'));
  expect(await parseCsvInSlices('', 2)).toEqual(reference(''));
});
