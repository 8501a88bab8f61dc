import { QueryClientProvider } from '@tanstack/react-query';
import { RouterProvider } from 'react-router-dom';
import { authKeys } from '@/features/auth/api/get-me';
import { createQueryClient } from '@/lib/query-client';
import { createAppRouter } from './router';

// Any 401 means the session ended (expired, signed out elsewhere, role changed): forget the user, and the
// app shell sends them to sign-in and back here afterwards.
const queryClient = createQueryClient(() => queryClient.setQueryData(authKeys.me(), null));
const router = createAppRouter(queryClient);

export function AppProvider() {
  return (
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  );
}
