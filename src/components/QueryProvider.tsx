import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';

let client: QueryClient | null = null;

const newClient = () => new QueryClient({ defaultOptions: { queries: { retry: 1, refetchOnWindowFocus: false } } });

/**
 * In the browser, one QueryClient per page, shared by every island on it. On the server, one per render: a
 * process-wide cache would serve a later request the data an earlier one saw, in place of its own props.
 */
function useClient(): QueryClient {
  const [own] = useState(() => (typeof window === 'undefined' ? newClient() : null));
  if (own) return own;
  client ??= newClient();
  return client;
}

export function QueryProvider({ children }: { children: ReactNode }) {
  return <QueryClientProvider client={useClient()}>{children}</QueryClientProvider>;
}
