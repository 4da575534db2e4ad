import { describe, expect, it } from "vitest";
import type { TimeDisplay } from "@/lib/time/display";
import { resultsAmendedMail, resultsPublishedMail, trialInvitationMail } from "./trials";

const trial = { code: "T-9", title: "Bran <20 %> & more", question: "Which is better?" };

describe("trial e-mails", () => {
  it("put the links in both parts and escape the HTML", () => {
    const mail = trialInvitationMail({
      trial,
      farmName: "Fernbrook",
      deadline: { date: "2026-12-20", display: { timeZone: "UTC", dateStyle: "iso" } },
      blocksPerArmWanted: null,
      arms: 2,
      enrolUrl: "http://x/trials/1?a=1&b=2",
      optOutUrl: "http://x/unsubscribe/tok",
    });
    expect(mail.text).toContain("http://x/trials/1?a=1&b=2");
    expect(mail.text).toContain("http://x/unsubscribe/tok");
    expect(mail.html).toContain('href="http://x/trials/1?a=1&amp;b=2"');
    expect(mail.html).toContain("Bran &lt;20 %&gt; &amp; more");
    expect(mail.html).not.toContain("<20 %>");
  });

  it("says how many blocks per arm the trial asks of each farm, and says nothing of it when the design does not", () => {
    const invitation = (blocksPerArmWanted: number | null) =>
      trialInvitationMail({ trial, farmName: "Fernbrook", deadline: null, blocksPerArmWanted, arms: 3, enrolUrl: "u", optOutUrl: "o" });
    expect(invitation(6).text).toContain("The trial asks each farm for 6 blocks per arm: 3 arms, so 18 blocks in all.");
    expect(invitation(6).html).toContain("6 blocks per arm");
    expect(invitation(1).text).toContain("for 1 block per arm: 3 arms, so 3 blocks in all.");
    expect(invitation(null).text).not.toContain("asks each farm");
  });

  it("gives the answer-by date in the reader's date style and its end in the reader's zone", () => {
    const answerBy = (display: TimeDisplay) =>
      trialInvitationMail({
        trial,
        farmName: "Fernbrook",
        deadline: { date: "2026-12-10", display },
        blocksPerArmWanted: null,
        arms: 2,
        enrolUrl: "u",
        optOutUrl: "o",
      }).text;
    // Answers are taken through 10 December in UTC, i.e. until 11 December 00:00 UTC. Berlin is UTC+1 in
    // December (CET), Auckland UTC+13 (NZDT): tz database, as ICU ships it.
    expect(answerBy({ timeZone: "Europe/Berlin", dateStyle: "day-month-year-dots" })).toContain(
      "Please answer by 10.12.2026 (answers are taken until 11.12.2026 01:00 CET)",
    );
    expect(answerBy({ timeZone: "Pacific/Auckland", dateStyle: "day-month-year" })).toContain(
      "Please answer by 10/12/2026 (answers are taken until 11/12/2026 13:00 GMT+13)",
    );
    expect(answerBy({ timeZone: "UTC", dateStyle: "iso" })).toContain("until 2026-12-11 00:00 UTC");
  });

  it("sends results without an unsubscribe link, since they are not reminders", () => {
    const mail = resultsPublishedMail({ trial, answer: "Arm B gave more.", resultsUrl: "http://x/r" });
    expect(mail.text).not.toMatch(/unsubscribe|stop reminders/i);
    expect(mail.subject).toBe("Results of trial T-9: Bran <20 %> & more");
  });

  it("says an amendment's version and reason, and that the earlier version stays readable", () => {
    const mail = resultsAmendedMail({
      trial,
      version: 2,
      reason: "Late flush 2 records <of two farms>.",
      answer: "Arm B gave more.",
      resultsUrl: "http://x/r",
    });
    expect(mail.subject).toBe("Amended results of trial T-9: Bran <20 %> & more");
    expect(mail.text).toContain("are amended (version 2). Why: Late flush 2 records <of two farms>.");
    expect(mail.text).toContain("The earlier version stays readable");
    expect(mail.html).toContain("&lt;of two farms&gt;");
    expect(mail.text).not.toMatch(/unsubscribe|stop reminders/i);
  });
});
