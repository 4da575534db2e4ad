import { listBlockSpreadBySpecies, listDesignOptions } from "@/lib/data/trials";
import type { Member } from "@/lib/data/members";
import { DesignForm, type DesignValues } from "./design-form";

/** Loads the registries and the co-op's spread per species, then shows the design form. */
export async function DesignPage({ member, initial }: { member: Member; initial: DesignValues }) {
  const [options, spread] = await Promise.all([listDesignOptions(member), listBlockSpreadBySpecies()]);
  return <DesignForm options={{ ...options, spreadBySpecies: spread.bySpecies, minimumFarms: spread.minimumFarms }} initial={initial} />;
}
