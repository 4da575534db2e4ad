"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import {
  amendPublishedAnalysis,
  askToJoinTrial,
  inviteFarms,
  moveTrial,
  respondToInvitation,
  runTrialAnalysis,
  saveTrialDraft,
  sendTrialReminder,
} from "@/lib/data/trials";
import { trialDesignKinds } from "@/lib/trials/design-kind";
import { trialStatuses } from "@/lib/trials/lifecycle";
import { timelineProblems } from "@/lib/trials/timeline";
import { contaminatedHandlings } from "@/lib/trials/contaminated-handling";
import { count } from "@/lib/words";

const optionalNumber = (what: string, check: z.ZodNumber) =>
  z
    .string()
    .trim()
    .transform((value, context) => {
      if (value === "") return null;
      const number = Number(value.replace(",", "."));
      const parsed = check.safeParse(number);
      if (!parsed.success) {
        context.addIssue({ code: "custom", message: `${what}: "${value}" ${parsed.error.issues[0]?.message ?? "is not a number"}` });
        return z.NEVER;
      }
      return parsed.data;
    });

const armSchema = z.object({
  label: z.string().trim().min(1, "Give every arm a short label, e.g. A or Across.").max(20, "Keep arm labels to 20 characters."),
  strainId: z.uuid("Pick a strain for every arm."),
  treatmentId: z.union([z.uuid(), z.literal("")]).transform((value) => value || null),
  isReference: z.boolean(),
});

const optionalDate = (what: string) =>
  z.union([z.iso.date(`Give the ${what} as a date, e.g. 2027-03-01.`), z.literal("")]).transform((value) => value || null);

const trialDesignSchema = z
  .object({
    trialId: z
      .union([z.uuid(), z.literal("")])
      .optional()
      .transform((value) => value || undefined),
    title: z.string().trim().min(3, "Give the trial a title of at least 3 characters.").max(160, "Keep the title under 160 characters."),
    question: z
      .string()
      .trim()
      .min(10, "Write the question in one sentence, e.g. \u201cDoes PO-02 give more BE than PO-01 over two flushes?\u201d")
      .max(400, "Keep the question to one sentence (under 400 characters)."),
    speciesId: z.uuid("Pick the species the trial is about."),
    designKind: z
      .enum(
        trialDesignKinds,
        "Say whether the arms compare one thing, cross strains with fruiting methods, or randomise rooms to climate regimes.",
      )
      .default("one_factor"),
    arms: z
      .string()
      .transform((value, context) => {
        try {
          return JSON.parse(value) as unknown;
        } catch {
          context.addIssue({ code: "custom", message: "The arms could not be read; reload the page and try again." });
          return z.NEVER;
        }
      })
      .pipe(
        z
          .array(armSchema)
          .min(2, "A trial compares at least 2 arms; add another arm.")
          .max(8, "Keep a trial to 8 arms or fewer; each arm needs its own blocks on every farm.")
          .refine((arms) => arms.filter((arm) => arm.isReference).length === 1, "Mark exactly one arm as the reference.")
          .refine((arms) => new Set(arms.map((arm) => arm.label.toLowerCase())).size === arms.length, "Give each arm a different label."),
      ),
    outcomeFlushes: z.coerce
      .number()
      .int("Flushes must be a whole number.")
      .min(1, "Count at least flush 1.")
      .max(6, "Count at most 6 flushes."),
    contaminatedHandling: z.enum(contaminatedHandlings, "Say whether contaminated blocks are left out or count as zero."),
    protocolNotes: z.string().trim().max(4000, "Keep protocol notes under 4000 characters."),
    enrolmentDeadline: z
      .union([z.iso.date("Give the deadline as a date, e.g. 2027-01-15."), z.literal("")])
      .transform((value) => value || null),
    inoculationFrom: optionalDate("first day of inoculation"),
    inoculationTo: optionalDate("last day of inoculation"),
    fruitingFrom: optionalDate("first day fruiting is expected"),
    fruitingTo: optionalDate("last day fruiting is expected"),
    dataDue: optionalDate("date the data are due"),
    smallestDifference: optionalNumber(
      "Smallest difference",
      z.number().gt(0, "must be above 0 BE points").lt(500, "must be below 500 BE points"),
    ),
    expectedSd: optionalNumber(
      "Spread between blocks",
      z.number().gt(0, "must be above 0 BE points").lt(500, "must be below 500 BE points"),
    ),
    plannedFarms: optionalNumber(
      "Planned farms",
      z.number().int("must be a whole number").min(1, "must be 1 or more").max(100, "must be 100 or fewer"),
    ),
    expectedLossPercent: optionalNumber("Expected loss", z.number().min(0, "must be 0 % or more").lt(100, "must be below 100 %")),
    blocksPerRoom: optionalNumber(
      "Blocks per room",
      z.number().int("must be a whole number").min(1, "must be 1 or more").max(1000, "must be 1000 or fewer"),
    )
      .optional()
      .transform((value) => value ?? null),
    roomIcc: optionalNumber("How alike blocks in a room are", z.number().min(0, "must be 0 or more").lt(1, "must be below 1"))
      .optional()
      .transform((value) => value ?? null),
    intent: z.enum(["save", "save-and-view"]).default("save"),
  })
  .superRefine((input, context) => {
    for (const problem of timelineProblems(input)) context.addIssue({ code: "custom", path: [problem.field], message: problem.message });
    if (input.designKind === "rooms" && input.blocksPerRoom === null) {
      context.addIssue({ code: "custom", path: ["blocksPerRoom"], message: "Give the number of blocks each room holds, e.g. 6." });
    }
    if (input.designKind === "rooms" && input.roomIcc === null) {
      context.addIssue({
        code: "custom",
        path: ["roomIcc"],
        message: "Give how alike blocks in one room are, from 0 to below 1, e.g. 0.1.",
      });
    }
  });

export const saveTrialDraftAction = guardedAction("trial:manage", trialDesignSchema, async (input, member) => {
  const { intent, expectedLossPercent, ...design } = input;
  const saved = await saveTrialDraft(member, { ...design, expectedLoss: expectedLossPercent === null ? null : expectedLossPercent / 100 });
  revalidatePath("/trials");
  if (intent === "save-and-view" || !input.trialId) redirect(`/trials/${saved.id}`);
  return { status: "ok", message: `Draft ${saved.code} saved.` };
});

export const moveTrialAction = guardedAction(
  "trial:manage",
  z
    .object({
      trialId: z.uuid(),
      to: z.enum(trialStatuses),
      // The close dialog's confirmation: the fingerprint of the incomplete counts the coordinator read (getCloseReview).
      reviewed: z
        .string()
        .regex(/^[0-9a-f]{32}$/, "Reload the trial page and confirm again.")
        .optional(),
      // Publishing: the run the coordinator picked (the newest when none is sent).
      analysisId: z.uuid("Pick the run to publish.").optional(),
    })
    .refine((input) => input.to !== "collecting" || input.reviewed, {
      path: ["reviewed"],
      message: "Tick that you have read what is still incomplete before closing the trial.",
    }),
  async ({ trialId, to, reviewed, analysisId }, member) => {
    await moveTrial(member, trialId, to, { reviewed, analysisId });
    revalidatePath(`/trials/${trialId}`);
    revalidatePath("/trials");
    return { status: "ok", message: "Done." };
  },
);

export const runAnalysisAction = guardedAction("trial:manage", z.object({ trialId: z.uuid() }), async ({ trialId }, member) => {
  const run = await runTrialAnalysis(member, trialId);
  revalidatePath(`/trials/${trialId}`);
  return { status: "ok", message: `Run ${run} of the analysis is kept. It is seen by you only until you publish it.` };
});

export const amendAnalysisAction = guardedAction(
  "trial:manage",
  z.object({
    trialId: z.uuid(),
    analysisId: z.uuid("Pick the run that corrects the published analysis."),
    reason: z.string().max(1000, "Keep the reason for the amendment under 1000 characters."),
  }),
  async ({ trialId, analysisId, reason }, member) => {
    const { version } = await amendPublishedAnalysis(member, trialId, { analysisId, reason });
    revalidatePath(`/trials/${trialId}`);
    return { status: "ok", message: `Published as version ${version}, above the earlier version, which stays readable.` };
  },
);

export const inviteFarmsAction = guardedAction("trial:manage", z.looseObject({ trialId: z.uuid() }), async (input, member) => {
  const farmIds = Object.keys(input)
    .filter((key) => key.startsWith("farm:"))
    .map((key) => key.slice(5));
  if (!farmIds.length)
    return { status: "error", message: "Tick at least one farm to invite.", fieldErrors: { farms: ["Tick at least one farm to invite."] } };
  const sent = await inviteFarms(member, input.trialId, farmIds);
  revalidatePath(`/trials/${input.trialId}`);
  return {
    status: "ok",
    message: `Invited ${count(farmIds.length, "farm")}; ${count(sent, "e-mail")} sent.`,
  };
});

export const askToJoinTrialAction = guardedAction("trial:enrol", z.object({ trialId: z.uuid() }), async (input, member) => {
  await askToJoinTrial(member, input.trialId);
  revalidatePath(`/trials/${input.trialId}`);
  return { status: "ok", message: "Your farm is on the list. Accept with your blocks per arm to get your randomised list." };
});

export const respondToInvitationAction = guardedAction(
  "trial:enrol",
  // A room-level trial's form has one checkbox per fruiting room, named "room:<id>".
  z
    .looseObject({
      trialId: z.uuid(),
      answer: z.enum(["accept", "decline"]),
      blocksPerArm: z.string().optional(),
      roomDraw: z.literal("yes").optional(),
    })
    .transform((input, context) => {
      const base = { trialId: input.trialId, answer: input.answer };
      if (input.answer === "decline") return { ...base, blocksPerArm: null, roomIds: undefined };
      if (input.roomDraw) {
        const roomIds = Object.keys(input)
          .filter((key) => key.startsWith("room:"))
          .map((key) => key.slice("room:".length));
        if (roomIds.some((id) => !z.uuid().safeParse(id).success) || !roomIds.length) {
          context.addIssue({
            code: "custom",
            path: ["roomIds"],
            message: "Pick the fruiting rooms that take part, at least one for each arm.",
          });
          return z.NEVER;
        }
        return { ...base, blocksPerArm: null, roomIds };
      }
      const number = Number(input.blocksPerArm);
      if (!Number.isInteger(number) || number < 1 || number > 200) {
        context.addIssue({
          code: "custom",
          path: ["blocksPerArm"],
          message: `Blocks per arm: "${input.blocksPerArm ?? ""}" must be a whole number from 1 to 200.`,
        });
        return z.NEVER;
      }
      return { ...base, blocksPerArm: number, roomIds: undefined };
    }),
  async (input, member) => {
    await respondToInvitation(member, input.trialId, {
      accept: input.answer === "accept",
      blocksPerArm: input.blocksPerArm,
      roomIds: input.roomIds,
    });
    revalidatePath(`/trials/${input.trialId}`);
    return {
      status: "ok",
      message: input.answer === "accept" ? "Your farm is enrolled; your list is ready." : "You declined the invitation.",
    };
  },
);

export const sendReminderAction = guardedAction(
  "trial:manage",
  z.object({ trialId: z.uuid(), farmId: z.uuid() }),
  async ({ trialId, farmId }, member) => {
    const sent = await sendTrialReminder(member, trialId, farmId);
    return { status: "ok", message: `Reminder sent to ${count(sent, "farm manager")}.` };
  },
);
