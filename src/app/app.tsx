import { useState } from 'react';
import { RouterProvider } from 'react-router-dom';
import { createQueryClient, AppProviders } from './providers';
import { createAppRouter } from './router';

/** The whole client: one query client and one router for the life of the page. */
export function App() {
  const [queryClient] = useState(createQueryClient);
  const [router] = useState(() => createAppRouter(queryClient));
  return (
    <AppProviders queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProviders>
  );
}
