import { describe, expect, it } from "vitest";
import { outcomeOf, reasonsOf } from "./harvest-queue";

// What the phone does with each answer to a kept entry (common practice for an offline queue:
// drop what was stored, hold what the grower must change, retry everything else).
describe("outcomeOf", () => {
  it("drops an entry the server saved", () => {
    expect(outcomeOf({ status: "ok", message: "Saved flush 2 of FE-1: 640 g." })).toBe("sent");
  });
  it("holds an entry refused on its fields, or with warnings to accept, for the grower", () => {
    expect(outcomeOf({ status: "error", message: "Not saved", fieldErrors: { flush: ["Flush 2 is already stored."] } })).toBe("refused");
    expect(outcomeOf({ status: "confirm", message: "Check", warnings: [{ message: "flush 1 is missing" }] })).toBe("refused");
  });
  it("keeps for later what failed for no fault of the entry: no signal, signed out, another member signed in", () => {
    expect(outcomeOf({ status: "unreachable" })).toBe("keep");
    expect(outcomeOf({ status: "error", message: "Sign in again." })).toBe("keep");
    expect(outcomeOf({ status: "error", message: "This entry was kept on the phone for another member.", fieldErrors: {} })).toBe("keep");
  });
});

describe("reasonsOf", () => {
  it("lists the field errors, then the warnings, in the server's words", () => {
    expect(reasonsOf({ status: "confirm", fieldErrors: { weight: ["Too heavy."] }, warnings: [{ message: "After today." }] })).toEqual([
      "Too heavy.",
      "After today.",
    ]);
    expect(reasonsOf({ status: "unreachable" })).toEqual([]);
  });
});
