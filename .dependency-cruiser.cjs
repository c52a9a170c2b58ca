/**
 * The layers, checked by `npm run lint` (part of `npm test`). Arrows point down only:
 *   pages and API routes → server services (src/lib/server) → database (src/db) → pure code (src/lib/<pure>)
 * Islands (src/components) run in the browser: they import pure code and browser helpers, never the server.
 * Settings (src/config.ts, declared in server/config.mjs) sit below the database: any server code may read them.
 */
const PURE = '^src/lib/(frame|composer|field|schemas|live)/|^src/lib/(permissions|caution)\\.ts$';
/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: 'pure-stays-pure',
      comment: 'Pure code (engine, composer and field helpers, schemas, permissions) runs in browser and server alike.',
      severity: 'error',
      from: { path: PURE },
      to: { path: '^src/lib/(server|client)/|^src/db/|^src/config\\.ts$|^src/components/|^src/pages/|^server/|^node_modules/(@types/)?(astro|react|react-dom|drizzle-orm|@libsql|better-auth)/|^astro:' },
    },
    {
      name: 'pure-no-node',
      comment: 'Pure code uses no Node built-ins.',
      severity: 'error',
      from: { path: PURE },
      to: { dependencyTypes: ['core'] },
    },
    {
      name: 'db-below-services',
      comment: 'The database layer (schema, client, migrations, seed) imports no server service.',
      severity: 'error',
      from: { path: '^src/db/' },
      to: { path: '^src/lib/server/|^src/lib/client/|^src/components/|^src/pages/' },
    },
    {
      name: 'islands-no-server',
      comment: 'Islands are shipped to the browser: no server services, database or Node built-ins.',
      severity: 'error',
      from: { path: '^src/components/.*\\.tsx?$|^src/lib/client/' },
      to: { path: '^src/lib/server/|^src/db/|^src/config\\.ts$|^server/' },
    },
    {
      name: 'islands-no-node',
      severity: 'error',
      from: { path: '^src/components/.*\\.tsx?$|^src/lib/client/' },
      to: { dependencyTypes: ['core'] },
    },
    {
      name: 'settings-through-one-door',
      comment: 'The app reads its settings from src/config.ts, the one parsed copy; server/config.mjs is the declaration.',
      severity: 'error',
      from: { path: '^src/', pathNot: '^src/config\\.ts$' },
      to: { path: '^server/config\\.mjs$' },
    },
    {
      name: 'services-not-up',
      comment: 'Server services never import pages, routes or islands.',
      severity: 'error',
      from: { path: '^src/lib/server/' },
      to: { path: '^src/pages/|^src/components/' },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    tsConfig: { fileName: 'tsconfig.json' },
    tsPreCompilationDeps: true,
    exclude: { path: '^(dist|\\.dist-|tests|bench|scripts)' },
    enhancedResolveOptions: { extensions: ['.ts', '.tsx', '.mjs', '.js', '.d.ts'] },
  },
};
