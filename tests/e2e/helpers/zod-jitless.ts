/**
 * Imported first by the fake serial's page script. An init script runs before the page's CSP applies, so zod would
 * find `new Function` allowed and compile its parsers with it later, when the CSP (no 'unsafe-eval') refuses it.
 * Schemas read the setting when they are built, so it is set before any module that builds one.
 */
import { config } from 'zod';

config({ jitless: true });
