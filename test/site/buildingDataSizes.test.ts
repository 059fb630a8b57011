/**
 * Each building page lists its own data files (data/buildings/<building_id>/…) with their sizes.
 * The index finds them without reading every file's name per building; it must list exactly the
 * files whose names start with the building's folder, in the order of the sizes record, as
 * filtering did — including ids that are prefixes of others (a, a-r1) and nested files.
 */
import { describe, expect, it } from "vitest";
import { buildingDataSizeIndex } from "../../src/site/prepareSite.ts";

function filtered(buildingId: string, sizes: Record<string, number>): Record<string, number> {
  const folder = `buildings/${buildingId}/`;
  return Object.fromEntries(Object.entries(sizes).filter(([name]) => name.startsWith(folder)));
}

describe("buildingDataSizeIndex", () => {
  const sizes: Record<string, number> = {
    "findings.csv": 10,
    "buildings/a-r1/forecast.csv": 1,
    "buildings/a/forecast.csv": 2,
    "buildings/a/deep/models.json": 3,
    "buildings/a.b/forecast.csv": 4,
    "buildings/a/findings.csv": 5,
    "buildings.csv": 6,
    "buildings/b/x": 7,
  };
  const ownOf = buildingDataSizeIndex(sizes);

  it("lists a building's own files, in the record's order, as filtering by its folder does", () => {
    for (const id of ["a", "a-r1", "a.b", "b", "c", "deep"]) expect(Object.entries(ownOf(id))).toEqual(Object.entries(filtered(id, sizes)));
    expect(Object.keys(ownOf("a"))).toEqual(["buildings/a/forecast.csv", "buildings/a/deep/models.json", "buildings/a/findings.csv"]);
    expect(ownOf("c")).toEqual({});
  });

  it("gives a record of its own each time (a caller changing it changes nothing else)", () => {
    const first = ownOf("a");
    first["buildings/a/forecast.csv"] = 99;
    expect(ownOf("a")["buildings/a/forecast.csv"]).toBe(2);
  });
});
