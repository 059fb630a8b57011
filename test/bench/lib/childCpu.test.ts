import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { childTicksFromStat, finishedChildrenCpuMs } from "../../../bench/lib/childCpu.ts";

describe("childTicksFromStat", () => {
  // Field layout of /proc/<pid>/stat from proc(5): 1 pid, 2 (comm), 3 state, … 14 utime,
  // 15 stime, 16 cutime, 17 cstime. The lines are written for the test, in that layout.
  it("adds cutime and cstime (fields 16 and 17)", () => {
    expect(childTicksFromStat("42 (node) S 1 42 42 0 -1 4194560 0 0 0 0 7 3 150 25 20 0 11 0 9 0 0")).toBe(175);
  });

  it("counts fields from the last parenthesis: a command name may hold spaces and parentheses", () => {
    expect(childTicksFromStat("7 (a b) (c)) R 1 7 7 0 -1 0 0 0 0 0 1 2 30 4 20 0 1 0 5 0 0")).toBe(34);
  });

  it("refuses text in another format", () => {
    expect(childTicksFromStat("no parenthesis here")).toBeNull();
    expect(childTicksFromStat("1 (x) S 1 2")).toBeNull();
  });
});

describe("finishedChildrenCpuMs", () => {
  it.runIf(existsSync("/proc/self/stat"))("grows once a child that used CPU has been waited for", () => {
    const before = finishedChildrenCpuMs();
    // a child that spins for ~300 ms of CPU, then exits; spawnSync waits for it
    spawnSync(process.execPath, ["-e", "const t = Date.now(); while (Date.now() - t < 300);"]);
    expect(finishedChildrenCpuMs()).toBeGreaterThan(before + 100);
  });
});
