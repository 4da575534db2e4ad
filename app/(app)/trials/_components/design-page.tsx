import { listBlockSpreadBySpecies, listDesignOptions, listRoomIccBySpecies } from "@/lib/data/trials";
import type { Member } from "@/lib/data/members";
import { DesignForm, type DesignValues } from "./design-form";

/** Loads the registries and the co-op's spread and room likeness per species, then shows the design form. */
export async function DesignPage({ member, initial }: { member: Member; initial: DesignValues }) {
  const [options, spread, roomIcc] = await Promise.all([listDesignOptions(member), listBlockSpreadBySpecies(), listRoomIccBySpecies()]);
  return (
    <DesignForm
      options={{ ...options, spreadBySpecies: spread.bySpecies, roomIccBySpecies: roomIcc, minimumFarms: spread.minimumFarms }}
      initial={initial}
    />
  );
}
