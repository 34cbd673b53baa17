/**
 * Deterministic ids for demo rows: UUID v5 (RFC 9562 §5.5, name-based with SHA-1) of a readable name in
 * a fixed namespace, so every run of the seed makes the same ids and two fresh databases can be
 * compared row for row. Real records get client-made v7 ids; only the demo uses these.
 */
import { v5 as uuidV5 } from 'uuid';

/** The demo's own namespace (made up; any fixed UUID would do). */
const DEMO_NAMESPACE = '3f6c2a9e-8d41-4b7a-9c25-6e0b1d7f4a83';

export const demoId = (name: string): string => uuidV5(name, DEMO_NAMESPACE);
