import { describe, expect, it } from "vitest";
import { childEnv } from "../../bin/childEnv.js";

describe("the CLI process's environment (bin/childEnv.js)", () => {
  it("fixes glibc's mmap threshold at 128 KiB and caps its arenas at two, so freed memory leaves the process (mallopt(3))", () => {
    expect(childEnv({ PATH: "/bin" })).toEqual({ PATH: "/bin", MALLOC_MMAP_THRESHOLD_: "131072", MALLOC_ARENA_MAX: "2" });
  });

  it("keeps values the user chose", () => {
    const env = childEnv({ MALLOC_MMAP_THRESHOLD_: "65536", MALLOC_ARENA_MAX: "8" });
    expect(env.MALLOC_MMAP_THRESHOLD_).toBe("65536");
    expect(env.MALLOC_ARENA_MAX).toBe("8");
  });
});
