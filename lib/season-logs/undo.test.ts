import { describe, expect, it } from "vitest";
import { planUndo, type UndoInput } from "./undo";

// A commit that added block NEW-1 with flush 1, flush 2 of the stored block OLD-1, and changed OLD-1's wet weight.
const base: UndoInput = {
  added: { blocks: 1, harvests: 2 },
  createdBlocks: [{ id: "b-new", code: "NEW-1", untouched: true }],
  createdHarvests: [
    {
      id: "h-new",
      blockId: "b-new",
      blockCode: "NEW-1",
      flush: 1,
      harvestedOn: "2026-04-01",
      freshMassG: 500,
      dryMassG: null,
      untouched: true,
    },
    {
      id: "h-old-2",
      blockId: "b-old",
      blockCode: "OLD-1",
      flush: 2,
      harvestedOn: "2026-04-20",
      freshMassG: 250,
      dryMassG: 25,
      untouched: true,
    },
  ],
  laterHarvestsOnCreatedBlocks: [],
  replaced: [{ kind: "block", rowId: "b-old", label: "block OLD-1", present: true, untouched: true }],
  rewrittenSince: [],
  changes: [{ blockId: "b-old", flush: null, field: "block_wet_weight", oldValue: "2500", newValue: "2600" }],
};

describe("planUndo", () => {
  it("removes what the commit added, puts back what it replaced, and records both", () => {
    const plan = planUndo(base);
    expect(plan).toEqual({
      steps: {
        removeHarvestIds: ["h-new", "h-old-2"],
        removeBlockIds: ["b-new"],
        restore: [{ kind: "block", rowId: "b-old" }],
        history: [
          { blockId: "b-old", flush: null, field: "block_wet_weight", oldValue: "2600", newValue: "2500" },
          { blockId: "b-old", flush: 2, field: "fresh_weight", oldValue: "250", newValue: null },
          { blockId: "b-old", flush: 2, field: "harvested_on", oldValue: "2026-04-20", newValue: null },
          { blockId: "b-old", flush: 2, field: "dry_weight", oldValue: "25", newValue: null },
        ],
      },
    });
  });

  it("refuses when a later change touched a row the commit replaced, naming it", () => {
    const plan = planUndo({ ...base, replaced: [{ ...base.replaced[0], untouched: false }] });
    expect("conflicts" in plan && plan.conflicts.join(" ")).toMatch(/Changed since this commit.*block OLD-1/);
  });

  it("refuses when a harvest it added was edited since", () => {
    const plan = planUndo({ ...base, createdHarvests: [base.createdHarvests[0], { ...base.createdHarvests[1], untouched: false }] });
    expect("conflicts" in plan && plan.conflicts.join(" ")).toMatch(/flush 2 of OLD-1/);
  });

  it("refuses when a harvest it added is gone (deleted, or rewritten by a later file)", () => {
    const plan = planUndo({ ...base, createdHarvests: [base.createdHarvests[0]] });
    expect("conflicts" in plan && plan.conflicts.join(" ")).toMatch(/1 harvest it added/);
  });

  it("names a harvest it added that a later file rewrote, and does not count it again as gone", () => {
    const plan = planUndo({
      ...base,
      createdHarvests: [base.createdHarvests[0]],
      rewrittenSince: [{ kind: "harvest", label: "flush 2 of OLD-1" }],
    });
    expect("conflicts" in plan && plan.conflicts).toEqual([expect.stringMatching(/^Changed since this commit.*flush 2 of OLD-1/)]);
  });

  it("refuses when a row it replaced is gone", () => {
    const plan = planUndo({ ...base, replaced: [{ ...base.replaced[0], present: false }] });
    expect("conflicts" in plan && plan.conflicts.join(" ")).toMatch(/deleted since.*block OLD-1/);
  });

  it("refuses rather than remove a flush recorded since on a block it added", () => {
    const plan = planUndo({ ...base, laterHarvestsOnCreatedBlocks: [{ blockCode: "NEW-1", flush: 2 }] });
    expect("conflicts" in plan && plan.conflicts.join(" ")).toMatch(/flush 2 of NEW-1/);
  });

  it("names the first five rows in the way and counts the rest", () => {
    const replaced = Array.from({ length: 8 }, (_, index) => ({
      kind: "block" as const,
      rowId: `b${index}`,
      label: `block B-${index}`,
      present: true,
      untouched: false,
    }));
    const plan = planUndo({ ...base, replaced });
    expect("conflicts" in plan && plan.conflicts[0]).toMatch(/B-4 and 3 more/);
  });
});
