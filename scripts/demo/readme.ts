/** data/demo/README.md: what the demo contains and every planted problem with its expected finding. */
import { money } from "./csv.ts";
import { BUILDINGS, COMPANY_NAME, METERS, STATIONS } from "./definition.ts";
import type { PlantedProblem } from "./problems.ts";

function cell(s: string): string {
  return s.replace(/\|/g, "\\|").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

export function readmeText(problems: PlantedProblem[], intervalNotes: string[]): string {
  const rows = problems.map((p, i) =>
    `| ${i + 1} | ${p.buildingId} | ${p.meterId} | ${p.billIds.join(", ")} | ${p.checks.map((c) => `\`${c}\``).join(", ")} | ${cell(p.change)} | ${p.amountAtStakeUsd === null ? "—" : money(p.amountAtStakeUsd)} | ${cell(p.note)} |`,
  );
  return `# Demo portfolio: ${COMPANY_NAME}

Everything in this folder is invented: the company, its ${BUILDINGS.length} buildings, the utilities,
their rates, the weather stations and all readings. It is **generated**, byte for byte, by

    npx tsx scripts/generate-demo.ts [OUT_DIR]     # default OUT_DIR = data/demo

from a seeded pseudo-random generator (scripts/demo/prng.ts); a test fails when these files
differ from a fresh generation, so change the generator, never the files.

## What is in it
- ${BUILDINGS.length} buildings in two regions: America/New_York (station ${STATIONS[0].stationId}, hourly °F,
  utility "Harrow Valley Power & Gas", water "Harrow Valley Water Board") and America/Chicago
  (station ${STATIONS[1].stationId}, hourly °C with a typical year under weather/normals/, utility
  "Prairie Crossing Energy Cooperative", "Prairie Crossing Municipal Water").
- ${METERS.length} meters, 36 monthly bills each (reads from December 2022 to December 2025, periods
  of 28–33 days, half-open: period_end is the next read date). Gas is billed in therms or ccf
  (heat content 1.041 therm/ccf), water in ccf or gallons.
- Bill totals and printed lines come from the project's tariff engine (src/tariff), so every
  clean bill re-prices exactly. bill_lines.csv holds the printed lines of TWR-E, ASH-G, MKT-E
  and CLN-W.
- Interval data (15 minutes) for three electricity meters, covering whole bills from the one
  that contains 2024-10-01 to the last bill:
${intervalNotes.map((n) => `  - ${n}`).join("\n")}
  For clean bills of these meters, usage = Σ interval values × multiplier over the bill's
  local-time period, and demand = highest 15-minute value × multiplier × 4 (kW).
  Bills before the interval data starts were priced from billed usage and demand (the
  large-service tariff had no time-of-use charges before 2024-10-01).
- Weather gaps to fill or report: ${STATIONS.map((s) => `${s.stationId}: ${s.gaps.map((g) => `${g.date} ${g.hour}:00 local, ${g.hours} h`).join("; ")}`).join(". ")}.
- Building \`ashelm\` is named \`Ash & Elm "Commons" <North>\` to exercise HTML escaping.

## Planted problems
Everything else is meant to be clean (an audit run over this folder should find these and
nothing else). Amount at stake is in USD, signed: positive = the bill is too high; it is the
billed total minus the total of the same bill done right, both from the tariff engine.
Checks are audit codes of the output contract that the problem can raise: the first is the
problem itself, the others follow from it (e.g. \`total-mismatch\` when the audit re-prices
from interval data) and may be merged into one finding by the audit.

| # | building | meter | bill_id | checks | what was changed | at stake | note |
|---|---|---|---|---|---|---|---|
${rows.join("\n")}
`;
}
