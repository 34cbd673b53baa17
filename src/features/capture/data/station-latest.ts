import { db } from '@/db';

/**
 * Refresh a station's device-only `latestFieldT` from its live readings (newest measuredAt wins).
 * Call inside a transaction that includes db.fieldReadings and db.stations.
 */
export async function refreshStationLatest(stationId: string): Promise<void> {
  const readings = await db.fieldReadings.where('stationId').equals(stationId).toArray();
  let newest: { fieldT: number; measuredAt: string } | null = null;
  for (const r of readings) {
    if (r.deleted) continue;
    if (!newest || r.measuredAt > newest.measuredAt) newest = { fieldT: r.fieldT, measuredAt: r.measuredAt };
  }
  await db.stations.update(stationId, { latestFieldT: newest?.fieldT ?? null });
}
