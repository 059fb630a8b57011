/**
 * All interval-detector settings in one object, with documented defaults. The portfolio.yaml
 * `cleaning:` key maps onto it (snake_case keys there, camelCase here); every field is optional.
 */
import { type ConstantRunConfig, DEFAULT_CONSTANT_RUN_CONFIG } from "./constantRuns.ts";
import { DEFAULT_MISSING_CONFIG, type MissingConfig } from "./missing.ts";
import { DEFAULT_NEGATIVE_CONFIG, type NegativeConfig } from "./negatives.ts";
import { DEFAULT_RESET_CONFIG, type ResetConfig } from "./resets.ts";
import { DEFAULT_SPIKE_CONFIG, type SpikeConfig } from "./spikes.ts";
import { DEFAULT_ZERO_RUN_CONFIG, type ZeroRunConfig } from "./zeroRuns.ts";

export interface DetectConfig {
  zeroRun: ZeroRunConfig;
  constantRun: ConstantRunConfig;
  spike: SpikeConfig;
  negative: NegativeConfig;
  missing: MissingConfig;
  reset: ResetConfig;
}

/** What a user may give: any subset of any detector's settings. */
export type DetectConfigInput = { [K in keyof DetectConfig]?: Partial<DetectConfig[K]> };

export const DEFAULT_DETECT_CONFIG: Readonly<DetectConfig> = Object.freeze({
  zeroRun: DEFAULT_ZERO_RUN_CONFIG,
  constantRun: DEFAULT_CONSTANT_RUN_CONFIG,
  spike: DEFAULT_SPIKE_CONFIG,
  negative: DEFAULT_NEGATIVE_CONFIG,
  missing: DEFAULT_MISSING_CONFIG,
  reset: DEFAULT_RESET_CONFIG,
});

/**
 * Fills every setting the user did not give from `DEFAULT_DETECT_CONFIG`.
 * @example resolveDetectConfig({ spike: { sigmas: 10 } }).spike.halfWindowHours // 1
 */
export function resolveDetectConfig(input: DetectConfigInput = {}): DetectConfig {
  return {
    zeroRun: { ...DEFAULT_ZERO_RUN_CONFIG, ...input.zeroRun },
    constantRun: { ...DEFAULT_CONSTANT_RUN_CONFIG, ...input.constantRun },
    spike: { ...DEFAULT_SPIKE_CONFIG, ...input.spike },
    negative: { ...DEFAULT_NEGATIVE_CONFIG, ...input.negative },
    missing: { ...DEFAULT_MISSING_CONFIG, ...input.missing },
    reset: { ...DEFAULT_RESET_CONFIG, ...input.reset },
  };
}

/** A problem in the `cleaning:` settings, with its YAML key path (e.g. `cleaning.spike.sigmas`). */
export interface CleaningConfigIssue {
  path: string;
  message: string;
}

const SECTION_KEYS: Record<string, keyof DetectConfig> = {
  zero_run: "zeroRun",
  constant_run: "constantRun",
  spike: "spike",
  negative: "negative",
  missing: "missing",
  reset: "reset",
};

const camelToSnake = (k: string): string => k.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);

/**
 * Reads the `cleaning:` mapping of portfolio.yaml (as parsed YAML) into a `DetectConfigInput`.
 * Keys are snake_case versions of the config fields (`cleaning: { spike: { half_window_hours: 2 } }`);
 * every value must be a finite number ≥ 0. Unknown keys and bad values are returned as issues
 * (and left at their defaults), never thrown. `undefined`/`null` means "all defaults".
 * @example parseCleaningConfig({ zero_run: { min_run_hours: 6 } }).config.zeroRun?.minRunHours // 6
 */
export function parseCleaningConfig(raw: unknown): { config: DetectConfigInput; issues: CleaningConfigIssue[] } {
  const issues: CleaningConfigIssue[] = [];
  const config: Record<string, Record<string, number>> = {};
  if (raw === undefined || raw === null) return { config, issues };
  if (typeof raw !== "object" || Array.isArray(raw)) {
    issues.push({ path: "cleaning", message: "expected a mapping of detector names to settings" });
    return { config, issues };
  }
  for (const [sectionKey, sectionValue] of Object.entries(raw)) {
    const section = SECTION_KEYS[sectionKey];
    const path = `cleaning.${sectionKey}`;
    if (!section) {
      issues.push({ path, message: `unknown detector '${sectionKey}'; known: ${Object.keys(SECTION_KEYS).join(", ")}` });
      continue;
    }
    if (typeof sectionValue !== "object" || sectionValue === null || Array.isArray(sectionValue)) {
      issues.push({ path, message: "expected a mapping of settings" });
      continue;
    }
    const known = new Map(Object.keys(DEFAULT_DETECT_CONFIG[section]).map((k) => [camelToSnake(k), k]));
    for (const [key, value] of Object.entries(sectionValue)) {
      const field = known.get(key);
      if (!field) {
        issues.push({ path: `${path}.${key}`, message: `unknown setting; known: ${[...known.keys()].join(", ")}` });
        continue;
      }
      if (typeof value !== "number" || !Number.isFinite(value) || value < 0) {
        issues.push({ path: `${path}.${key}`, message: `expected a number ≥ 0, got ${JSON.stringify(value)}` });
        continue;
      }
      (config[section] ??= {})[field] = value;
    }
  }
  return { config: config as DetectConfigInput, issues };
}
