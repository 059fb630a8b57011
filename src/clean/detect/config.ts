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
