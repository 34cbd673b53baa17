import { db } from '@/db';

/**
 * Refresh a station's device-only `latestFieldT` from its live readings (newest measuredAt wins; a
 * tombstone never counts). Reads from the top of the station's [stationId+measuredAt] range, newest
 * first, and stops at the first live reading: one or two rows, however many readings the station has.
 * Writes only when the value changes, so a save that does not change the colour wakes no plan.
 * Call inside a transaction that includes db.fieldReadings and db.stations.
 */
export async function refreshStationLatest(stationId: string): Promise<void> {
  const [newest, station] = await Promise.all([
    db.fieldReadings
      .where('[stationId+measuredAt]')
      .between([stationId, ''], [stationId, '\uffff'])
      .reverse()
      .filter((r) => !r.deleted)
      .first(),
    db.stations.get(stationId),
  ]);
  const latestFieldT = newest?.fieldT ?? null;
  if (station && station.latestFieldT !== latestFieldT) await db.stations.put({ ...station, latestFieldT });
}
