"use client";

import { useState } from "react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { AbilityProvider, Can, useAbility as useCaslAbility } from "@casl/react";
import { createMongoAbility, type RawRuleOf } from "@casl/ability";
import type { AppAbility } from "@coldtrail/core";

/** Mirrors the server's permissions in the browser to hide what cannot be done. The server decides. */
export { Can };
export const useAbility = () => useCaslAbility<AppAbility>();

export function Providers({ rules, children }: { rules: RawRuleOf<AppAbility>[]; children: React.ReactNode }) {
  const [queryClient] = useState(
    () => new QueryClient({ defaultOptions: { queries: { staleTime: 15_000, refetchOnWindowFocus: false, retry: 1 } } }),
  );
  const [ability] = useState(() => createMongoAbility<AppAbility>(rules));
  return (
    <QueryClientProvider client={queryClient}>
      <AbilityProvider value={ability}>{children}</AbilityProvider>
    </QueryClientProvider>
  );
}
