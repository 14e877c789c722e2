import { useState } from 'react';
import { QueryClientProvider } from '@tanstack/react-query';
import { RouterProvider } from 'react-router-dom';
import { makeQueryClient } from '@/lib/query-client';
import { makeRouter } from './router';

export function AppProvider() {
  const [queryClient] = useState(makeQueryClient);
  const [router] = useState(() => makeRouter(queryClient));
  return (
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  );
}
