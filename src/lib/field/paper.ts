/** Paper sizes for printing a machine's cards to keep inside the cabinet door. */
export const PAPERS = {
  a4: { key: 'a4', label: 'A4', css: 'A4 portrait', width: '210mm', height: '297mm' },
  letter: { key: 'letter', label: 'US Letter', css: 'letter portrait', width: '8.5in', height: '11in' },
} as const;
export type PaperKey = keyof typeof PAPERS;

/** `?paper=` as given, A4 for anything unknown or missing. */
export function paperOf(raw: string | null | undefined): (typeof PAPERS)[PaperKey] {
  return raw === 'letter' ? PAPERS.letter : PAPERS.a4;
}
