/**
 * CPU time of a process's finished children, for the scale benchmark: a build forks the client
 * bundler (src/site/bundleInChild.ts), and process.cpuUsage() counts only the process's own
 * threads. Linux keeps the user and system time of every child the process has waited for in
 * /proc/self/stat (fields 16 cutime and 17 cstime, in clock ticks; proc(5)).
 */
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";

/**
 * cutime + cstime from the text of /proc/<pid>/stat, in clock ticks; null when the text is not
 * in that format. The command name (field 2) is in parentheses and may hold spaces or
 * parentheses itself, so fields are counted from the last ")".
 * @example childTicksFromStat("42 (node) S 1 42 42 0 -1 4194560 0 0 0 0 7 3 150 25 20 0 11 0 9 0 0") // 175
 */
export function childTicksFromStat(stat: string): number | null {
  const close = stat.lastIndexOf(")");
  if (close < 0) return null;
  // after ")": field 3 (state) is index 0, so field 16 (cutime) is index 13 and field 17 (cstime) 14
  const rest = stat.slice(close + 1).trim().split(/\s+/);
  const cutime = Number(rest[13]);
  const cstime = Number(rest[14]);
  return Number.isInteger(cutime) && Number.isInteger(cstime) ? cutime + cstime : null;
}

let ticksPerSecond: number | null | undefined;

/** Clock ticks per second (getconf CLK_TCK; 100 on mainstream Linux); null when unknown. */
function clockTicks(): number | null {
  if (ticksPerSecond !== undefined) return ticksPerSecond;
  try {
    const n = Number(execFileSync("getconf", ["CLK_TCK"], { encoding: "utf8" }).trim());
    ticksPerSecond = Number.isInteger(n) && n > 0 ? n : null;
  } catch {
    ticksPerSecond = null;
  }
  return ticksPerSecond;
}

/** CPU ms of this process's finished children (0 where /proc is not available). */
export function finishedChildrenCpuMs(): number {
  const hz = clockTicks();
  if (hz === null) return 0;
  try {
    const ticks = childTicksFromStat(readFileSync("/proc/self/stat", "utf8"));
    return ticks === null ? 0 : (ticks * 1000) / hz;
  } catch {
    return 0;
  }
}
