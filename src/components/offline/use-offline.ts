/** The islands' view of what this phone keeps: kept cards and queued entries, read through TanStack Query. */
import { useEffect } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { offlineKeys } from '../../lib/client/keys';
import { keptState, offlineSupported } from '../../lib/client/offline/kept';
import { OUTBOX_EVENT, outboxEntries } from '../../lib/client/offline/outbox';
import type { Scope } from '../../lib/client/offline/store';

export function useKept() {
  return useQuery({
    queryKey: offlineKeys.kept(),
    queryFn: async () => (offlineSupported() ? { supported: true as const, ...(await keptState()) } : { supported: false as const }),
    retry: false,
  });
}

/** Queued entries of this user and team (of one device when given), refreshed whenever the outbox changes. */
export function useOutbox(scope: Scope, deviceId?: string) {
  const qc = useQueryClient();
  useEffect(() => {
    const changed = () => qc.invalidateQueries({ queryKey: offlineKeys.outbox(deviceId) });
    window.addEventListener(OUTBOX_EVENT, changed);
    return () => window.removeEventListener(OUTBOX_EVENT, changed);
  }, [qc, deviceId]);
  return useQuery({
    queryKey: offlineKeys.outbox(deviceId),
    queryFn: async () => {
      if (!offlineSupported()) return [];
      const all = await outboxEntries(scope);
      return deviceId ? all.filter((e) => e.deviceId === deviceId) : all;
    },
    retry: false,
  });
}
