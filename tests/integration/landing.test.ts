/** The landing page's sample frame is the demo drive's own invented syntax, built by the engine. */
import { expect, inject, it } from 'vitest';

it("shows the demo drive's index move in every notation", async () => {
  const html = await (await fetch(`${inject('baseUrl')}/`)).text();
  // 45° at 36,000 steps/rev = 4,500 steps; 5 rev/s² and 0.5 rev/s at 36,000 steps/rev (demo data, common practice
  // for indexing tables); CR ends the frame as $0D in the PLC literal (IEC 61131-3 Annex B $hh escapes).
  expect(html).toContain('1!IDX:+4500/R180000/F180000/S18000$0D');
  expect(html).toContain('1!IDX:+4500/R180000/F180000/S18000\\r');
  expect(html).not.toMatch(/#1 GO/);
});
