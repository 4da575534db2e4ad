import { Card } from "./card";

/** An honest placeholder for a part of the product that is planned but not in this version. */
export function NotBuiltYet({ what, plannedIn }: { what: string; plannedIn: string }) {
  return (
    <Card>
      <p className="text-base text-ink">{what}</p>
      <p className="mt-2 text-sm text-ink-soft">This part of Rhizomorph is not built yet ({plannedIn}). Nothing here is lost in the meantime.</p>
    </Card>
  );
}
