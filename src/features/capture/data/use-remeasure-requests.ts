import { useLiveQuery } from 'dexie-react-hooks';
import { db, type DecisionRow } from '@/db';

/** A reviewer's live 'remeasure' decisions in a survey, keyed by the station they concern (newest first per station). */
export async function getRemeasureRequests(surveyId: string): Promise<Map<string, DecisionRow[]>> {
  const rows = await db.decisions.where('surveyId').equals(surveyId).toArray();
  const byStation = new Map<string, DecisionRow[]>();
  for (const d of rows) {
    if (d.verdict !== 'remeasure' || (d as { deleted?: boolean }).deleted) continue;
    const list = byStation.get(d.stationId) ?? [];
    list.push(d);
    byStation.set(d.stationId, list);
  }
  for (const list of byStation.values()) list.sort((a, b) => (a.decidedAt < b.decidedAt ? 1 : -1));
  return byStation;
}

export function useRemeasureRequests(surveyId: string): Map<string, DecisionRow[]> | undefined {
  return useLiveQuery(() => getRemeasureRequests(surveyId), [surveyId]);
}
