/** Team-wide device finder: tag, name, maker, model, serial number, site or machine. */
import { useEffect, useState } from 'react';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';

interface Hit { id: string; tag: string; name: string; maker: string; model: string; serialNumber: string; formerSerials: string[]; siteName: string; machineName: string; matched: string[] }

const FIELD_WORDS: Record<string, string> = { tag: 'tag', name: 'name', maker: 'maker', model: 'model', serialNumber: 'serial', formerSerials: 'earlier serial', siteName: 'site', machineName: 'machine' };

function Finder() {
  const [text, setText] = useState('');
  const [q, setQ] = useState('');
  useEffect(() => {
    const t = setTimeout(() => setQ(text.trim()), 200);
    return () => clearTimeout(t);
  }, [text]);
  const searchable = /[\p{L}\p{N}]/u.test(q);
  const res = useQuery({
    queryKey: vaultKeys.search(q, 12),
    queryFn: () => api<{ items: Hit[]; total: number }>(`/api/devices/search?pageSize=12&q=${encodeURIComponent(q)}`),
    enabled: searchable,
    placeholderData: keepPreviousData,
  });
  return (
    <search className="card block">
      <label htmlFor="device-finder" className="label">Find a device anywhere in the team</label>
      <input id="device-finder" className="input" type="search" value={text} onChange={(e) => setText(e.target.value)} placeholder="e.g. DRV-203, a serial number, a site…" autoComplete="off" />
      {searchable && res.data && (
        <div className="mt-2" aria-live="polite">
          <p className="text-sm text-muted">{res.data.total === 0 ? 'Nothing found.' : `${res.data.total} found${res.data.total > res.data.items.length ? `, best ${res.data.items.length} shown` : ''}.`}</p>
          <ul className="divide-y divide-line" data-testid="search-results">
            {res.data.items.map((h) => (
              <li key={h.id} className="py-1.5">
                <a href={`/vault/devices/${h.id}`} className="font-semibold">{h.tag}</a> <span>{h.name}</span>
                <span className="block text-xs text-muted">{[h.maker, h.model, h.serialNumber].filter(Boolean).join(' · ')}{h.matched.includes('formerSerials') && ` (earlier S/N ${h.formerSerials.join(', ')})`} — {h.siteName} › {h.machineName} · matched {h.matched.map((m) => FIELD_WORDS[m]).join(', ')}</span>
              </li>
            ))}
          </ul>
        </div>
      )}
      {res.isError && <p className="field-error" role="alert">{res.error.message}</p>}
    </search>
  );
}

export default function DeviceSearch() {
  return (
    <QueryProvider>
      <Finder />
    </QueryProvider>
  );
}
