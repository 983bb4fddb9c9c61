import { describe, expect, it } from "vitest";
import { Geodesic } from "geographiclib-geodesic";
import { seededRandom } from "../../scripts/demo/visits";
import { generaliseLocation, gridCellOf, haversineMeters, locationFor, mayViewExactLocation } from "./generalise";

// geographiclib-geodesic (npm): Karney's geodesics on the WGS84 ellipsoid, the reference for distances here.
const wgs84 = Geodesic.WGS84;
const geodesicMeters = (lat1: number, lon1: number, lat2: number, lon2: number) => wgs84.Inverse(lat1, lon1, lat2, lon2).s12!;

describe("generalising a sensitive record's location", () => {
  it("moves the point to the centre of its 0.1° cell", () => {
    expect(gridCellOf(43.0734, -89.4012)).toMatchObject({ south: 43, west: -89.5, centreLatitude: 43.05, centreLongitude: -89.45 });
    expect(gridCellOf(-0.01, 0.01)).toMatchObject({ centreLatitude: -0.05, centreLongitude: 0.05 });
    // The north pole and the antimeridian fall in the last cell, not outside the grid.
    expect(gridCellOf(90, 180)).toMatchObject({ centreLatitude: 89.95, centreLongitude: -179.95 });
    expect(gridCellOf(-90, -180)).toMatchObject({ centreLatitude: -89.95, centreLongitude: -179.95 });
  });

  it("gives every point of one cell the same coordinates, so nothing of the exact place is left", () => {
    const a = generaliseLocation({ decimalLatitude: 42.3011, decimalLongitude: -88.9123, coordinateUncertaintyInMeters: 10 });
    const b = generaliseLocation({ decimalLatitude: 42.3989, decimalLongitude: -88.9877, coordinateUncertaintyInMeters: 10 });
    expect([a.decimalLatitude, a.decimalLongitude]).toEqual([b.decimalLatitude, b.decimalLongitude]);
    expect(a.dataGeneralizations).toMatch(/0\.1° grid cell/);
  });

  it("keeps the true place inside the stated uncertainty, by the ellipsoidal distance, anywhere on Earth", () => {
    const random = seededRandom(81).next;
    for (let i = 0; i < 2000; i++) {
      const lat = -89.9 + random() * 179.8;
      const lon = -180 + random() * 360;
      const uncertainty = random() < 0.2 ? null : Math.round(random() * 500);
      const g = generaliseLocation({ decimalLatitude: lat, decimalLongitude: lon, coordinateUncertaintyInMeters: uncertainty });
      const cell = gridCellOf(lat, lon);
      for (const [cornerLat, cornerLon] of [[cell.south, cell.west], [cell.south, cell.east], [cell.north, cell.west], [cell.north, cell.east]]) {
        expect(geodesicMeters(g.decimalLatitude, g.decimalLongitude, cornerLat!, cornerLon!) + (uncertainty ?? 0)).toBeLessThanOrEqual(g.coordinateUncertaintyInMeters!);
      }
      expect(geodesicMeters(g.decimalLatitude, g.decimalLongitude, lat, lon) + (uncertainty ?? 0)).toBeLessThanOrEqual(g.coordinateUncertaintyInMeters!);
    }
  });

  it("measures the published haversine example", () => {
    // Rosetta Code, "Haversine formula": (36.12, −86.67) to (33.94, −118.40) = 2886.4444 km at R = 6371.0 km.
    expect(haversineMeters(36.12, -86.67, 33.94, -118.4, 6_371_000) / 1000).toBeCloseTo(2886.4444, 3);
  });

  it("never needs more than the fixed 15,691 m that Chapman & Wieczorek (2020, Table 3) add for 0.1°", () => {
    for (const lat of [0.02, 23.4, 43.07, 66.5, 89.9]) {
      const g = generaliseLocation({ decimalLatitude: lat, decimalLongitude: 10.03, coordinateUncertaintyInMeters: 0 });
      expect(g.coordinateUncertaintyInMeters).toBeLessThanOrEqual(15_691);
    }
  });

  it("measures distances within 0.6 % of the WGS84 geodesic", () => {
    // Haversine on the mean sphere against Karney's ellipsoidal geodesic (geographiclib).
    for (const [a, b, c, d] of [[43.05, -89.45, 43.1, -89.4], [0.05, 0.05, 0.1, 0.1], [70.05, 20.05, 70.1, 20.1], [-33.95, 151.15, -33.9, 151.2]]) {
      const ratio = haversineMeters(a!, b!, c!, d!) / geodesicMeters(a!, b!, c!, d!);
      expect(Math.abs(ratio - 1)).toBeLessThan(0.006);
    }
  });
});

describe("who sees exact coordinates", () => {
  const record = { recorderId: 7, sensitive: true, decimalLatitude: 43.0734, decimalLongitude: -89.4012, coordinateUncertaintyInMeters: 15 };
  it("shows them to coordinators and to the visit's own recorder only", () => {
    expect(mayViewExactLocation({ id: 1, roles: ["coordinator"] }, record)).toBe(true);
    expect(mayViewExactLocation({ id: 7, roles: ["recorder"] }, record)).toBe(true);
    for (const roles of [["recorder"], ["botanist"], ["bee_verifier"], ["planner"], ["nursery"]]) {
      expect(mayViewExactLocation({ id: 2, roles }, record)).toBe(false);
    }
    expect(mayViewExactLocation(null, record)).toBe(false);
  });

  it("leaves records of species that are not sensitive alone", () => {
    expect(locationFor(null, { ...record, sensitive: false })).toEqual({ ...{ decimalLatitude: 43.0734, decimalLongitude: -89.4012, coordinateUncertaintyInMeters: 15 }, dataGeneralizations: null, generalised: false });
    expect(locationFor({ id: 2, roles: ["planner"] }, record)).toMatchObject({ decimalLatitude: 43.05, decimalLongitude: -89.45, generalised: true });
  });
});
