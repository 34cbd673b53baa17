/**
 * Shrink a photo on the device before it is stored: phone cameras give 12+ megapixels, and a station
 * photo needs only to show where the probe was. Long side at most maxLongSidePx, JPEG at quality 0.85.
 * A photo already small enough is kept as it is.
 */
export const PHOTO_MAX_LONG_SIDE_PX = 1600;
const JPEG_QUALITY = 0.85;

export async function resizePhoto(file: Blob, maxLongSidePx = PHOTO_MAX_LONG_SIDE_PX): Promise<Blob> {
  const bitmap = await createImageBitmap(file);
  try {
    const scale = Math.min(1, maxLongSidePx / Math.max(bitmap.width, bitmap.height));
    if (scale === 1 && file.type === 'image/jpeg') return file;
    const width = Math.max(1, Math.round(bitmap.width * scale));
    const height = Math.max(1, Math.round(bitmap.height * scale));
    if (typeof OffscreenCanvas !== 'undefined') {
      const canvas = new OffscreenCanvas(width, height);
      const ctx = canvas.getContext('2d');
      if (!ctx) throw new Error('This browser cannot draw the photo to shrink it.');
      ctx.drawImage(bitmap, 0, 0, width, height);
      return await canvas.convertToBlob({ type: 'image/jpeg', quality: JPEG_QUALITY });
    }
    const canvas = document.createElement('canvas');
    canvas.width = width;
    canvas.height = height;
    const ctx = canvas.getContext('2d');
    if (!ctx) throw new Error('This browser cannot draw the photo to shrink it.');
    ctx.drawImage(bitmap, 0, 0, width, height);
    return await new Promise<Blob>((resolve, reject) =>
      canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('The photo could not be shrunk.'))), 'image/jpeg', JPEG_QUALITY),
    );
  } finally {
    bitmap.close();
  }
}
