import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import type { CautionKey } from "@/lib/cautions";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { listRegistries } from "@/lib/data/registries";
import { registryColumns, registryKinds, registryLabels, type RegistryKind } from "@/lib/members/registry-csv";
import { ActionForm, type FormFieldSpec } from "@/components/forms/action-form";
import { addRegistryEntryAction, importRegistryAction, moveRegistryEntryAction } from "./actions";
import { ScrollFrame } from "@/components/ui/scroll-frame";

export const metadata: Metadata = { title: "Strains" };

// The trade's cautions beside the registries whose work they concern.
const sectionCautions: Partial<Record<RegistryKind, CautionKey>> = { substrate_recipes: "sterilisers", treatments: "humidifiers" };

const statusLabels = { proposed: "Waiting for approval", active: "In use", retired: "Retired" } as const;
const sourceLabels = { culture_bank: "Culture bank", wild_clone: "Wild clone", own_isolate: "Own isolate" } as const;
// "humidity" entries are the co-op's climate regime kinds: how a fruiting room's humidity is run (issue #18).
const kindLabels = { fruiting_method: "Fruiting method", humidity: "Climate regime", other: "Other" } as const;

interface Entry {
  id: string;
  status: keyof typeof statusLabels;
  cells: string[];
  /** Used by recorded blocks or a trial: it can be retired but not deleted. */
  inUse: boolean;
}

function RegistryTable({ kind, headers, entries, manage }: { kind: RegistryKind; headers: string[]; entries: Entry[]; manage: boolean }) {
  if (entries.length === 0) return <p className="text-ink-soft">Nothing in this registry yet.</p>;
  return (
    <ScrollFrame label={registryLabels[kind]} className="rounded-lg border border-oat-300 bg-white">
      <table className="min-w-full text-sm">
        <caption className="sr-only">{registryLabels[kind]}</caption>
        <thead className="bg-oat-200 text-left">
          <tr>
            {[...headers, "Status", ...(manage ? ["Change"] : [])].map((header) => (
              <th key={header} scope="col" className="px-3 py-2">
                {header}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {entries.map((entry) => (
            <tr key={entry.id} className="border-t border-oat-200 align-top">
              {entry.cells.map((cell, index) => (
                <td key={index} className="px-3 py-2">
                  {cell}
                </td>
              ))}
              <td className="px-3 py-2">{statusLabels[entry.status]}</td>
              {manage ? (
                <td className="px-3 py-2">
                  <div className="flex flex-wrap gap-2">
                    {entry.status === "proposed" ? (
                      <ActionForm
                        action={moveRegistryEntryAction}
                        inline
                        hidden={{ kind, id: entry.id, move: "approve" }}
                        submitLabel="Approve"
                      />
                    ) : null}
                    {entry.status === "active" ? (
                      <ActionForm
                        action={moveRegistryEntryAction}
                        inline
                        hidden={{ kind, id: entry.id, move: "retire" }}
                        submitLabel="Retire"
                        variant="secondary"
                      />
                    ) : null}
                    {entry.status === "retired" ? (
                      <ActionForm
                        action={moveRegistryEntryAction}
                        inline
                        hidden={{ kind, id: entry.id, move: "reinstate" }}
                        submitLabel="Reinstate"
                        variant="secondary"
                      />
                    ) : null}
                    {entry.inUse ? (
                      <span className="self-center text-xs text-ink-soft">In use by blocks or a trial, so it cannot be deleted.</span>
                    ) : (
                      <ActionForm
                        action={moveRegistryEntryAction}
                        inline
                        hidden={{ kind, id: entry.id, move: "delete" }}
                        submitLabel={entry.status === "proposed" ? "Turn down" : "Delete"}
                        variant="danger"
                        confirm={`${entry.status === "proposed" ? "Turn down" : "Delete"} ${entry.cells[0]}?`}
                      />
                    )}
                  </div>
                </td>
              ) : null}
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollFrame>
  );
}

export default async function StrainsPage() {
  const member = await requirePage("registry:read");
  const manage = can(member.role, "registry:manage");
  const propose = can(member.role, "registry:propose");
  const registries = await listRegistries(member);
  const activeSpecies = registries.species.filter((row) => row.status === "active");
  const addLabel = manage ? "Add" : "Propose";

  const forms: Record<RegistryKind, FormFieldSpec[]> = {
    species: [
      { name: "scientificName", label: "Scientific name" },
      { name: "commonName", label: "Common name" },
    ],
    strains: [
      { name: "code", label: "Co-op code", hint: "e.g. PO-04" },
      {
        name: "species",
        label: "Species",
        options: activeSpecies.map((row) => ({ value: row.id, label: `${row.commonName} (${row.scientificName})` })),
      },
      { name: "name", label: "Strain name" },
      {
        name: "source",
        label: "Where the culture came from",
        options: Object.entries(sourceLabels).map(([value, label]) => ({ value, label })),
      },
      { name: "notes", label: "Notes" },
    ],
    substrate_recipes: [
      { name: "code", label: "Co-op code", hint: "e.g. HWB-30 (the co-op has HWB-20)" },
      { name: "name", label: "Recipe name" },
      { name: "base", label: "Base", hint: "e.g. hardwood sawdust" },
      { name: "supplement", label: "Supplement", hint: "e.g. wheat bran" },
      { name: "supplementPercent", label: "Supplement (%)", defaultValue: "0" },
      { name: "targetMoisture", label: "Target moisture (%, wet basis)", hint: "e.g. 62" },
      {
        name: "treatment",
        label: "Treatment",
        options: [
          { value: "sterilised", label: "Sterilised" },
          { value: "pasteurised", label: "Pasteurised" },
        ],
      },
    ],
    treatments: [
      { name: "code", label: "Co-op code", hint: "e.g. X-CUT" },
      { name: "name", label: "Name" },
      {
        name: "treatmentKind",
        label: "Kind",
        options: Object.entries(kindLabels).map(([value, label]) => ({ value, label })),
        hint: "A climate regime is a way of running a fruiting room's humidity, e.g. “Misted all day” or “Soaked once a day”; farms pick one when they record a room's regime.",
      },
      { name: "description", label: "How it is done" },
    ],
  };

  const sections: { kind: RegistryKind; headers: string[]; entries: Entry[] }[] = [
    {
      kind: "species",
      headers: ["Common name", "Scientific name"],
      entries: registries.species.map((row) => ({
        id: row.id,
        status: row.status,
        inUse: row.inUse,
        cells: [row.commonName, row.scientificName],
      })),
    },
    {
      kind: "strains",
      headers: ["Code", "Name", "Species", "Source", "Blocks in the co-op's results", "Notes"],
      entries: registries.strains.map((row) => ({
        id: row.id,
        status: row.status,
        inUse: row.inUse,
        cells: [
          row.code,
          row.name,
          row.speciesName,
          sourceLabels[row.source],
          row.blocks.status === "published" ? String(row.blocks.value) : row.blocks.message,
          row.notes,
        ],
      })),
    },
    {
      kind: "substrate_recipes",
      headers: ["Code", "Name", "Base", "Supplement", "Target moisture", "Treatment"],
      entries: registries.substrateRecipes.map((row) => ({
        id: row.id,
        status: row.status,
        inUse: row.inUse,
        cells: [
          row.code,
          row.name,
          row.base,
          row.supplement ? `${row.supplement} ${row.supplementPercent} %` : "None",
          `${Math.round(row.targetMoisture * 1000) / 10} %`,
          row.treatment === "sterilised" ? "Sterilised" : "Pasteurised",
        ],
      })),
    },
    {
      kind: "treatments",
      headers: ["Code", "Name", "Kind", "How it is done"],
      entries: registries.treatments.map((row) => ({
        id: row.id,
        status: row.status,
        inUse: row.inUse,
        cells: [row.code, row.name, kindLabels[row.kind], row.description],
      })),
    },
  ];

  return (
    <>
      <PageHeader
        title="Strains"
        lead={
          manage
            ? "The co-op's registries. Farms propose entries; you approve them. An entry that blocks or a trial use can be retired but not deleted, so past records keep it."
            : propose
              ? "The co-op's registries. Missing a strain, recipe, fruiting method or climate regime? Propose it; the coordinator approves it."
              : "The co-op's registries of species, strains, substrate recipes, fruiting methods and climate regimes."
        }
      />
      <div className="space-y-10">
        {sections.map((section) => (
          <section key={section.kind} aria-labelledby={`${section.kind}-heading`}>
            <h2 id={`${section.kind}-heading`} className="mb-3 text-xl font-semibold text-moss-800">
              {registryLabels[section.kind]}
            </h2>
            {sectionCautions[section.kind] ? (
              <div className="mb-3">
                <Caution which={sectionCautions[section.kind]!} />
              </div>
            ) : null}
            <RegistryTable kind={section.kind} headers={section.headers} entries={section.entries} manage={manage} />
            {manage || propose ? (
              <details className="mt-3 rounded-lg border border-oat-300 bg-white p-4">
                <summary className="min-h-11 cursor-pointer content-center font-semibold text-moss-700">
                  {addLabel}{" "}
                  {section.kind === "species"
                    ? "a species"
                    : section.kind === "strains"
                      ? "a strain"
                      : section.kind === "substrate_recipes"
                        ? "a substrate recipe"
                        : "a fruiting method, climate regime or other treatment"}
                </summary>
                <div className="mt-3 max-w-lg">
                  <ActionForm
                    action={addRegistryEntryAction}
                    testId={`add-${section.kind}`}
                    hidden={{ kind: section.kind }}
                    fields={forms[section.kind]}
                    submitLabel={addLabel}
                  />
                </div>
              </details>
            ) : null}
          </section>
        ))}
        {manage ? (
          <Card title="Import a registry from CSV">
            <p className="mb-3 text-sm text-ink-soft">
              For a co-op that starts with a list of its own. All rows go in, or none do; every problem names its line and column. Columns:{" "}
              {registryKinds
                .map(
                  (kind) => `${registryLabels[kind]}: ${[...registryColumns[kind].required, ...registryColumns[kind].optional].join(", ")}`,
                )
                .join(" · ")}
              .
            </p>
            <ActionForm
              action={importRegistryAction}
              testId="import-registry"
              submitLabel="Import"
              pendingLabel="Importing…"
              fields={[
                { name: "kind", label: "Registry", options: registryKinds.map((kind) => ({ value: kind, label: registryLabels[kind] })) },
                { name: "file", label: "CSV file", type: "file" },
              ]}
            />
          </Card>
        ) : null}
      </div>
    </>
  );
}
