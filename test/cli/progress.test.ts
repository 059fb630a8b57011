import { describe, expect, it } from "vitest";
import { consoleReporter, formatDuration, formatRate } from "../../src/cli/progress.ts";

function recorder(options: { quiet?: boolean; tty?: boolean }) {
  let clock = 0;
  const out: string[] = [];
  const reporter = consoleReporter({ quiet: options.quiet ?? false, tty: options.tty ?? true, write: (s) => out.push(s), now: () => clock, width: 100 });
  return { reporter, out, advance: (ms: number) => (clock += ms) };
}

describe("progress of a counted task on a terminal", () => {
  it("shows done/total, the rate so far and the time left at that rate", () => {
    const { reporter, out, advance } = recorder({});
    reporter.stage("Pricing, checking and modelling 10 building(s)");
    reporter.step(0, 10, "");
    advance(4000);
    reporter.step(2, 10, "quill-tower");
    // 2 buildings in 4 s = 0.5/s = 30/min; 8 left at that rate = 16 s
    expect(out.at(-1)).toMatch(/^\r {2}\[####----------------\] 2\/10 · 30\/min · 16s left · quill-tower +$/);
    advance(16000);
    reporter.step(10, 10, "fenwick-library");
    // done: total time instead of time left
    expect(out.at(-1)).toMatch(/10\/10 · 30\/min · 20s · fenwick-library/);
    reporter.finish();
    expect(out.at(-1)).toBe("\n");
  });

  it("redraws at most every 200 ms, but always the last step", () => {
    const { reporter, out, advance } = recorder({});
    reporter.step(0, 3, "");
    const before = out.length;
    advance(50);
    reporter.step(1, 3, "a");
    advance(50);
    reporter.step(2, 3, "b");
    expect(out.length).toBe(before);
    advance(10);
    reporter.step(3, 3, "c");
    expect(out.length).toBe(before + 1);
  });

  it("prints nothing for steps when quiet (--quiet, --json) or when stderr is not a terminal", () => {
    for (const options of [{ quiet: true }, { tty: false }]) {
      const { reporter, out, advance } = recorder(options);
      reporter.step(0, 5, "");
      advance(1000);
      reporter.step(5, 5, "x");
      reporter.finish();
      expect(out).toEqual([]);
    }
  });

  it("formats durations and rates for people", () => {
    expect(formatDuration(44.6)).toBe("45s");
    expect(formatDuration(185)).toBe("3m 05s");
    expect(formatDuration(3720)).toBe("1h 02m");
    expect(formatRate(2.44)).toBe("2.4/s");
    expect(formatRate(12.6)).toBe("13/s");
    expect(formatRate(0.1)).toBe("6.0/min");
    expect(formatRate(0.5)).toBe("30/min");
  });
});
