// Location stewardship for sensitive species. Pure module: the one rule every page, API
// response, export, map and e-mail applies before a record leaves the server.
//
// Exact coordinates of a bee flagged sensitive go only to coordinators and to the visit's own
// recorder. Everyone else gets the centre of the 0.1° grid cell the record falls in, with
// coordinateUncertaintyInMeters enlarged so the circle still holds the true place, and
// dataGeneralizations saying so. The grid follows Chapman AD (2020), "Current Best Practices for
// Generalizing Sensitive Species Occurrence Data", GBIF Secretariat, Table 7: 0.1° (about 10 km)
// for highly sensitive species, with what was done recorded in dataGeneralizations. Chapman &
// Wieczorek (2020, Table 3) add a fixed 15,691 m for coordinates rounded to 0.1°; we move the
// point to the cell's centre instead and add the centre-to-corner distance at the cell's own
// latitude, which always covers the cell and is smaller away from the equator.

/** The grid, in degrees of latitude and longitude. */
export const GENERALISATION_CELL_DEGREES = 0.1;

/** Mean Earth radius, R₁ of the IUGG (6,371,008.8 m). */
const EARTH_RADIUS_M = 6_371_008.8;

/**
 * The haversine distance runs at most about 0.5 % short of the ellipsoidal distance; the radius
 * is enlarged by this much so that it always covers the cell.
 */
const SPHERE_MARGIN = 1.006;

export const GENERALISATION_NOTE =
  "Coordinates generalised to the centre of a 0.1° grid cell to protect a sensitive species; coordinateUncertaintyInMeters enlarged to cover the cell. Exact coordinates are held by the programme's coordinators.";

export interface Located {
  decimalLatitude: number;
  decimalLongitude: number;
  coordinateUncertaintyInMeters: number | null;
}

export interface GeneralisedLocation extends Located {
  dataGeneralizations: string | null;
  generalised: boolean;
}

const toRadians = (degrees: number) => (degrees * Math.PI) / 180;

/** Great-circle distance in metres on the mean sphere (haversine). */
export function haversineMeters(lat1: number, lon1: number, lat2: number, lon2: number, radius = EARTH_RADIUS_M): number {
  const dLat = toRadians(lat2 - lat1);
  const dLon = toRadians(lon2 - lon1);
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(toRadians(lat1)) * Math.cos(toRadians(lat2)) * Math.sin(dLon / 2) ** 2;
  return 2 * radius * Math.asin(Math.min(1, Math.sqrt(h)));
}

/** Three decimals are enough for a 0.1° grid and keep floating-point noise out of exports. */
const tidy = (value: number) => Math.round(value * 1000) / 1000;

/** The 0.1° cell a point falls in: its south-west corner and its centre. */
export function gridCellOf(decimalLatitude: number, decimalLongitude: number, cell = GENERALISATION_CELL_DEGREES) {
  const cells = Math.round(180 / cell);
  // The north pole and the antimeridian belong to the last cell below them, not to a new one.
  const row = Math.min(Math.floor((decimalLatitude + 90) / cell), cells - 1);
  const column = Math.floor((((decimalLongitude + 180) % 360) + 360) % 360 / cell) % (2 * cells);
  const south = tidy(row * cell - 90);
  const west = tidy(column * cell - 180);
  return { south, west, north: tidy(south + cell), east: tidy(west + cell), centreLatitude: tidy(south + cell / 2), centreLongitude: tidy(west + cell / 2) };
}

/** The record at the centre of its cell, its uncertainty enlarged to hold every place in the cell. */
export function generaliseLocation(record: Located, cell = GENERALISATION_CELL_DEGREES): GeneralisedLocation {
  const g = gridCellOf(record.decimalLatitude, record.decimalLongitude, cell);
  const toCorner = Math.max(
    ...[
      [g.south, g.west],
      [g.south, g.east],
      [g.north, g.west],
      [g.north, g.east],
    ].map(([lat, lon]) => haversineMeters(g.centreLatitude, g.centreLongitude, lat!, lon!)),
  );
  return {
    decimalLatitude: g.centreLatitude,
    decimalLongitude: g.centreLongitude,
    coordinateUncertaintyInMeters: Math.ceil(toCorner * SPHERE_MARGIN + (record.coordinateUncertaintyInMeters ?? 0)),
    dataGeneralizations: GENERALISATION_NOTE,
    generalised: true,
  };
}

export interface LocationViewer {
  id: number;
  roles: readonly string[];
}

/** Whether this viewer (null: nobody signed in) may see the exact place of this record. */
export function mayViewExactLocation(viewer: LocationViewer | null, record: { recorderId: number; sensitive: boolean }): boolean {
  if (!record.sensitive) return true;
  if (!viewer) return false;
  return viewer.roles.includes("coordinator") || viewer.id === record.recorderId;
}

/** The location this viewer may see: exact, or generalised. */
export function locationFor(viewer: LocationViewer | null, record: Located & { recorderId: number; sensitive: boolean }): GeneralisedLocation {
  if (mayViewExactLocation(viewer, record)) {
    return {
      decimalLatitude: record.decimalLatitude,
      decimalLongitude: record.decimalLongitude,
      coordinateUncertaintyInMeters: record.coordinateUncertaintyInMeters,
      dataGeneralizations: null,
      generalised: false,
    };
  }
  return generaliseLocation(record);
}
