/**
 * The query cache of islands rendered on the server: one per render, never one for the whole server process,
 * or a page would show a record as an earlier request saw it (and its island would then fail to hydrate).
 */
import { describe, expect, it } from 'vitest';
import { createElement } from 'react';
import { renderToString } from 'react-dom/server';
import { useQuery } from '@tanstack/react-query';
import { QueryProvider } from '../../src/components/QueryProvider';
import { vaultKeys } from '../../src/lib/client/keys';

function Port({ version }: { version: number }) {
  const q = useQuery({ queryKey: vaultKeys.record('port', 'port_1'), queryFn: async () => ({ version: -1 }), initialData: { version } });
  return createElement('span', null, `version ${q.data.version}`);
}

describe('QueryProvider on the server', () => {
  it('renders each request from its own props', () => {
    expect(renderToString(createElement(QueryProvider, null, createElement(Port, { version: 1 })))).toContain('version 1');
    expect(renderToString(createElement(QueryProvider, null, createElement(Port, { version: 3 })))).toContain('version 3');
  });
});
