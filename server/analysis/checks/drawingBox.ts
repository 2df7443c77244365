import type { CheckGeometry } from './index'

/** [minX, minY, maxX, maxY] of everything drawn. */
export function drawingBox({ contours, bounds }: CheckGeometry): [number, number, number, number] {
  const box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity]
  for (let contour = 0; contour < contours.count; contour++) {
    box[0] = Math.min(box[0], bounds[4 * contour]!)
    box[1] = Math.min(box[1], bounds[4 * contour + 1]!)
    box[2] = Math.max(box[2], bounds[4 * contour + 2]!)
    box[3] = Math.max(box[3], bounds[4 * contour + 3]!)
  }
  return box
}
