import { describe, expect, it } from "vitest";
import { childEnv } from "../../bin/childEnv.js";

describe("the CLI process's environment (bin/childEnv.js)", () => {
  it("fixes glibc's mmap threshold at 128 KiB, so freed large arrays leave resident memory (mallopt(3))", () => {
    expect(childEnv({ PATH: "/bin" })).toEqual({ PATH: "/bin", MALLOC_MMAP_THRESHOLD_: "131072" });
  });

  it("keeps a threshold the user chose", () => {
    expect(childEnv({ MALLOC_MMAP_THRESHOLD_: "65536" }).MALLOC_MMAP_THRESHOLD_).toBe("65536");
  });
});
