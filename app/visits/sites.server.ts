import type { EntityManager } from "@mikro-orm/postgresql";
import { Site } from "../entities/index.ts";

export interface SiteRecord {
  id: number;
  name: string;
  decimalLatitude: number;
  decimalLongitude: number;
  coordinateUncertaintyInMeters: number;
  habitat: string;
  isoRegionCode: string;
}

export async function listSites(em: EntityManager): Promise<SiteRecord[]> {
  const sites = await em.find(Site, {}, { orderBy: { name: "asc" } });
  return sites.map((s) => ({
    id: s.id,
    name: s.name,
    decimalLatitude: s.decimalLatitude,
    decimalLongitude: s.decimalLongitude,
    coordinateUncertaintyInMeters: s.coordinateUncertaintyInMeters,
    habitat: s.habitat,
    isoRegionCode: s.isoRegionCode,
  }));
}
