"use client";

import { useQuery } from "@tanstack/react-query";
import type { PooledResultsPage } from "@/lib/data/pooled-results";
import type { FlushWindow } from "@/lib/pooled";
import { fetchJson } from "./fetch-json";

export interface PooledResultsSelection {
  species?: string;
  recipe?: string;
  method?: string;
  window: FlushWindow;
}

export function pooledResultsUrl(selection: PooledResultsSelection): string {
  const params = new URLSearchParams();
  if (selection.species) params.set("species", selection.species);
  if (selection.recipe) params.set("recipe", selection.recipe);
  if (selection.method) params.set("method", selection.method);
  params.set("window", selection.window);
  return `/api/results?${params}`;
}

/** The co-op results for a selection, from the newest release (they change only when a new one is cut). */
export function usePooledResults(selection: PooledResultsSelection) {
  return useQuery({
    queryKey: ["pooled-results", selection],
    queryFn: () => fetchJson<PooledResultsPage>(pooledResultsUrl(selection)),
  });
}
