"use client";

import { useQuery } from "@tanstack/react-query";
import type { MyFarmPage } from "@/lib/data/my-farm";
import { fetchJson } from "./fetch-json";

/** The member's own farm this season (live), beside the co-op's newest release. */
export function useMyFarm() {
  return useQuery({
    queryKey: ["my-farm"],
    queryFn: () => fetchJson<MyFarmPage>("/api/my-farm"),
  });
}
