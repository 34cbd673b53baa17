/**
 * Lists the routes an Express 5 app has registered, by walking its router stack (app.router.stack and
 * every nested router's stack), as "METHOD /full/path/:template" strings.
 */
import type { Express } from 'express';

interface Layer {
  rawPath?: unknown;
  route?: { path: string | string[]; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

function join(prefix: string, part: unknown): string {
  if (typeof part !== 'string') throw new Error(`route-walk: cannot read a non-string mount path (${String(part)})`);
  if (part === '/' || part === '') return prefix;
  return `${prefix}${part.startsWith('/') ? '' : '/'}${part}`;
}

function walk(stack: Layer[], prefix: string, out: string[]): void {
  for (const layer of stack) {
    if (layer.route) {
      const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
      for (const p of paths) {
        for (const [method, on] of Object.entries(layer.route.methods)) {
          if (on && method !== '_all') out.push(`${method.toUpperCase()} ${join(prefix, p) || '/'}`);
        }
      }
    } else if (layer.handle?.stack) {
      walk(layer.handle.stack, join(prefix, layer.rawPath ?? '/'), out);
    }
  }
}

export function listRoutes(app: Express): string[] {
  const router = (app as unknown as { router: { stack: Layer[] } }).router;
  const out: string[] = [];
  walk(router.stack, '', out);
  return out;
}
