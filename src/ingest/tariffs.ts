/**
 * tariffs/*.yaml → tariffs by id. The only ingest file that touches the tariff engine:
 * parsing and validation belong to src/tariff (loadTariff); here we check ids are unique.
 */
import { readFile } from "node:fs/promises";
import { parse as parseYaml } from "yaml";
import type { InputIssue } from "../core/issues.ts";
import type { FileReport } from "../domain/types.ts";
import { loadTariff, type Tariff } from "../tariff/index.ts";

export type { Tariff };

export interface TariffLoad {
  tariffs: Map<string, Tariff>;
  /** Ids of tariff files that had errors → file label, for clearer messages on meters. */
  failedIds: Map<string, string>;
  reports: FileReport[];
  issues: InputIssue[];
}

/** Best-effort `id` of a tariff file that failed validation (null when not even that). */
function idOf(text: string): string | null {
  try {
    const doc = parseYaml(text) as unknown;
    const id = doc !== null && typeof doc === "object" ? (doc as Record<string, unknown>).id : undefined;
    return typeof id === "string" && id.trim() !== "" ? id.trim() : null;
  } catch {
    return null;
  }
}

/**
 * Loads each file (`files[i]` is read from `paths[i]`; `files[i]` is the label in issues).
 * A file whose `id` repeats an earlier file's is rejected.
 */
export async function loadTariffFiles(paths: readonly string[], files: readonly string[], onFile?: (file: string) => void): Promise<TariffLoad> {
  const tariffs = new Map<string, Tariff>();
  const source = new Map<string, string>();
  const failedIds = new Map<string, string>();
  const reports: FileReport[] = [];
  const issues: InputIssue[] = [];
  for (let i = 0; i < paths.length; i++) {
    const file = files[i];
    onFile?.(file);
    const report: FileReport = { file, rowsRead: 1, rowsUsed: 0, rowsRejected: 0, rejections: [], warnings: [] };
    reports.push(report);
    const text = await readFile(paths[i], "utf8");
    const { tariff, issues: found } = loadTariff(text.replace(/^\uFEFF/, ""), file);
    issues.push(...found);
    report.warnings.push(...found.filter((x) => x.severity === "warning").map((x) => `line ${x.line}: ${x.message}`));
    if (tariff === null) {
      report.rowsRejected = 1;
      report.rejections.push({ line: 0, reason: `tariff has ${found.filter((x) => x.severity === "error").length} error(s)` });
      const id = idOf(text);
      if (id !== null) failedIds.set(id, file);
      continue;
    }
    const prev = source.get(tariff.id);
    if (prev !== undefined) {
      const message = `tariff id ${tariff.id} is already used by ${prev}`;
      issues.push({ file, line: 1, column: 1, severity: "error", message, hint: "each tariff file needs its own id" });
      report.rowsRejected = 1;
      report.rejections.push({ line: 1, reason: message });
      continue;
    }
    source.set(tariff.id, file);
    tariffs.set(tariff.id, tariff);
    report.rowsUsed = 1;
  }
  return { tariffs, failedIds, reports, issues };
}
