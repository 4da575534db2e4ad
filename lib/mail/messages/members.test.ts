import { describe, expect, it } from "vitest";
import { invitationMessage, passwordResetMessage } from "./members";

// 2026-12-09 09:30 UTC is 10:30 in Berlin (CET, UTC+1 in winter: tz database, file "europe").
const expiresAt = new Date("2026-12-09T09:30:00Z");

describe("until when an e-mailed link works", () => {
  it("is written in UTC, named, to an invitee whose zone no one knows", () => {
    const message = invitationMessage({
      to: "new@farm.example",
      inviterName: "Maren",
      role: "grower",
      farmName: "Fernbrook Farm",
      cooperativeName: "Alder Valley",
      link: "https://app.example/accept",
      expiresAt,
    });
    expect(message.text).toContain("until 2026-12-09 09:30 UTC.");
  });

  it("is written in a member's chosen zone and date style, with the zone named", () => {
    const message = passwordResetMessage({
      to: "m@farm.example",
      name: "Maren",
      link: "https://app.example/reset",
      expiresAt,
      display: { timeZone: "Europe/Berlin", dateStyle: "day-month-year-dots" },
    });
    expect(message.text).toContain("until 09.12.2026 10:30 CET.");
    expect(message.html).toContain("until 09.12.2026 10:30 CET.");
  });
});
