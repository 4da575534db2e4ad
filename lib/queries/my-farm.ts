"use client";

import { useQuery } from "@tanstack/react-query";
import type { MyFarmPage } from "@/lib/data/my-farm";
import { fetchJson } from "./fetch-json";

/** The member's own farm in a season or the last 365 days (live), beside the co-op's newest release. */
export function useMyFarm(season: number | null) {
  return useQuery({
    queryKey: ["my-farm", season],
    queryFn: () => fetchJson<MyFarmPage>(season === null ? "/api/my-farm" : `/api/my-farm?season=${season}`),
  });
}
