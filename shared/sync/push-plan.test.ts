/**
 * The device's push plan (push-plan.ts): which batch may set off while others are on the way. The
 * rules are the product's own (DESIGN.md §4: changes of one record arrive in queue order, a reading
 * never overtakes its station); these cases pin each of them.
 */
import { describe, expect, it } from 'vitest';
import { PUSH_MAX_MUTATIONS } from '../schemas/sync';
import { batchFootprint, mayOverlap, PUSH_BATCH_SIZE, PUSH_IN_FLIGHT, pushInTurn } from './push-plan';

const station = { recordId: 'st-1', payload: { id: 'st-1', walkId: 'walk-1' } };
const reading = (id: string, stationId = 'st-1') => ({ recordId: id, payload: { id, stationId, walkId: 'walk-1' } });

describe('push plan', () => {
  it('sends batches the server takes', () => {
    expect(PUSH_BATCH_SIZE).toBeLessThanOrEqual(PUSH_MAX_MUTATIONS);
    expect(PUSH_IN_FLIGHT).toBeGreaterThanOrEqual(1);
  });

  it('lists what a batch writes and which captured records it names', () => {
    const f = batchFootprint([station, reading('r-1')]);
    expect([...f.writes].sort()).toEqual(['r-1', 'st-1']);
    expect([...f.names].sort()).toEqual(['st-1', 'walk-1']);
  });

  it('lets a batch go beside one that has nothing it needs', () => {
    const earlier = batchFootprint([reading('r-1'), reading('r-2')]);
    expect(mayOverlap(batchFootprint([reading('r-3'), reading('r-4')]), [earlier])).toBe(true);
    expect(mayOverlap(batchFootprint([reading('r-3')]), [])).toBe(true);
  });

  it('holds back a second change of a record that is on the way', () => {
    expect(mayOverlap(batchFootprint([reading('r-1')]), [batchFootprint([reading('r-1')])])).toBe(false);
  });

  it('holds back a reading whose station or walk is on the way', () => {
    expect(mayOverlap(batchFootprint([reading('r-9')]), [batchFootprint([station])])).toBe(false);
    const walk = { recordId: 'walk-1', payload: { id: 'walk-1' } };
    expect(mayOverlap(batchFootprint([reading('r-9', 'st-other')]), [batchFootprint([walk])])).toBe(false);
  });

  it('does not hold back a later batch for an earlier reading that names it', () => {
    // The earlier batch's reading names a station made later in the queue: the station may go beside it.
    expect(mayOverlap(batchFootprint([station]), [batchFootprint([reading('r-1')])])).toBe(true);
  });

  it('keeps at most PUSH_IN_FLIGHT batches on the way', () => {
    const onTheWay = Array.from({ length: PUSH_IN_FLIGHT }, (_, i) => batchFootprint([reading(`r-${i}`, `st-${i}`)]));
    expect(mayOverlap(batchFootprint([reading('r-x', 'st-x')]), onTheWay)).toBe(false);
  });

  it('runs batches in order, independent ones side by side, a dependent one only after its parent', async () => {
    const log: string[] = [];
    let onTheWay = 0;
    let most = 0;
    const batches = [[station], [reading('r-1')], [reading('r-2')], [reading('r-3')]];
    await pushInTurn(batches, batchFootprint, async (batch) => {
      const id = batch[0]!.recordId;
      log.push(`start ${id}`);
      most = Math.max(most, ++onTheWay);
      await new Promise((resolve) => setTimeout(resolve, 20));
      onTheWay -= 1;
      log.push(`end ${id}`);
    });
    // r-1 names the station: it starts only after the station's batch ended; r-2 goes beside r-1.
    expect(log.slice(0, 4)).toEqual(['start st-1', 'end st-1', 'start r-1', 'start r-2']);
    expect(log.filter((l) => l.startsWith('start'))).toEqual(['start st-1', 'start r-1', 'start r-2', 'start r-3']);
    expect(most).toBe(PUSH_IN_FLIGHT);
  });

  it('stops at the first failure, lets the batch on the way finish, then throws', async () => {
    const started: string[] = [];
    const finished: string[] = [];
    const batches = [[reading('r-1', 'a')], [reading('r-2', 'b')], [reading('r-3', 'c')], [reading('r-4', 'd')]];
    const run = pushInTurn(batches, batchFootprint, async (batch) => {
      const id = batch[0]!.recordId;
      started.push(id);
      await new Promise((resolve) => setTimeout(resolve, id === 'r-1' ? 5 : 30));
      if (id === 'r-1') throw new Error('network gone');
      finished.push(id);
    });
    await expect(run).rejects.toThrow('network gone');
    expect(started).toEqual(['r-1', 'r-2']);
    expect(finished).toEqual(['r-2']);
  });
});
