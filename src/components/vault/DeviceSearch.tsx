/** Team-wide finder: devices (tag, name, role, maker, model, serial number, site or machine), commands and port notes. */
import { useEffect, useState } from 'react';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';

interface RecordHit { kind: 'command' | 'port'; id: string; name: string; detail: string; notes: string; deviceTag: string | null; profileName: string | null; href: string }
interface Found { devices: { items: Hit[]; total: number; totalCapped: boolean }; records: { items: RecordHit[]; totalCapped: boolean } }
interface Hit { id: string; tag: string; name: string; maker: string; model: string; serialNumber: string; formerSerials: string[]; siteName: string; machineName: string; matched: string[] }

const FIELD_WORDS: Record<string, string> = { tag: 'tag', name: 'name', role: 'role', maker: 'maker', model: 'model', serialNumber: 'serial', formerSerials: 'earlier serial', siteName: 'site', machineName: 'machine' };

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
    queryFn: () => api<Found>(`/api/search?limit=12&q=${encodeURIComponent(q)}`),
    enabled: searchable,
    placeholderData: keepPreviousData,
  });
  return (
    <search className="card block">
      <label htmlFor="device-finder" className="label">Find a device, command or port note anywhere in the team</label>
      <input id="device-finder" className="input" type="search" value={text} onChange={(e) => setText(e.target.value)} placeholder="e.g. DRV-203, a serial number, a site…" autoComplete="off" />
      {searchable && res.data && (() => {
        const { devices, records } = res.data;
        const count = devices.totalCapped ? `More than ${devices.total.toLocaleString('en')} devices found` : `${devices.total} ${devices.total === 1 ? 'device' : 'devices'} found`;
        return (
          <div className="mt-2" aria-live="polite">
            <p className="text-sm text-muted">
              {devices.total === 0 && records.items.length === 0 ? 'Nothing found.' : `${count}${devices.total > devices.items.length ? `, first ${devices.items.length} shown` : ''}${devices.totalCapped ? ' (add a word to narrow it)' : ''}.`}
            </p>
            <ul className="divide-y divide-line" data-testid="search-results">
              {devices.items.map((h) => (
                <li key={h.id} className="py-1.5">
                  <a href={`/vault/devices/${h.id}`} className="font-semibold">{h.tag}</a> <span>{h.name}</span>
                  <span className="block text-xs text-muted">{[h.maker, h.model, h.serialNumber].filter(Boolean).join(' · ')}{h.matched.includes('formerSerials') && ` (earlier S/N ${h.formerSerials.join(', ')})`} — {h.siteName} › {h.machineName} · matched {h.matched.map((m) => FIELD_WORDS[m]).join(', ')}</span>
                </li>
              ))}
            </ul>
            {records.items.length > 0 && (
              <>
                <h3 className="text-sm font-semibold mt-3">Commands and port notes</h3>
                <ul className="divide-y divide-line" data-testid="record-results">
                  {records.items.map((r) => (
                    <li key={r.id} className="py-1.5">
                      <a href={r.href} className="font-semibold">{r.kind === 'command' ? r.name : `${r.deviceTag} · port ${r.name}`}</a>{' '}
                      <span className="text-xs text-muted">{r.kind === 'command' ? `command on ${r.deviceTag ?? `profile ${r.profileName}`}` : 'port notes'}</span>
                      {(r.detail || r.notes) && <span className="block text-xs text-muted truncate">{r.detail || r.notes}</span>}
                    </li>
                  ))}
                </ul>
              </>
            )}
          </div>
        );
      })()}
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
