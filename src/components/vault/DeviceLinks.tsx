/**
 * The links one device's ports are on, with their red / amber / green state. It reads the machine's link list
 * (the query the machine page's LinksPanel reads), so a save of a port, device or link, which refreshes every
 * vault query, shows the new state here without a reload.
 */
import { useQuery } from '@tanstack/react-query';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import type { LinkData } from './LinkEditor';
import { ErrorNotice, StateBadge } from './shared';

interface Props { deviceId: string; machineId: string; initial: { items: LinkData[]; total: number } }

function Links({ deviceId, machineId, initial }: Props) {
  const q = useQuery({
    queryKey: vaultKeys.linksOfMachine(machineId),
    queryFn: () => api<{ items: LinkData[]; total: number }>(`/api/links?machineId=${machineId}&pageSize=200`),
    initialData: initial,
  });
  if (q.isError) return <ErrorNotice error={q.error} />;
  const mine = q.data.items.filter((l) => l.members.some((m) => m.deviceId === deviceId));
  if (mine.length === 0) return <p className="text-sm text-muted">Not on any link yet.</p>;
  return (
    <ul className="grid gap-2" data-testid="device-links">
      {mine.map((l) => (
        <li key={l.id} className="flex items-center gap-2" data-link={l.name}>
          <StateBadge state={l.report.state} />
          <a href={`/vault/links/${l.id}`}>{l.name}</a>
        </li>
      ))}
    </ul>
  );
}

export default function DeviceLinks(props: Props) {
  return (
    <QueryProvider>
      <Links {...props} />
    </QueryProvider>
  );
}
