"use client";

import { useState } from "react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { createContextualCan } from "@casl/react";
import { createMongoAbility, type RawRuleOf } from "@casl/ability";
import { createContext, useContext } from "react";
import type { AppAbility } from "@coldtrail/core";

const AbilityContext = createContext<AppAbility>(createMongoAbility<AppAbility>([]));

/** Mirrors the server's permissions in the browser to hide what cannot be done. The server decides. */
export const Can = createContextualCan(AbilityContext.Consumer);
export const useAbility = () => useContext(AbilityContext);

export function Providers({ rules, children }: { rules: RawRuleOf<AppAbility>[]; children: React.ReactNode }) {
  const [queryClient] = useState(
    () => new QueryClient({ defaultOptions: { queries: { staleTime: 15_000, refetchOnWindowFocus: false, retry: 1 } } }),
  );
  const [ability] = useState(() => createMongoAbility<AppAbility>(rules));
  return (
    <QueryClientProvider client={queryClient}>
      <AbilityContext.Provider value={ability}>{children}</AbilityContext.Provider>
    </QueryClientProvider>
  );
}
