/**
 * Draws the demo floor plans as small SVG files from the same room and magnet data the seed stores, so
 * a plan and its rooms can never disagree. The files are committed under ./plans (the plan-upload
 * issue will put them in the object store); `npx tsx server/db/seed/plan-svg.ts` rewrites them, and
 * tests/server/seed.test.ts fails when a committed file no longer matches this renderer.
 * Invented plans of an invented campus.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  HARROWBY,
  HARROWBY_EMITTERS,
  HARROWBY_LEVELS,
  HARROWBY_SOURCES,
  KESTREL,
  KESTREL_LEVELS,
  KESTREL_SOURCES,
  PLAN_DEPTH_M,
  PLAN_PX_PER_M,
  PLAN_WIDTH_M,
  type EmitterSpec,
  type LevelSpec,
  type SourceSpec,
} from './demo-data';

export const PLANS_DIR = path.join(path.dirname(fileURLToPath(import.meta.url)), 'plans');
export const PLAN_WIDTH_PX = PLAN_WIDTH_M * PLAN_PX_PER_M;
export const PLAN_HEIGHT_PX = PLAN_DEPTH_M * PLAN_PX_PER_M;

const SENSITIVITY_FILL: Record<string, string> = { none: '#f1efe9', low: '#e6eef2', medium: '#e9e4f3', high: '#f6e7df' };

const escapeXml = (text: string) =>
  text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

const px = (xM: number) => Number((xM * PLAN_PX_PER_M).toFixed(1));
const py = (yM: number) => Number((PLAN_HEIGHT_PX - yM * PLAN_PX_PER_M).toFixed(1));

export interface PlanDrawing {
  fileName: string;
  organisationName: string;
  level: LevelSpec;
  sources: SourceSpec[];
  emitters: EmitterSpec[];
}

export function renderPlanSvg({ organisationName, level, sources, emitters }: PlanDrawing): string {
  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${PLAN_WIDTH_PX}" height="${PLAN_HEIGHT_PX}" viewBox="0 0 ${PLAN_WIDTH_PX} ${PLAN_HEIGHT_PX}" font-family="sans-serif">`,
    `<title>${escapeXml(`${organisationName} — ${level.name} (invented demo plan)`)}</title>`,
    `<rect width="${PLAN_WIDTH_PX}" height="${PLAN_HEIGHT_PX}" fill="#fbfaf7"/>`,
  );
  for (let xM = 5; xM < PLAN_WIDTH_M; xM += 5) out.push(`<line x1="${px(xM)}" y1="0" x2="${px(xM)}" y2="${PLAN_HEIGHT_PX}" stroke="#e3e0d8" stroke-width="1"/>`);
  for (let yM = 5; yM < PLAN_DEPTH_M; yM += 5) out.push(`<line x1="0" y1="${py(yM)}" x2="${PLAN_WIDTH_PX}" y2="${py(yM)}" stroke="#e3e0d8" stroke-width="1"/>`);
  for (const r of level.rooms) {
    const points = r.polygon.map(([x, y]) => `${px(x)},${py(y)}`).join(' ');
    const cx = r.polygon.reduce((s, [x]) => s + x, 0) / r.polygon.length;
    // Label just inside the top edge, clear of the magnet markers drawn at room centres.
    const topY = Math.max(...r.polygon.map(([, y]) => y));
    out.push(
      `<polygon points="${points}" fill="${SENSITIVITY_FILL[r.sensitivity]}" stroke="#3a3f44" stroke-width="3"/>`,
      `<text x="${px(cx)}" y="${py(topY) + 20}" font-size="12" text-anchor="middle" fill="#3a3f44">${escapeXml(r.name)}</text>`,
    );
  }
  for (const s of sources) {
    out.push(
      `<circle cx="${px(s.xM)}" cy="${py(s.yM)}" r="9" fill="#b0413e" stroke="#fff" stroke-width="2"/>`,
      `<text x="${px(s.xM)}" y="${py(s.yM) + 24}" font-size="11" text-anchor="middle" fill="#b0413e">${escapeXml(s.planLabel)}</text>`,
    );
  }
  for (const e of emitters) {
    out.push(`<rect x="${px(e.xM) - 6}" y="${py(e.yM) - 6}" width="12" height="12" fill="#d9a21b" stroke="#fff" stroke-width="2"/>`);
  }
  // Scale bar (5 m) bottom left, north arrow top right (north is up on these plans).
  out.push(
    `<rect x="20" y="${PLAN_HEIGHT_PX - 24}" width="${5 * PLAN_PX_PER_M}" height="6" fill="#3a3f44"/>`,
    `<text x="20" y="${PLAN_HEIGHT_PX - 30}" font-size="12" fill="#3a3f44">5 m</text>`,
    `<path d="M ${PLAN_WIDTH_PX - 30} 20 l 8 22 h -16 z" fill="#3a3f44"/>`,
    `<text x="${PLAN_WIDTH_PX - 30}" y="58" font-size="12" text-anchor="middle" fill="#3a3f44">N</text>`,
    `<text x="${PLAN_WIDTH_PX - 10}" y="${PLAN_HEIGHT_PX - 10}" font-size="11" text-anchor="end" fill="#8a867d">Invented demo plan — not a real building</text>`,
    '</svg>',
  );
  return `${out.join('\n')}\n`;
}

/** Every demo plan, with the file name it is committed under. */
export function demoPlanDrawings(): PlanDrawing[] {
  const drawings: PlanDrawing[] = [];
  for (const level of HARROWBY_LEVELS) {
    drawings.push({
      fileName: `${HARROWBY.key}-${level.key}.svg`,
      organisationName: HARROWBY.name,
      level,
      sources: HARROWBY_SOURCES.filter((s) => s.levelKey === level.key),
      emitters: HARROWBY_EMITTERS.filter((e) => level.rooms.some((r) => r.key === e.roomKey)),
    });
  }
  for (const level of KESTREL_LEVELS) {
    drawings.push({
      fileName: `${KESTREL.key}-${level.key}.svg`,
      organisationName: KESTREL.name,
      level,
      sources: KESTREL_SOURCES.filter((s) => s.levelKey === level.key),
      emitters: [],
    });
  }
  return drawings;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  fs.mkdirSync(PLANS_DIR, { recursive: true });
  for (const drawing of demoPlanDrawings()) {
    fs.writeFileSync(path.join(PLANS_DIR, drawing.fileName), renderPlanSvg(drawing));
    console.log(`wrote ${path.join(PLANS_DIR, drawing.fileName)}`);
  }
}
