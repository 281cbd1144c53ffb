import { QueryClient } from '@tanstack/react-query';

/**
 * One query client per page. Each island is its own React root, so islands on the same page
 * share this module-level instance explicitly (STYLE.md rule 6).
 */
export const queryClient = new QueryClient({
  defaultOptions: {
    queries: { staleTime: 5_000, retry: 1, refetchOnWindowFocus: true },
  },
});
