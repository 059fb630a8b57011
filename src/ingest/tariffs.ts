/**
 * tariffs/*.yaml → tariffs by id. The only ingest file that touches the tariff engine:
 * parsing and validation belong to src/tariff (loadTariff); here we check ids are unique.
 */
import { readFile } from "node:fs/promises";
import { parse as parseYaml } from "yaml";
import { appendAll, type InputIssue } from "../core/issues.ts";
import { trimId } from "../core/trimId.ts";
import { NOT_UTF8_HINT, NOT_UTF8_MESSAGE, notUtf8Line } from "./inputFile.ts";
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
    const doc = parseYaml(text, { maxAliasCount: 100 }) as unknown;
    const id = doc !== null && typeof doc === "object" ? (doc as Record<string, unknown>).id : undefined;
    return typeof id === "string" && trimId(id) !== "" ? trimId(id) : null;
  } catch {
    return null;
  }
}

/** Reads one tariff file's text, or says why it cannot be read (see ingest/inputFile.ts). */
export type ReadText = (path: string) => Promise<{ ok: true; text: string } | { ok: false; missing: boolean; message?: string; hint?: string }>;

const plainRead: ReadText = async (path) => {
  try {
    return { ok: true, text: await readFile(path, "utf8") };
  } catch (err) {
    return { ok: false, missing: false, message: `cannot read the file: ${(err as Error).message}`, hint: "check the file" };
  }
};

/**
 * Loads each file (`files[i]` is read from `paths[i]`; `files[i]` is the label in issues).
 * A file whose `id` repeats an earlier file's is rejected; a file that cannot be read is
 * reported at `file:0:0` and counted as one rejected row.
 */
export async function loadTariffFiles(
  paths: readonly string[],
  files: readonly string[],
  onFile?: (file: string) => void,
  readText: ReadText = plainRead,
  portfolioCurrency: string | null = null,
): Promise<TariffLoad> {
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
    const read = await readText(paths[i]);
    if (!read.ok) {
      const message = read.missing ? "file disappeared while the portfolio was read" : (read.message ?? "cannot read the file");
      issues.push({ file, line: 0, column: 0, severity: "error", message, hint: read.hint ?? "check the file" });
      report.rowsRejected = 1;
      report.rejections.push({ line: 0, reason: message });
      continue;
    }
    const text = read.text;
    const { tariff, issues: found } = loadTariff(text.replace(/^\uFEFF/, ""), file);
    const badLine = notUtf8Line(text);
    if (badLine > 0) found.push({ file, line: badLine, column: 0, severity: "warning", message: NOT_UTF8_MESSAGE, hint: NOT_UTF8_HINT });
    appendAll(issues, found);
    for (const x of found) if (x.severity === "warning") report.warnings.push(`line ${x.line}: ${x.message}`);
    if (tariff === null) {
      report.rowsRejected = 1;
      report.rejections.push({ line: 0, reason: `tariff has ${found.filter((x) => x.severity === "error").length} error(s)` });
      const id = idOf(text);
      if (id !== null) failedIds.set(id, file);
      continue;
    }
    if (portfolioCurrency !== null && tariff.currency !== portfolioCurrency) {
      // Bills are in the portfolio currency; pricing them with another currency's rates would
      // compare euros with dollars. The currency line, or line 1 when the default USD applies.
      const at = /^currency\s*:/m.exec(text);
      const line = at ? text.slice(0, at.index).split("\n").length : 1;
      const message = `tariff currency ${tariff.currency} differs from the portfolio currency ${portfolioCurrency}`;
      issues.push({ file, line, column: 1, severity: "error", message, hint: `write currency: ${portfolioCurrency} in the tariff (rates in the currency of the bills)` });
      report.rowsRejected = 1;
      report.rejections.push({ line, reason: message });
      failedIds.set(tariff.id, file);
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
