/**
 * Environment of the process that runs the CLI (the launcher starts it as a child).
 *
 * glibc's malloc raises its mmap threshold each time a large block is freed (mallopt(3),
 * "dynamic mmap threshold"), so after reading interval files the arrays made later come from
 * the heap arena and, once freed, stay in the process's resident memory: reading a
 * 1,000-building portfolio left ~450 MB resident that no array used any more. A fixed threshold
 * (128 KiB, glibc's own default start) turns the adjustment off, so large arrays are mapped and
 * returned to the system when freed; measured CPU time is unchanged.
 *
 * glibc also gives each thread its own malloc arena, and what the analysis threads allocated
 * stays resident in their arenas after the pool is gone: at 256 buildings the forecast stage
 * (which runs after them) peaked at 1,156 MB with one arena per thread and 568 MB with two
 * arenas in all (MALLOC_ARENA_MAX=2), CPU unchanged. A value the user set wins.
 */
export function childEnv(env = process.env) {
  return { MALLOC_MMAP_THRESHOLD_: "131072", MALLOC_ARENA_MAX: "2", ...env };
}
