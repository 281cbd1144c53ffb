import type { ImagePoint } from './calibration';

interface Box {
  left: number;
  top: number;
  width: number;
  height: number;
}

/**
 * The image point under a pointer, for an image drawn centred with `object-fit: contain` in a
 * box (CSS pixels, as from getBoundingClientRect). Points off the picture move to its nearest
 * edge. E.g. a 640×480 image in a 400×300 box at (0, 0): pointer (200, 150) → (320, 240).
 */
export function pointInContainedImage(box: Box, image: { width: number; height: number }, client: { x: number; y: number }): ImagePoint {
  const scale = Math.min(box.width / image.width, box.height / image.height);
  // Letterbox bands (left/right or top/bottom) take whatever the image does not fill.
  const offsetX = (box.width - image.width * scale) / 2;
  const offsetY = (box.height - image.height * scale) / 2;
  const clamp = (v: number, max: number) => Math.min(Math.max(v, 0), max);
  return {
    x: clamp((client.x - box.left - offsetX) / scale, image.width),
    y: clamp((client.y - box.top - offsetY) / scale, image.height),
  };
}
