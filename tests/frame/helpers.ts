import { type TemplateInput, templateSchema, toHex } from '~/lib/frame';

export const ascii = (s: string) => new TextEncoder().encode(s);
export const hexOf = (s: string) => toHex(ascii(s));
/** Parses a template through the schema so defaults are filled in as in the app. */
export const tpl = (segments: TemplateInput['segments']) => templateSchema.parse({ version: 1, segments });
