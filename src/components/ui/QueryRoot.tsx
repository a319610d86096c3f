import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState, type ComponentType } from 'react';

/** Every island is its own React root, so each gets its own query client. */
export function withQueryClient<P extends object>(Component: ComponentType<P>) {
  return function QueryIsland(props: P) {
    const [client] = useState(
      () => new QueryClient({ defaultOptions: { queries: { retry: 1, refetchOnWindowFocus: false } } }),
    );
    return (
      <QueryClientProvider client={client}>
        <Component {...props} />
      </QueryClientProvider>
    );
  };
}
