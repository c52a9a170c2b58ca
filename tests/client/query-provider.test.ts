/**
 * The query cache of islands rendered on the server: one per render, never one for the whole server process,
 * or a page would show a record as an earlier request saw it (and its island would then fail to hydrate).
 */
import { afterEach, describe, expect, it } from 'vitest';
import { createElement } from 'react';
import { renderToString } from 'react-dom/server';
import { onlineManager, useQuery } from '@tanstack/react-query';
import { newQueryClient, QueryProvider } from '../../src/components/QueryProvider';
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

/**
 * The browser's word that it went offline must not hold back what works without a network: the service worker
 * answers kept cards, and an entry kept on the phone is IndexedDB work. TanStack Query's default pauses both.
 */
describe('the page\'s query client when the browser says it is offline', () => {
  const settledWithin = <T,>(p: Promise<T>, ms: number) => Promise.race([p, new Promise<'paused'>((r) => setTimeout(() => r('paused'), ms))]);
  afterEach(() => onlineManager.setOnline(true));

  it('runs a mutation at once (keeping an entry on the phone)', async () => {
    onlineManager.setOnline(false);
    const qc = newQueryClient();
    const keep = qc.getMutationCache().build(qc, { mutationFn: async () => 'kept' });
    expect(await settledWithin(keep.execute(undefined), 200)).toBe('kept');
  });

  it('runs a query at once (a kept card\'s field log from the service worker)', async () => {
    onlineManager.setOnline(false);
    const qc = newQueryClient();
    expect(await settledWithin(qc.fetchQuery({ queryKey: ['field-log', 'dev_1'], queryFn: async () => ({ items: [] }) }), 200)).toEqual({ items: [] });
  });
});
