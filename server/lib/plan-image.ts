/**
 * What an uploaded plan really is, decided from its bytes, never its name (issue 6 §2): PNG, JPEG and
 * WebP by their magic numbers (file-type), then read and fully decoded by sharp, so a truncated file is
 * refused rather than stored; SVG by a text sniff for an <svg> root, refused when it could run code or
 * reach out (scripts, on* handlers, foreignObject, entities, external references). Also makes the device
 * copy of a large raster: long side PLAN_DEVICE_MAX_SIDE_PX, WebP.
 */
import { createHash } from 'node:crypto';
import { fileTypeFromBuffer } from 'file-type';
import sharp, { type Metadata } from 'sharp';
import { PLAN_DEVICE_MAX_SIDE_PX, type PLAN_MIME_TYPES } from '../../shared/schemas/plan';
import { deviceSize } from '../db/plan-view';
import { AppError } from './errors';

export type PlanMime = (typeof PLAN_MIME_TYPES)[number];

export interface InspectedPlan {
  mime: PlanMime;
  extension: 'png' | 'jpg' | 'webp' | 'svg';
  widthPx: number;
  heightPx: number;
  sha256: string;
  /** The downscaled copy for devices (rasters larger than PLAN_DEVICE_MAX_SIDE_PX only). */
  device: { bytes: Buffer; mime: 'image/webp'; widthPx: number; heightPx: number } | null;
}

/** Larger images are refused before decoding (a decompression bomb would otherwise take the memory). */
export const PLAN_MAX_INPUT_PIXELS = 150_000_000;
const DEVICE_WEBP_QUALITY = 82;

const RASTER: Record<string, { mime: PlanMime; extension: InspectedPlan['extension']; sharpFormat: string }> = {
  png: { mime: 'image/png', extension: 'png', sharpFormat: 'png' },
  jpg: { mime: 'image/jpeg', extension: 'jpg', sharpFormat: 'jpeg' },
  webp: { mime: 'image/webp', extension: 'webp', sharpFormat: 'webp' },
};

const ACCEPTED = 'Upload a PNG, JPEG, WebP or SVG image.';

/** Plain words for what a refused file turned out to be. */
function describe(detected: { ext: string; mime: string } | undefined, bytes: Buffer): string {
  if (detected) {
    const names: Record<string, string> = {
      elf: 'an ELF executable',
      exe: 'a Windows executable',
      pdf: 'a PDF document',
      zip: 'a ZIP archive',
      gif: 'a GIF image',
      tif: 'a TIFF image',
      bmp: 'a BMP image',
      heic: 'a HEIC image',
      avif: 'an AVIF image',
    };
    return names[detected.ext] ?? `a ${detected.ext.toUpperCase()} file (${detected.mime})`;
  }
  const head = bytes.subarray(0, 64).toString('latin1');
  if (head.startsWith('#!')) return 'a script';
  if (bytes.subarray(0, 4096).includes(0)) return 'a binary file of an unknown kind';
  return 'a text file that is not an SVG image';
}

const SVG_ROOT = /^\s*(?:<\?xml[^>]*\?>\s*)?(?:<!--[\s\S]*?-->\s*)*(?:<!DOCTYPE\s+svg[^>[]*>\s*)?(?:<!--[\s\S]*?-->\s*)*<svg[\s>]/i;

/** Reasons an SVG is refused; each names what was found. */
function svgHazards(text: string): string[] {
  const found: string[] = [];
  if (/<script[\s>/]/i.test(text)) found.push('a <script> element');
  if (/<(?:[a-z]+:)?[a-z][\w:-]*\s[^>]*\bon[a-z]+\s*=/i.test(text)) found.push('an event-handler attribute (on…=)');
  if (/<foreignObject[\s>/]/i.test(text)) found.push('a <foreignObject> element');
  if (/<!ENTITY/i.test(text)) found.push('an XML entity declaration');
  if (/\b(?:xlink:)?href\s*=\s*["']\s*(?!#|data:image\/(?:png|jpeg|webp|gif);base64,)/i.test(text)) found.push('a link to an external resource');
  if (/url\(\s*["']?\s*(?!#|data:)/i.test(text) || /@import/i.test(text)) found.push('an external reference in a style');
  if (/javascript:/i.test(text)) found.push('a javascript: URL');
  return found;
}

const ABSOLUTE_LENGTH = /^\s*([0-9]*\.?[0-9]+(?:e[+-]?\d+)?)\s*(px)?\s*$/i;

function svgSize(rootTag: string): { widthPx: number; heightPx: number } | null {
  const attr = (name: string) => new RegExp(`\\s${name}\\s*=\\s*["']([^"']*)["']`, 'i').exec(rootTag)?.[1];
  const w = attr('width');
  const h = attr('height');
  const wm = w === undefined ? null : ABSOLUTE_LENGTH.exec(w);
  const hm = h === undefined ? null : ABSOLUTE_LENGTH.exec(h);
  if (wm && hm) return { widthPx: Number(wm[1]), heightPx: Number(hm[1]) };
  const viewBox = attr('viewBox')?.trim().split(/[\s,]+/).map(Number);
  if (viewBox && viewBox.length === 4 && viewBox.every(Number.isFinite)) return { widthPx: viewBox[2]!, heightPx: viewBox[3]! };
  return null;
}

function inspectSvg(bytes: Buffer): Omit<InspectedPlan, 'sha256'> | null {
  if (bytes.subarray(0, 4096).includes(0)) return null;
  const text = bytes.toString('utf8').replace(/^\uFEFF/, '');
  if (!SVG_ROOT.test(text)) return null;
  const hazards = svgHazards(text);
  if (hazards.length > 0) {
    throw new AppError('UNSAFE_SVG', `This SVG contains ${hazards.join(', ')}. Plans must be plain drawings: export the SVG again without scripts or links, or upload a PNG.`, { found: hazards });
  }
  const rootTag = /<svg[\s>][^>]*>/i.exec(text)?.[0] ?? '';
  const size = svgSize(rootTag);
  if (!size || !(size.widthPx > 0) || !(size.heightPx > 0)) {
    throw new AppError('UNREADABLE_IMAGE', 'This SVG gives no size: it needs width and height in pixels, or a viewBox.');
  }
  return { mime: 'image/svg+xml', extension: 'svg', widthPx: Math.max(1, Math.round(size.widthPx)), heightPx: Math.max(1, Math.round(size.heightPx)), device: null };
}

async function inspectRaster(bytes: Buffer, kind: (typeof RASTER)[string]): Promise<Omit<InspectedPlan, 'sha256'>> {
  const unreadable = (why: string) =>
    new AppError('UNREADABLE_IMAGE', `This ${kind.extension.toUpperCase()} image cannot be read (${why}). It may be truncated or damaged: export it again and upload the new file.`);
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: PLAN_MAX_INPUT_PIXELS }).metadata();
  } catch {
    throw unreadable('its header is damaged');
  }
  if (meta.format !== kind.sharpFormat || !meta.width || !meta.height) throw unreadable('its header does not match its content');
  if (meta.width * meta.height > PLAN_MAX_INPUT_PIXELS) {
    throw new AppError('UNREADABLE_IMAGE', `This image has ${meta.width} × ${meta.height} pixels; plans may have at most ${PLAN_MAX_INPUT_PIXELS.toLocaleString('en')} pixels.`);
  }
  // Width and height as people see the image (an EXIF rotation swaps them).
  const widthPx = meta.autoOrient?.width ?? meta.width;
  const heightPx = meta.autoOrient?.height ?? meta.height;
  const large = Math.max(widthPx, heightPx) > PLAN_DEVICE_MAX_SIDE_PX;
  try {
    // Decoding every pixel is what finds a truncated file (failOn 'truncated' aborts on missing data).
    const pipeline = sharp(bytes, { limitInputPixels: PLAN_MAX_INPUT_PIXELS, failOn: 'truncated' }).autoOrient();
    if (large) {
      const size = deviceSize(widthPx, heightPx);
      const { data, info } = await pipeline.resize(size.widthPx, size.heightPx, { fit: 'fill' }).webp({ quality: DEVICE_WEBP_QUALITY }).toBuffer({ resolveWithObject: true });
      return { mime: kind.mime, extension: kind.extension, widthPx, heightPx, device: { bytes: data, mime: 'image/webp', widthPx: info.width, heightPx: info.height } };
    }
    await pipeline.resize(64, 64, { fit: 'inside' }).raw().toBuffer();
  } catch {
    throw unreadable('its pixel data is incomplete');
  }
  return { mime: kind.mime, extension: kind.extension, widthPx, heightPx, device: null };
}

export async function inspectPlanFile(bytes: Buffer): Promise<InspectedPlan> {
  if (bytes.length === 0) throw new AppError('UNSUPPORTED_FILE_TYPE', `The file is empty. ${ACCEPTED}`);
  const detected = await fileTypeFromBuffer(bytes);
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  const raster = detected ? RASTER[detected.ext] : undefined;
  if (raster) return { ...(await inspectRaster(bytes, raster)), sha256 };
  if (!detected || detected.ext === 'xml' || detected.mime === 'image/svg+xml') {
    const svg = inspectSvg(bytes);
    if (svg) return { ...svg, sha256 };
  }
  throw new AppError('UNSUPPORTED_FILE_TYPE', `This file is ${describe(detected, bytes)}, not a plan image. ${ACCEPTED} (The file's name does not matter; its content is checked.)`, {
    detected: detected?.mime ?? null,
  });
}
