"use client";

import { useQuery } from "@tanstack/react-query";
import { fetchJson } from "./fetch-json";
import type { BranchOption } from "./types";

/** The branches the person may see, for filters and pickers (one cached request for the whole app). */
export function useBranchOptions(enabled = true) {
  return useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches"), enabled });
}
