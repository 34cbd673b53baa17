import { Router } from 'express';
import type { HealthService } from './health.service';

/** Mounted at /api. Open to anyone: load balancers and the client's online indicator use it. */
export default function healthRouter(deps: { health: HealthService }): Router {
  const router = Router();
  router.get('/health', async (_req, res) => {
    const health = await deps.health.check();
    res.status(health.ok ? 200 : 503).set('Cache-Control', 'no-store').json(health);
  });
  return router;
}
