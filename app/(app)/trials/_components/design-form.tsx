"use client";

import { startTransition, useActionState, useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { WordsExplained } from "@/components/ui/words-explained";
import type { ActionState } from "@/lib/auth/guard";
import type { TrialDesignKind } from "@/lib/trials/design-kind";
import { crossedArms, crossedArmsProblems } from "@/lib/trials/factorial";
import { roomArmsProblems, roomTrialSampleSize } from "@/lib/trials/room-design";
import { trialSampleSize } from "@/lib/trials/sample-size";
import { saveTrialDraftAction } from "../actions";

interface Option {
  id: string;
  name: string;
}

export interface DesignOptions {
  species: Option[];
  strains: { id: string; code: string; name: string; speciesId: string }[];
  treatments: { id: string; name: string; kind: string }[];
  spreadBySpecies: Record<string, { sd: number; blocks: number; farms: number }>;
  /** The co-op's own intraclass correlation of BE within rooms, per species, from the newest release. */
  roomIccBySpecies: Record<string, { icc: number; farms: number; rooms: number }>;
  /** The co-op's minimum number of farms: a trial cannot start with fewer. */
  minimumFarms: number;
}

export interface DesignValues {
  trialId?: string;
  title: string;
  question: string;
  speciesId: string;
  designKind: TrialDesignKind;
  arms: { label: string; strainId: string; treatmentId: string; isReference: boolean }[];
  outcomeFlushes: number;
  contaminatedHandling: "exclude" | "count_as_zero";
  protocolNotes: string;
  enrolmentDeadline: string;
  inoculationFrom: string;
  inoculationTo: string;
  fruitingFrom: string;
  fruitingTo: string;
  dataDue: string;
  smallestDifference: string;
  expectedSd: string;
  plannedFarms: string;
  expectedLossPercent: string;
  blocksPerRoom: string;
  roomIcc: string;
}

const inputClass =
  "block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 py-2 text-base text-ink shadow-inner focus:border-moss-600";

function Errors({ name, errors }: { name: string; errors?: string[] }) {
  if (!errors?.length) return null;
  return (
    <ul id={`${name}-errors`} className="text-sm text-danger-ink">
      {errors.map((error) => (
        <li key={error}>{error}</li>
      ))}
    </ul>
  );
}

const toNumber = (value: string) => (value.trim() === "" ? Number.NaN : Number(value.replace(",", ".")));

/** The coordinator's trial design, saved as a draft; the sample-size panel follows every keystroke. */
const timelineFields = [
  ["inoculationFrom", "Inoculation from"],
  ["inoculationTo", "Inoculation to"],
  ["fruitingFrom", "Fruiting expected from"],
  ["fruitingTo", "Fruiting expected to"],
  ["dataDue", "Data due"],
] as const;

export function DesignForm({ options, initial }: { options: DesignOptions; initial: DesignValues }) {
  const [state, formAction, pending] = useActionState<ActionState, FormData>(saveTrialDraftAction, { status: "idle" });
  const [speciesId, setSpeciesId] = useState(initial.speciesId);
  const [arms, setArms] = useState(initial.arms);
  const [designKind, setDesignKind] = useState<TrialDesignKind>(initial.designKind);
  // A crossed design is kept as the strains and methods picked; its arms follow from them.
  const [crossedStrains, setCrossedStrains] = useState(() =>
    initial.designKind === "strain_by_method" ? [...new Set(initial.arms.map((arm) => arm.strainId))] : [],
  );
  const [crossedMethods, setCrossedMethods] = useState(() =>
    initial.designKind === "strain_by_method" ? [...new Set(initial.arms.map((arm) => arm.treatmentId))] : [],
  );
  const [difference, setDifference] = useState(initial.smallestDifference);
  const [sd, setSd] = useState(initial.expectedSd);
  const [sdTouched, setSdTouched] = useState(initial.expectedSd !== "");
  const [farms, setFarms] = useState(initial.plannedFarms);
  const [loss, setLoss] = useState(initial.expectedLossPercent);
  const [blocksPerRoom, setBlocksPerRoom] = useState(initial.blocksPerRoom);
  const [roomIcc, setRoomIcc] = useState(initial.roomIcc || (options.roomIccBySpecies[initial.speciesId]?.icc.toFixed(2) ?? ""));
  const [iccTouched, setIccTouched] = useState(initial.roomIcc !== "");
  const errors = state.fieldErrors ?? {};
  const armErrors = Object.entries(errors)
    .filter(([field]) => field.startsWith("arms"))
    .flatMap(([, messages]) => messages);

  const speciesStrains = options.strains.filter((strain) => strain.speciesId === speciesId);
  const spread = options.spreadBySpecies[speciesId];
  const panel = useMemo(
    () =>
      trialSampleSize({
        difference: toNumber(difference),
        sd: toNumber(sd),
        plannedFarms: toNumber(farms),
        expectedLoss: toNumber(loss) / 100,
        arms: arms.length,
        crossing: designKind === "strain_by_method" ? { methods: crossedMethods.length, strains: crossedStrains.length } : null,
      }),
    [difference, sd, farms, loss, arms.length, designKind, crossedMethods.length, crossedStrains.length],
  );
  const roomPanel = useMemo(
    () =>
      roomTrialSampleSize({
        difference: toNumber(difference),
        sd: toNumber(sd),
        plannedFarms: toNumber(farms),
        expectedLoss: toNumber(loss) / 100,
        arms: arms.length,
        blocksPerRoom: toNumber(blocksPerRoom),
        icc: toNumber(roomIcc),
      }),
    [difference, sd, farms, loss, arms.length, blocksPerRoom, roomIcc],
  );
  const pooledIcc = options.roomIccBySpecies[speciesId];
  const fruitingMethods = options.treatments.filter((treatment) => treatment.kind === "fruiting_method");
  const climateRegimes = options.treatments.filter((treatment) => treatment.kind === "humidity");
  const roomProblems =
    designKind === "rooms"
      ? roomArmsProblems(
          arms.map((arm) => ({ ...arm, treatmentId: arm.treatmentId || null })),
          options.treatments,
        )
      : [];
  const crossingProblems =
    designKind === "strain_by_method"
      ? crossedArmsProblems(
          arms.map((arm) => ({ ...arm, treatmentId: arm.treatmentId || null })),
          options.strains.map((strain) => ({ id: strain.id, name: `${strain.code} ${strain.name}` })),
          options.treatments,
        )
      : [];

  function cross(strainIds: string[], methodIds: string[]) {
    setCrossedStrains(strainIds);
    setCrossedMethods(methodIds);
    // Keep the reference on the same combination when it is still there.
    const reference = arms.find((arm) => arm.isReference);
    const made = crossedArms(strainIds, methodIds).map((arm) => ({ ...arm, treatmentId: arm.treatmentId ?? "" }));
    const keep = made.findIndex((arm) => arm.strainId === reference?.strainId && arm.treatmentId === reference?.treatmentId);
    setArms(keep > 0 ? made.map((arm, index) => ({ ...arm, isReference: index === keep })) : made);
  }

  function chooseDesignKind(kind: TrialDesignKind) {
    setDesignKind(kind);
    if (kind === "strain_by_method") {
      const strainIds = [...new Set(arms.map((arm) => arm.strainId).filter(Boolean))];
      const methodIds = [...new Set(arms.map((arm) => arm.treatmentId).filter((id) => fruitingMethods.some((method) => method.id === id)))];
      cross(strainIds, methodIds);
    }
  }

  const toggle = (list: string[], id: string, on: boolean) =>
    on ? [...list.filter((item) => item !== id), id] : list.filter((item) => item !== id);
  const humidityArm = arms.some((arm) => options.treatments.find((treatment) => treatment.id === arm.treatmentId)?.kind === "humidity");

  function chooseSpecies(id: string) {
    setSpeciesId(id);
    if (designKind === "strain_by_method") {
      cross(
        crossedStrains.filter((strainId) => options.strains.some((strain) => strain.id === strainId && strain.speciesId === id)),
        crossedMethods,
      );
      return;
    }
    setArms((current) =>
      current.map((arm) => ({
        ...arm,
        strainId: options.strains.some((strain) => strain.id === arm.strainId && strain.speciesId === id) ? arm.strainId : "",
      })),
    );
    const prefill = options.spreadBySpecies[id];
    if (prefill && !sdTouched) setSd(prefill.sd.toFixed(1));
    const iccPrefill = options.roomIccBySpecies[id];
    if (iccPrefill && !iccTouched) setRoomIcc(iccPrefill.icc.toFixed(2));
  }

  function updateArm(index: number, change: Partial<DesignValues["arms"][number]>) {
    setArms((current) =>
      current.map((arm, position) => {
        if (change.isReference) return { ...arm, ...(position === index ? change : {}), isReference: position === index };
        return position === index ? { ...arm, ...change } : arm;
      }),
    );
  }

  return (
    <form
      onSubmit={(event) => {
        // Sent by hand rather than through the form's action: React resets a form after its action,
        // which would empty the title, question and notes the coordinator typed when the server refuses the design.
        event.preventDefault();
        const data = new FormData(event.currentTarget, event.nativeEvent.submitter);
        startTransition(() => formAction(data));
      }}
      className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]"
      aria-describedby={state.status === "error" ? "design-message" : undefined}
    >
      <input type="hidden" name="trialId" value={initial.trialId ?? ""} />
      <input type="hidden" name="arms" value={JSON.stringify(arms)} />
      <input type="hidden" name="designKind" value={designKind} />
      <div className="space-y-6">
        {state.status !== "idle" && state.message ? (
          <Notice tone={state.status === "error" ? "danger" : "info"} id="design-message">
            <p>{state.message}</p>
            {errors.form?.map((error) => (
              <p key={error}>{error}</p>
            ))}
          </Notice>
        ) : null}
        <Card title="The question">
          <div className="space-y-4">
            <Field label="Title" name="title" defaultValue={initial.title} errors={errors.title} required />
            <div className="space-y-1">
              <label htmlFor="question" className="block text-sm font-medium text-ink">
                The question, in one sentence
              </label>
              <textarea
                id="question"
                name="question"
                defaultValue={initial.question}
                rows={2}
                className={inputClass}
                aria-describedby={errors.question ? "question-errors" : undefined}
                aria-invalid={errors.question ? true : undefined}
              />
              <Errors name="question" errors={errors.question} />
            </div>
            <div className="space-y-1">
              <label htmlFor="speciesId" className="block text-sm font-medium text-ink">
                Species
              </label>
              <select
                id="speciesId"
                name="speciesId"
                value={speciesId}
                onChange={(event) => chooseSpecies(event.target.value)}
                className={inputClass}
                aria-describedby={errors.speciesId ? "speciesId-errors" : undefined}
              >
                <option value="">Pick a species…</option>
                {options.species.map((option) => (
                  <option key={option.id} value={option.id}>
                    {option.name}
                  </option>
                ))}
              </select>
              <Errors name="speciesId" errors={errors.speciesId} />
            </div>
          </div>
        </Card>

        <Card title="Arms">
          <fieldset className="mb-4 space-y-1" data-testid="design-kind">
            <legend className="mb-1 text-sm font-medium text-ink">What the arms compare</legend>
            <label className="flex min-h-11 items-start gap-3 text-sm">
              <input
                type="radio"
                name="design-kind-choice"
                checked={designKind === "one_factor"}
                onChange={() => chooseDesignKind("one_factor")}
                className="mt-0.5 h-5 w-5 shrink-0"
              />
              <span>One thing at a time: each arm is a strain, or a strain with a treatment, compared with the reference arm.</span>
            </label>
            <label className="flex min-h-11 items-start gap-3 text-sm">
              <input
                type="radio"
                name="design-kind-choice"
                checked={designKind === "strain_by_method"}
                onChange={() => chooseDesignKind("strain_by_method")}
                className="mt-0.5 h-5 w-5 shrink-0"
              />
              <span>
                Strains crossed with fruiting methods: every strain picked is grown with every method picked, one arm each. The report then
                says whether the method matters, whether the strain does, and whether the best method depends on the strain.
              </span>
            </label>
            <label className="flex min-h-11 items-start gap-3 text-sm">
              <input
                type="radio"
                name="design-kind-choice"
                checked={designKind === "rooms"}
                onChange={() => chooseDesignKind("rooms")}
                className="mt-0.5 h-5 w-5 shrink-0"
              />
              <span>
                Rooms randomised to climate regimes: each arm is a way of running a fruiting room. Each farm&apos;s rooms, not its blocks,
                are drawn at random to the arms, and every block in a room is in that room&apos;s arm. The analysis compares room means with
                each farm as a block.
              </span>
            </label>
          </fieldset>
          {designKind === "strain_by_method" ? (
            <div className="space-y-4" data-testid="crossed-design">
              <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
                <fieldset className="space-y-1">
                  <legend className="mb-1 text-sm font-medium">Strains</legend>
                  {speciesStrains.length === 0 ? (
                    <p className="text-sm text-ink-soft">{speciesId ? "This species has no active strain." : "Pick the species first."}</p>
                  ) : null}
                  {speciesStrains.map((strain) => (
                    <label key={strain.id} className="flex min-h-11 items-center gap-3 text-sm">
                      <input
                        type="checkbox"
                        checked={crossedStrains.includes(strain.id)}
                        onChange={(event) => cross(toggle(crossedStrains, strain.id, event.target.checked), crossedMethods)}
                        className="h-5 w-5"
                      />
                      {strain.code} — {strain.name}
                    </label>
                  ))}
                </fieldset>
                <fieldset className="space-y-1">
                  <legend className="mb-1 text-sm font-medium">Fruiting methods</legend>
                  {fruitingMethods.length === 0 ? (
                    <p className="text-sm text-ink-soft">No fruiting method is in the registry yet; propose one first.</p>
                  ) : null}
                  {fruitingMethods.map((method) => (
                    <label key={method.id} className="flex min-h-11 items-center gap-3 text-sm">
                      <input
                        type="checkbox"
                        checked={crossedMethods.includes(method.id)}
                        onChange={(event) => cross(crossedStrains, toggle(crossedMethods, method.id, event.target.checked))}
                        className="h-5 w-5"
                      />
                      {method.name}
                    </label>
                  ))}
                </fieldset>
              </div>
              {arms.length ? (
                <table className="w-full text-sm" data-testid="crossed-arms">
                  <caption className="mb-2 text-left text-ink-soft">
                    {arms.length} arms, one per combination. The reference is the combination the others are compared with, e.g. your usual
                    strain and method.
                  </caption>
                  <thead>
                    <tr className="text-left">
                      <th scope="col" className="py-1">
                        Arm
                      </th>
                      <th scope="col">Strain</th>
                      <th scope="col">Fruiting method</th>
                      <th scope="col">Reference</th>
                    </tr>
                  </thead>
                  <tbody>
                    {arms.map((arm, index) => {
                      const strain = options.strains.find((candidate) => candidate.id === arm.strainId);
                      const method = options.treatments.find((candidate) => candidate.id === arm.treatmentId);
                      return (
                        <tr key={`${arm.strainId}-${arm.treatmentId}`} className="border-t border-oat-300" data-testid="arm-row">
                          <th scope="row" className="py-2 text-left">
                            {arm.label}
                          </th>
                          <td>{strain ? `${strain.code} — ${strain.name}` : "—"}</td>
                          <td>{method?.name ?? "—"}</td>
                          <td>
                            <input
                              type="radio"
                              name="reference-arm"
                              aria-label={`Arm ${arm.label} is the reference`}
                              checked={arm.isReference}
                              onChange={() => updateArm(index, { isReference: true })}
                              className="h-5 w-5"
                            />
                          </td>
                        </tr>
                      );
                    })}
                  </tbody>
                </table>
              ) : null}
              {arms.length > 8 ? (
                <p className="text-sm text-danger-ink">
                  {arms.length} combinations is more than the 8 arms a trial can have; pick fewer strains or methods.
                </p>
              ) : null}
              {crossingProblems.length ? (
                <ul className="text-sm text-ink-soft" data-testid="crossing-problems">
                  {crossingProblems.map((problem) => (
                    <li key={problem}>{problem}</li>
                  ))}
                </ul>
              ) : null}
              {/* The server's refusal, less what the live check above already says. */}
              <Errors name="arms" errors={armErrors.filter((error) => !crossingProblems.includes(error))} />
            </div>
          ) : (
            <>
              <p className="mb-3 text-sm text-ink-soft">
                Each arm is a strain, or a strain with a treatment such as a fruiting method or humidity regime. Mark the one the others are
                compared with as the reference.
              </p>
              <fieldset className="space-y-4" aria-describedby={armErrors.length ? "arms-errors" : undefined}>
                <legend className="sr-only">Arms of the trial</legend>
                {arms.map((arm, index) => (
                  <div
                    key={index}
                    className="grid grid-cols-1 gap-3 rounded-lg border border-oat-300 p-3 sm:grid-cols-[6rem_1fr_1fr]"
                    data-testid="arm-row"
                  >
                    <div className="space-y-1">
                      <label htmlFor={`arm-${index}-label`} className="block text-sm font-medium">
                        Label
                      </label>
                      <input
                        id={`arm-${index}-label`}
                        value={arm.label}
                        onChange={(event) => updateArm(index, { label: event.target.value })}
                        className={inputClass}
                      />
                    </div>
                    <div className="space-y-1">
                      <label htmlFor={`arm-${index}-strain`} className="block text-sm font-medium">
                        Strain
                      </label>
                      <select
                        id={`arm-${index}-strain`}
                        value={arm.strainId}
                        onChange={(event) => updateArm(index, { strainId: event.target.value })}
                        className={inputClass}
                      >
                        <option value="">{speciesId ? "Pick a strain…" : "Pick the species first"}</option>
                        {speciesStrains.map((strain) => (
                          <option key={strain.id} value={strain.id}>
                            {strain.code} — {strain.name}
                          </option>
                        ))}
                      </select>
                    </div>
                    <div className="space-y-1">
                      <label htmlFor={`arm-${index}-treatment`} className="block text-sm font-medium">
                        {designKind === "rooms" ? "Climate regime" : "Treatment (optional)"}
                      </label>
                      <select
                        id={`arm-${index}-treatment`}
                        value={arm.treatmentId}
                        onChange={(event) => updateArm(index, { treatmentId: event.target.value })}
                        className={inputClass}
                      >
                        <option value="">{designKind === "rooms" ? "Pick a climate regime…" : "None"}</option>
                        {(designKind === "rooms" ? climateRegimes : options.treatments).map((treatment) => (
                          <option key={treatment.id} value={treatment.id}>
                            {treatment.name}
                          </option>
                        ))}
                      </select>
                    </div>
                    <div className="flex flex-wrap items-center gap-4 sm:col-span-3">
                      <label className="flex min-h-11 items-center gap-2 text-sm">
                        <input
                          type="radio"
                          name="reference-arm"
                          checked={arm.isReference}
                          onChange={() => updateArm(index, { isReference: true })}
                          className="h-5 w-5"
                        />
                        Reference arm
                      </label>
                      {arms.length > 2 ? (
                        <Button
                          type="button"
                          variant="secondary"
                          onClick={() => setArms((current) => current.filter((_, position) => position !== index))}
                        >
                          Remove arm {arm.label || index + 1}
                        </Button>
                      ) : null}
                    </div>
                  </div>
                ))}
                {roomProblems.length ? (
                  <ul className="text-sm text-ink-soft" data-testid="room-arm-problems">
                    {roomProblems.map((problem) => (
                      <li key={problem}>{problem}</li>
                    ))}
                  </ul>
                ) : null}
                <Errors name="arms" errors={armErrors.filter((error) => !roomProblems.includes(error))} />
                <Button
                  type="button"
                  variant="secondary"
                  disabled={arms.length >= 8}
                  onClick={() =>
                    setArms((current) => [
                      ...current,
                      { label: String.fromCharCode(65 + current.length), strainId: "", treatmentId: "", isReference: false },
                    ])
                  }
                >
                  Add an arm
                </Button>
              </fieldset>
            </>
          )}
          {humidityArm || designKind === "rooms" ? (
            <div className="mt-4">
              <Caution which="humidifiers" />
            </div>
          ) : null}
        </Card>

        <Card title="Outcome, decided in advance">
          <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
            <Field
              label="Biological efficiency over flushes 1 to"
              name="outcomeFlushes"
              type="number"
              min={1}
              max={6}
              defaultValue={initial.outcomeFlushes}
              errors={errors.outcomeFlushes}
            />
            <div className="space-y-1">
              <label htmlFor="contaminatedHandling" className="block text-sm font-medium text-ink">
                Contaminated blocks
              </label>
              <select
                id="contaminatedHandling"
                name="contaminatedHandling"
                defaultValue={initial.contaminatedHandling}
                className={inputClass}
              >
                <option value="exclude">are left out of the BE comparison</option>
                <option value="count_as_zero">count as 0 % BE</option>
              </select>
              <Errors name="contaminatedHandling" errors={errors.contaminatedHandling} />
            </div>
          </div>
          <p className="mt-3 text-sm text-ink-soft">
            The contamination rate of each arm is reported as a second outcome, with its interval.
          </p>
          <p className="mt-2 text-sm text-ink-soft">
            Every trial also leaves out, and lists in its report: unfinished blocks (not yet through the last counted flush and not marked
            spent), lost blocks (no wet mass or moisture) and blocks without a harvest in the counted flushes. A block without a harvest
            never counts as 0 % unless it is contaminated and contaminated blocks count as 0 %.
          </p>
        </Card>

        <Card title="Protocol">
          <div className="space-y-4">
            <div className="space-y-1">
              <label htmlFor="protocolNotes" className="block text-sm font-medium text-ink">
                Protocol notes
              </label>
              <textarea
                id="protocolNotes"
                name="protocolNotes"
                defaultValue={initial.protocolNotes}
                rows={4}
                className={inputClass}
                placeholder="Block mass and recipe, spawn rate, fruiting conditions…"
              />
              <Errors name="protocolNotes" errors={errors.protocolNotes} />
            </div>
            <Field
              label="Enrolment deadline"
              name="enrolmentDeadline"
              type="date"
              defaultValue={initial.enrolmentDeadline}
              errors={errors.enrolmentDeadline}
            />
          </div>
        </Card>

        <Card title="Timeline">
          <p className="mb-3 text-sm text-ink-soft">
            Farms are followed against these dates only: a farm is behind when a window has closed without what it asks for, and gets a
            reminder in the week before the data are due if something is still missing. Leave them empty and no farm is ever counted behind.
          </p>
          <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
            {timelineFields.map(([name, label]) => (
              <Field key={name} label={label} name={name} type="date" defaultValue={initial[name]} errors={errors[name]} />
            ))}
          </div>
        </Card>
        <div className="flex flex-wrap gap-3">
          <Button type="submit" name="intent" value="save" disabled={pending}>
            {pending ? "Saving…" : "Save draft"}
          </Button>
          {initial.trialId ? (
            <Button type="submit" name="intent" value="save-and-view" variant="secondary" disabled={pending}>
              Save and view the trial
            </Button>
          ) : null}
        </div>
      </div>

      <aside className="lg:sticky lg:top-6 lg:self-start">
        <Card title="How many blocks?">
          <div className="space-y-4">
            <Field
              label="Smallest difference worth finding (BE points)"
              name="smallestDifference"
              inputMode="decimal"
              value={difference}
              onChange={(event) => setDifference(event.target.value)}
              errors={errors.smallestDifference}
            />
            <Field
              label="Expected spread between blocks (SD, BE points)"
              name="expectedSd"
              inputMode="decimal"
              value={sd}
              onChange={(event) => {
                setSd(event.target.value);
                setSdTouched(true);
              }}
              hint={
                spread
                  ? `The co-op's blocks of this species vary by ${spread.sd.toFixed(1)} BE points within a farm (${spread.blocks} blocks, ${spread.farms} farms).`
                  : "No pooled figure for this species yet: give your best guess."
              }
              errors={errors.expectedSd}
            />
            <Field
              label="Farms you plan to enrol"
              name="plannedFarms"
              inputMode="numeric"
              value={farms}
              onChange={(event) => setFarms(event.target.value)}
              errors={errors.plannedFarms}
              hint={
                toNumber(farms) < options.minimumFarms
                  ? `Too few: a trial starts only once at least ${options.minimumFarms} farms have accepted (the co-op's minimum), so that its report never shows one farm's figures.`
                  : `A trial starts only once at least ${options.minimumFarms} farms have accepted (the co-op's minimum).`
              }
            />
            <Field
              label="Blocks expected to be lost (%)"
              name="expectedLossPercent"
              inputMode="decimal"
              value={loss}
              onChange={(event) => setLoss(event.target.value)}
              errors={errors.expectedLossPercent}
            />
            {designKind === "rooms" ? (
              <>
                <Field
                  label="Blocks each room holds"
                  name="blocksPerRoom"
                  inputMode="numeric"
                  value={blocksPerRoom}
                  onChange={(event) => setBlocksPerRoom(event.target.value)}
                  errors={errors.blocksPerRoom}
                />
                <Field
                  label="How alike blocks in one room are (intraclass correlation, 0 to 1)"
                  name="roomIcc"
                  inputMode="decimal"
                  value={roomIcc}
                  onChange={(event) => {
                    setRoomIcc(event.target.value);
                    setIccTouched(true);
                  }}
                  hint={
                    pooledIcc
                      ? `The co-op's own rooms of this species give ${pooledIcc.icc.toFixed(2)} (${pooledIcc.rooms} rooms on ${pooledIcc.farms} farms, within each farm and regime). 0 means a room's blocks vary as much as any; change it if you know better.`
                      : "No pooled figure for this species yet: 0.05 to 0.2 is a cautious guess; 0 would mean a room's blocks vary as much as blocks anywhere."
                  }
                  errors={errors.roomIcc}
                />
              </>
            ) : null}
            {designKind === "rooms" ? (
              <div aria-live="polite" data-testid="room-sample-size-panel">
                {roomPanel.ok ? (
                  <>
                    <p className="mb-2 text-sm">
                      Design effect 1 + ({toNumber(blocksPerRoom)} − 1) × {toNumber(roomIcc)} ={" "}
                      <span data-testid="design-effect">{roomPanel.designEffect.toFixed(2)}</span>: a room of {toNumber(blocksPerRoom)}{" "}
                      blocks tells as much as {(toNumber(blocksPerRoom) / roomPanel.designEffect).toFixed(1)} separate blocks.
                    </p>
                    <table className="w-full text-sm">
                      <caption className="mb-2 text-left text-ink-soft">
                        Rooms to randomise so that {roomPanel.pairs > 1 ? "each pair of regimes" : "the two regimes"} can be told apart on
                        room means (two-sided 5 % level{roomPanel.pairs > 1 ? `, Tukey over ${roomPanel.pairs} pairs` : ""}; farms as
                        blocks)
                      </caption>
                      <thead>
                        <tr className="text-left">
                          <th scope="col" className="py-1">
                            Power
                          </th>
                          <th scope="col">Rooms per farm per arm</th>
                          <th scope="col">Rooms per arm</th>
                          <th scope="col">Blocks per arm</th>
                        </tr>
                      </thead>
                      <tbody>
                        {roomPanel.rows.map((row) => (
                          <tr key={row.power} className="border-t border-oat-300" data-testid={`room-power-${Math.round(row.power * 100)}`}>
                            <th scope="row" className="py-2 text-left">
                              {Math.round(row.power * 100)} %
                            </th>
                            <td>{row.roomsPerFarmPerArm}</td>
                            <td data-testid="rooms-per-arm">{row.roomsPerArm}</td>
                            <td>{row.blocksPerArm}</td>
                          </tr>
                        ))}
                      </tbody>
                    </table>
                    <p className="mt-2 text-xs text-ink-soft">
                      The room-mean comparison needs {roomPanel.rows[0].exactRoomsPerArm.toFixed(1)} rooms per arm for 80 % power;
                      randomising blocks instead would need {roomPanel.rows[0].blocksPerArmIfBlocksRandomised.toFixed(1)} blocks per arm,
                      but a regime runs a whole room, so its blocks cannot be drawn one by one.
                    </p>
                    <WordsExplained terms={["design-effect", "intraclass-correlation", "room-as-unit"]} />
                  </>
                ) : (
                  <p className="text-sm text-ink-soft">{Object.values(roomPanel.problems)[0]}</p>
                )}
              </div>
            ) : null}
            <div aria-live="polite" data-testid="sample-size-panel" hidden={designKind === "rooms"}>
              {panel.ok ? (
                <table className="w-full text-sm">
                  <caption className="mb-2 text-left text-ink-soft">
                    {panel.averagedPerArm !== undefined
                      ? `Blocks to make so that two fruiting methods can be told apart within one strain (two-sided 5 % level${panel.pairs > 1 ? `, adjusted for comparing all ${panel.pairs} pairs of methods, Tukey` : ""}; farms as blocks)`
                      : panel.pairs > 1
                        ? `Blocks to make so that each pair of arms can be told apart (two-sided 5 % level, adjusted for comparing all ${panel.pairs} pairs, Tukey; farms as blocks)`
                        : "Blocks to make so that the two arms can be told apart (two-sided 5 % level; farms as blocks)"}
                  </caption>
                  <thead>
                    <tr className="text-left">
                      <th scope="col" className="py-1">
                        Power
                      </th>
                      <th scope="col">Per arm</th>
                      <th scope="col">Per farm per arm</th>
                      <th scope="col">In all</th>
                    </tr>
                  </thead>
                  <tbody>
                    {panel.rows.map((row) => (
                      <tr key={row.power} className="border-t border-oat-300" data-testid={`power-${Math.round(row.power * 100)}`}>
                        <th scope="row" className="py-2 text-left">
                          {Math.round(row.power * 100)} %
                        </th>
                        <td data-testid="per-arm">{row.perArmToMake}</td>
                        <td>{row.perFarmPerArm}</td>
                        <td>{row.totalBlocks}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              ) : (
                <p className="text-sm text-ink-soft">{Object.values(panel.problems)[0]}</p>
              )}
              {panel.ok ? (
                <p className="mt-2 text-xs text-ink-soft">
                  The farm-blocked comparison needs {panel.rows[0].exactPerArm.toFixed(1)} blocks per arm for 80 % power; the figures allow
                  for the expected loss and give every farm the same whole number. The spread is between blocks of one arm on one farm.
                  {panel.averagedPerArm !== undefined
                    ? ` Methods are compared within each strain when the best method depends on the strain; when it does not, they are compared averaged over the strains, which needs only ${panel.averagedPerArm.toFixed(1)} blocks per arm.`
                    : null}
                </p>
              ) : null}
            </div>
          </div>
        </Card>
      </aside>
    </form>
  );
}
