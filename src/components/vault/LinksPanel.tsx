/** The links of a machine with their red / amber / green state and the first finding of each. */
import { useQuery } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import type { LinkData } from './LinkEditor';
import { ErrorNotice, StateBadge } from './shared';
import { converterChains, type ConverterChain } from '../../lib/field/chains';

/** A converter's two sides in a row: the ports on one side → the converter (port ⇄ port) → the ports on the other. */
function Chain({ c }: { c: ConverterChain }) {
  const [a, b] = c.sides;
  const side = (s: typeof a) => (
    <span className="inline-flex flex-wrap items-center gap-1 min-w-0">
      {s.link && <StateBadge state={s.link.state} />}
      <span className="break-words min-w-0">{s.ends.length ? s.ends.join(', ') : 'nothing linked yet'}</span>
      {s.link && <a href={`/vault/links/${s.link.id}`} className="text-sm">({s.link.name})</a>}
    </span>
  );
  return (
    <li className="border border-line rounded p-2 bg-white flex flex-wrap items-center gap-2" data-testid="chain" data-converter={c.converter}>
      {side(a)}
      <span aria-hidden="true">→</span>
      <span className="rounded border border-accent px-1.5 py-0.5 text-sm"><span className="font-semibold mono">{c.converter}</span> {a.portName} ⇄ {b.portName}</span>
      <span aria-hidden="true">→</span>
      {side(b)}
    </li>
  );
}

interface Props { machineId: string; initial: { items: LinkData[]; total: number } }

function Links({ machineId, initial }: Props) {
  const q = useQuery({
    queryKey: vaultKeys.linksOfMachine(machineId),
    queryFn: () => api<{ items: LinkData[]; total: number }>(`/api/links?machineId=${machineId}&pageSize=200`),
    initialData: initial,
  });
  if (q.isError) return <ErrorNotice error={q.error} />;
  if (q.data.items.length === 0) return <p className="text-muted">No links recorded on this machine yet.</p>;
  const chains = converterChains(q.data.items);
  return (
    <>
    {chains.length > 0 && (
      <div className="mb-3">
        <h3 className="font-semibold mb-1">Through converters</h3>
        <ul className="grid gap-2" data-testid="chains" aria-label="Links joined by a converter">
          {chains.map((c, i) => <Chain key={i} c={c} />)}
        </ul>
      </div>
    )}
    <ul className="grid gap-2" data-testid="links">
      {q.data.items.map((l) => {
        const first = l.report.findings[0];
        return (
          <li key={l.id} className="border border-line rounded p-2 bg-white" data-link={l.name}>
            <div className="flex flex-wrap items-center gap-2">
              <StateBadge state={l.report.state} />
              <a href={`/vault/links/${l.id}`} className="font-semibold">{l.name}</a>
              <span className="text-sm text-muted">{l.kind === 'rs485-bus' ? 'RS-485 bus' : 'point-to-point'} · {l.members.length} port{l.members.length === 1 ? '' : 's'}{l.cableLengthM != null ? ` · ${l.cableLengthM} m` : ''}</span>
            </div>
            <p className="text-sm mt-1">{l.members.map((m) => `${m.deviceTag} ${m.portName} (${m.role}, ${m.shorthand})`).join(' · ')}</p>
            {first && <p className="text-sm mt-1">{first.message}{l.report.findings.length > 1 ? ` (+${l.report.findings.length - 1} more)` : ''}</p>}
          </li>
        );
      })}
    </ul>
    </>
  );
}

export default function LinksPanel(props: Props) {
  return (
    <QueryProvider>
      <Links {...props} />
    </QueryProvider>
  );
}
