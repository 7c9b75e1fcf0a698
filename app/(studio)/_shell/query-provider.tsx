"use client";

import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useState } from "react";

/** One TanStack Query client per browser tab, for the studio's client components. */
export function QueryProvider({ children }: { children: React.ReactNode }) {
  const [client] = useState(
    () =>
      new QueryClient({
        defaultOptions: {
          queries: {
            staleTime: 15_000,
            // A 4xx will not change on retry; only retry what may be transient.
            retry: (failureCount, error) =>
              failureCount < 2 && !(error instanceof Error && /^4\d\d/.test(error.message)),
          },
        },
      }),
  );
  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}
