import { z } from 'zod';

/** GET /api/health: 200 when the database answers, 503 (same shape) when it does not. */
export const HealthSchema = z.object({
  ok: z.boolean(),
  database: z.enum(['up', 'down']),
});
export type Health = z.infer<typeof HealthSchema>;
