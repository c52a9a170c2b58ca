/**
 * The app's settings, read from here and nowhere else: declared once, with zod, in server/config.mjs (shared with
 * server/serve.mjs, which parses them at start and stops on a bad value) and parsed once per process. Here, below
 * every layer, so the database layer reads it too. Names and defaults: the README's configuration table.
 */
import { loadConfig, SHARE_MAX_DAYS, type LoadedConfig, type S3Settings } from '../server/config.mjs';

export const config: LoadedConfig = loadConfig();
export { SHARE_MAX_DAYS };
export type { S3Settings };
