import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';

let client: QueryClient | null = null;

/**
 * `offlineFirst`: a query or mutation runs at once even when the browser has said it went offline, and only a retry
 * waits for the network. The service worker answers kept cards and their field logs without a network, and keeping
 * an entry on the phone is IndexedDB work; with TanStack Query's default (`online`) both would wait, paused, for a
 * network that may not come back before the technician leaves the cabinet.
 */
export const newQueryClient = () => new QueryClient({
  defaultOptions: {
    queries: { retry: 1, refetchOnWindowFocus: false, networkMode: 'offlineFirst' },
    mutations: { networkMode: 'offlineFirst' },
  },
});

/**
 * In the browser, one QueryClient per page, shared by every island on it. On the server, one per render: a
 * process-wide cache would serve a later request the data an earlier one saw, in place of its own props.
 */
function useClient(): QueryClient {
  const [own] = useState(() => (typeof window === 'undefined' ? newQueryClient() : null));
  if (own) return own;
  client ??= newQueryClient();
  return client;
}

export function QueryProvider({ children }: { children: ReactNode }) {
  return <QueryClientProvider client={useClient()}>{children}</QueryClientProvider>;
}
