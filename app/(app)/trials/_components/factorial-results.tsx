import { Card } from "@/components/ui/card";
import type { FactorialComparison, FactorialTrialAnalysis } from "@/lib/trials/factorial";
import { count } from "@/lib/words";

const fmt = (value: number, digits = 1) => value.toFixed(digits);
const pText = (p: number) => (p < 0.001 ? "< 0.001" : fmt(p, 3));
const capitalised = (text: string) => text[0].toUpperCase() + text.slice(1);

/** One row of a table of differences: "B − A", the difference, its interval and its adjusted p. */
export function DifferenceRow({
  label,
  difference,
  bold = false,
}: {
  label: string;
  difference: { estimate: number; lower: number; upper: number; pAdjusted: number };
  bold?: boolean;
}) {
  return (
    <tr className="border-t border-oat-300">
      <th scope="row" className={`py-2 text-left ${bold ? "" : "font-normal"}`}>
        {label}
      </th>
      <td>{fmt(difference.estimate)}</td>
      <td>
        {fmt(difference.lower)} to {fmt(difference.upper)}
      </td>
      <td>{pText(difference.pAdjusted)}</td>
    </tr>
  );
}

function ComparisonRows({ rows }: { rows: FactorialComparison[] }) {
  return (
    <>
      {rows.map((row) => (
        <DifferenceRow key={`${row.levelId}-${row.versusId}`} label={`${row.level} − ${row.versus}`} difference={row} />
      ))}
    </>
  );
}

function ComparisonTable({ caption, groups }: { caption: string; groups: { heading?: string; rows: FactorialComparison[] }[] }) {
  return (
    <table className="w-full text-sm [&_td]:pr-3 [&_th]:pr-3">
      <caption className="mb-2 text-left text-ink-soft">{caption}</caption>
      <thead>
        <tr className="text-left">
          <th scope="col" className="py-1">
            Difference
          </th>
          <th scope="col">BE points</th>
          <th scope="col">95 % interval</th>
          <th scope="col">p (adjusted)</th>
        </tr>
      </thead>
      {groups.map((group, index) => (
        <tbody key={group.heading ?? index}>
          {group.heading ? (
            <tr>
              <th scope="rowgroup" colSpan={4} className="pt-3 text-left font-semibold">
                {group.heading}
              </th>
            </tr>
          ) : null}
          <ComparisonRows rows={group.rows} />
        </tbody>
      ))}
    </table>
  );
}

/**
 * A crossed trial's own figures: the two factors and their interaction (type II, farms as blocks),
 * each combination's farm-adjusted mean, each factor averaged over the other, and, when the best
 * level of one depends on the other, each compared within the other's levels.
 */
export function FactorialResults({ factorial }: { factorial: FactorialTrialAnalysis }) {
  const { anova } = factorial;
  if (!anova) return null;
  const [first, second] = factorial.factors;
  const secondLevels = [...new Set(factorial.cellMeans.map((cell) => cell.levels[1]))];
  const firstLevels = [...new Set(factorial.cellMeans.map((cell) => cell.levels[0]))];
  const terms: [string, typeof anova.first][] = [
    [capitalised(first), anova.first],
    [capitalised(second), anova.second],
    [`${capitalised(first)} × ${second}`, anova.interaction],
    ["Farm", anova.farm],
  ];
  return (
    <div className="space-y-6" data-testid="factorial-results">
      <Card title={`Does the ${first} matter, does the ${second}, and does one depend on the other?`}>
        <table className="w-full text-sm [&_td]:pr-3 [&_th]:pr-3" data-testid="factorial-anova">
          <caption className="mb-2 text-left text-ink-soft">
            BE ~ {first} + {second} + {first} × {second} + farm, each term adjusted for the others that do not contain it (type II sums of
            squares). The interaction counts as material below p = {fmt(factorial.interactionLevel, 2)}, decided before the trial.
          </caption>
          <thead>
            <tr className="text-left">
              <th scope="col" className="py-1">
                Term
              </th>
              <th scope="col">df</th>
              <th scope="col">F</th>
              <th scope="col">p</th>
            </tr>
          </thead>
          <tbody>
            {terms.map(([name, term]) => (
              <tr key={name} className="border-t border-oat-300">
                <th scope="row" className="py-2 text-left font-normal">
                  {name}
                </th>
                <td>{term.df}</td>
                <td>{fmt(term.f, 2)}</td>
                <td>{pText(term.p)}</td>
              </tr>
            ))}
            <tr className="border-t border-oat-300">
              <th scope="row" className="py-2 text-left font-normal">
                Residual
              </th>
              <td>{anova.residual.df}</td>
              <td />
              <td />
            </tr>
          </tbody>
        </table>
      </Card>
      <Card title={`Farm-adjusted mean BE (%) of each ${first} with each ${second}`}>
        <div className="overflow-x-auto">
          <table className="w-full text-sm [&_td]:pr-3 [&_th]:pr-3" data-testid="factorial-cells">
            <thead>
              <tr className="text-left">
                <th scope="col" className="py-1">
                  {capitalised(first)}
                </th>
                {secondLevels.map((level) => (
                  <th key={level} scope="col">
                    {level}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {firstLevels.map((a) => (
                <tr key={a} className="border-t border-oat-300">
                  <th scope="row" className="py-2 text-left font-normal">
                    {a}
                  </th>
                  {secondLevels.map((b) => {
                    const cell = factorial.cellMeans.find((candidate) => candidate.levels[0] === a && candidate.levels[1] === b);
                    return (
                      <td key={b}>
                        {cell ? (
                          <>
                            {fmt(cell.estimate)}{" "}
                            <span className="text-ink-soft">
                              ({fmt(cell.lower)} to {fmt(cell.upper)})
                            </span>
                            <span className="block text-xs text-ink-soft">{count(cell.blocks, "block")}</span>
                          </>
                        ) : (
                          "—"
                        )}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
      <Card title={factorial.interactionMaterial ? `Compared within each ${second}` : "Each factor averaged over the other"}>
        <div className="space-y-6">
          {factorial.interactionMaterial ? (
            <ComparisonTable
              caption={`The best ${first} depends on the ${second}, so ${first}s are compared within each ${second} (Tukey within each).`}
              groups={factorial.simpleEffects[0].map((group) => ({ heading: `With ${group.within}`, rows: group.comparisons }))}
            />
          ) : null}
          <ComparisonTable
            caption={`${capitalised(first)}s compared, each averaged over the ${second}s with equal weight (Tukey).${factorial.interactionMaterial ? " Read with care: the difference depends on the " + second + "." : ""}`}
            groups={[{ rows: factorial.mainEffects[0] }]}
          />
          <ComparisonTable
            caption={`${capitalised(second)}s compared, each averaged over the ${first}s with equal weight (Tukey).`}
            groups={[{ rows: factorial.mainEffects[1] }]}
          />
        </div>
      </Card>
    </div>
  );
}
