"use client";

import { useQuery } from "@tanstack/react-query";
import type { MyFarmPage } from "@/lib/data/my-farm";
import { fetchJson } from "./fetch-json";

export function useMyFarm() {
  return useQuery({
    queryKey: ["my-farm"],
    queryFn: () => fetchJson<MyFarmPage>("/api/my-farm"),
    refetchInterval: (query) => (query.state.data?.updating ? 5_000 : false),
  });
}
