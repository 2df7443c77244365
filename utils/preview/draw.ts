// Painting the preview on two stacked canvases: the drawing itself (redrawn when the view changes) and the
// markers with the selected site's contours (redrawn on selection and hover too). All work is in device pixels.
import type { PreviewGeometry } from '#shared/packed-analysis'
import type { FindingSites, Severity } from '#shared/finding-groups'
import { traceContours, type ContourIndex, type DotGrid, type TraceCounts } from './contour-index'
import { SEVERITY_BY_RANK, type MarkerCluster } from './clustering'
import type { Box, Viewport } from './viewport'

/** Kerfbook's preview palette (tailwind.config.ts names in comments). */
export const PREVIEW_COLOURS = {
  background: '#ecebe8',
  sheetFill: '#fdfcfa',
  sheetEdge: '#b8b2aa',
  /** stone-900 */
  cut: '#1c1917',
  /** spruce-500, dashed */
  score: '#2f7f76',
  /** stone-500, dotted */
  engrave: '#78716c',
  /** copper-500: the selected site and its contours, as the list's selected entry. */
  highlight: '#c06a2b',
  severity: { error: '#b42318', warning: '#9a6700', info: '#2459a8' } satisfies Record<Severity, string>,
  halo: '#ffffff',
}

/** Operation codes of PREVIEW_OPERATIONS, drawn under one another: engrave first, cut last and on top. */
const DRAW_ORDER = [2, 1, 0] as const
const OPERATION_STYLE = [
  { colour: PREVIEW_COLOURS.cut, dash: [] as number[] },
  { colour: PREVIEW_COLOURS.score, dash: [5, 3] },
  { colour: PREVIEW_COLOURS.engrave, dash: [1.5, 2] },
]
/** Contours per stroke() call: keeps each path Skia rasterises to a moderate size. */
const CONTOURS_PER_STROKE = 16_384
/** Past this many contours in view a dash pattern costs more than it tells (each dash is a segment): lines go solid. */
const DASH_CONTOUR_LIMIT = 15_000

export interface GeometryFrame {
  geometry: PreviewGeometry
  index: ContourIndex
  ids: ArrayLike<number> | null
  view: Viewport
  dpr: number
  grid: DotGrid
  sheet: { widthMm: number; heightMm: number } | null
}

export function drawGeometry(ctx: CanvasRenderingContext2D, frame: GeometryFrame): TraceCounts {
  const { geometry, index, ids, view, dpr, grid, sheet } = frame
  const canvas = ctx.canvas
  ctx.setTransform(1, 0, 0, 1, 0, 0)
  ctx.fillStyle = PREVIEW_COLOURS.background
  ctx.fillRect(0, 0, canvas.width, canvas.height)
  const scale = view.scale * dpr
  const transform = { originX: view.originX, originY: view.originY, scale }
  if (sheet) {
    const x = -view.originX * scale
    const y = -view.originY * scale
    ctx.fillStyle = PREVIEW_COLOURS.sheetFill
    ctx.fillRect(x, y, sheet.widthMm * scale, sheet.heightMm * scale)
    ctx.strokeStyle = PREVIEW_COLOURS.sheetEdge
    ctx.lineWidth = dpr
    ctx.setLineDash([6 * dpr, 4 * dpr])
    ctx.strokeRect(x, y, sheet.widthMm * scale, sheet.heightMm * scale)
  } else {
    // Without a sheet the drawing's own box is the paper.
    const [minX, minY, maxX, maxY] = geometry.bbox
    ctx.fillStyle = PREVIEW_COLOURS.sheetFill
    ctx.fillRect(
      (minX - view.originX) * scale - 8 * dpr,
      (minY - view.originY) * scale - 8 * dpr,
      (maxX - minX) * scale + 16 * dpr,
      (maxY - minY) * scale + 16 * dpr,
    )
  }
  const counts: TraceCounts = { lines: 0, dots: 0, points: 0 }
  const total = ids ? ids.length : geometry.count
  const solid = total > DASH_CONTOUR_LIMIT
  ctx.lineWidth = dpr
  ctx.lineJoin = 'round'
  for (const operation of DRAW_ORDER) {
    const style = OPERATION_STYLE[operation]!
    ctx.strokeStyle = style.colour
    ctx.fillStyle = style.colour
    ctx.setLineDash(solid ? [] : style.dash.map((d) => d * dpr))
    for (let from = 0; from < total; from += CONTOURS_PER_STROKE) {
      const dots = new Path2D()
      ctx.beginPath()
      const before = counts.points
      traceContours(geometry, index, ids, operation, transform, { lines: ctx, dots, grid }, counts, from, Math.min(from + CONTOURS_PER_STROKE, total))
      if (counts.points === before) continue
      ctx.stroke()
      ctx.fill(dots)
    }
  }
  ctx.setLineDash([])
  return counts
}

/** Where a marker's head sits from its site, in CSS pixels: up and to the right, so the site stays in sight. */
export const HEAD_OFFSET = { x: 13, y: -17 }
const RING_RADIUS = 5
const HEAD_RADIUS = 8

export interface MarkerFrame {
  view: Viewport
  dpr: number
  clusters: MarkerCluster[]
  sites: FindingSites
  /** The selected site's row, its severity, and its contours (ids in the geometry). */
  selected: { row: number; severity: Severity; contours: number[] } | null
  geometry: PreviewGeometry | null
  hoverRow: number
}

function traceShape(ctx: CanvasRenderingContext2D, severity: Severity, x: number, y: number, r: number): void {
  ctx.beginPath()
  if (severity === 'error') {
    ctx.moveTo(x, y - r * 1.05)
    ctx.lineTo(x + r * 1.05, y + r * 0.8)
    ctx.lineTo(x - r * 1.05, y + r * 0.8)
    ctx.closePath()
  } else if (severity === 'warning') {
    ctx.moveTo(x, y - r)
    ctx.lineTo(x + r, y)
    ctx.lineTo(x, y + r)
    ctx.lineTo(x - r, y)
    ctx.closePath()
  } else {
    ctx.arc(x, y, r * 0.85, 0, 2 * Math.PI)
  }
}

/** The hollow ring round a site and the thin leader to its head: the gap itself is never covered. */
function drawPin(ctx: CanvasRenderingContext2D, x: number, y: number, colour: string, emphasis: boolean): [number, number] {
  const headX = x + HEAD_OFFSET.x
  const headY = y + HEAD_OFFSET.y
  const ring = emphasis ? RING_RADIUS + 2 : RING_RADIUS
  ctx.lineWidth = emphasis ? 4.5 : 3.5
  ctx.strokeStyle = PREVIEW_COLOURS.halo
  ctx.beginPath()
  ctx.arc(x, y, ring, 0, 2 * Math.PI)
  ctx.moveTo(x + ring * 0.6, y - ring * 0.8)
  ctx.lineTo(headX - 3, headY + 5)
  ctx.stroke()
  ctx.lineWidth = emphasis ? 2.5 : 1.5
  ctx.strokeStyle = colour
  ctx.stroke()
  return [headX, headY]
}

function drawSingle(ctx: CanvasRenderingContext2D, x: number, y: number, severity: Severity, state: 'plain' | 'hover' | 'selected'): void {
  const colour = PREVIEW_COLOURS.severity[severity]
  if (state === 'selected') {
    // A wide copper halo round the site, hollow, so the gap inside stays visible.
    ctx.beginPath()
    ctx.arc(x, y, RING_RADIUS + 9, 0, 2 * Math.PI)
    ctx.lineWidth = 6
    ctx.strokeStyle = PREVIEW_COLOURS.halo
    ctx.stroke()
    ctx.lineWidth = 3
    ctx.strokeStyle = PREVIEW_COLOURS.highlight
    ctx.stroke()
  }
  const [headX, headY] = drawPin(ctx, x, y, state === 'selected' ? PREVIEW_COLOURS.highlight : colour, state !== 'plain')
  const r = state === 'plain' ? HEAD_RADIUS : HEAD_RADIUS + 3
  traceShape(ctx, severity, headX, headY, r)
  ctx.fillStyle = colour
  ctx.fill()
  ctx.lineWidth = state === 'selected' ? 3 : 1.5
  ctx.strokeStyle = state === 'selected' ? PREVIEW_COLOURS.highlight : PREVIEW_COLOURS.halo
  ctx.stroke()
}

const BADGE_HEIGHT = 20

function badgeLabel(count: number): string {
  return count > 9999 ? `${Math.round(count / 1000)}k` : String(count)
}

function badgeWidth(count: number): number {
  return 24 + 7 * badgeLabel(count).length
}

/** Where a cluster's badge sits from the mean of its sites: above and to the right, held by a short leader. */
const BADGE_OFFSET = { x: 6, y: -18 }

/**
 * A cluster is a badge with a shape and a count, held off its sites' mean by a leader to a small hollow ring:
 * like a single marker, it never covers the place it points at.
 */
function drawCluster(ctx: CanvasRenderingContext2D, cluster: MarkerCluster, hover: boolean): void {
  const severity = SEVERITY_BY_RANK[cluster.rank]!
  const colour = PREVIEW_COLOURS.severity[severity]
  const left = cluster.x + BADGE_OFFSET.x
  const middle = cluster.y + BADGE_OFFSET.y
  ctx.beginPath()
  ctx.arc(cluster.x, cluster.y, 3, 0, 2 * Math.PI)
  ctx.moveTo(cluster.x + 2, cluster.y - 2)
  ctx.lineTo(left + 4, middle + BADGE_HEIGHT / 2 - 2)
  ctx.lineWidth = 3
  ctx.strokeStyle = PREVIEW_COLOURS.halo
  ctx.stroke()
  ctx.lineWidth = 1.25
  ctx.strokeStyle = colour
  ctx.stroke()
  ctx.beginPath()
  ctx.roundRect(left, middle - BADGE_HEIGHT / 2, badgeWidth(cluster.count), BADGE_HEIGHT, BADGE_HEIGHT / 2)
  ctx.fillStyle = PREVIEW_COLOURS.halo
  ctx.fill()
  ctx.lineWidth = hover ? 3 : 1.5
  ctx.stroke()
  traceShape(ctx, severity, left + 11, middle, 5.5)
  ctx.fillStyle = colour
  ctx.fill()
  ctx.fillStyle = '#1c1917'
  ctx.fillText(badgeLabel(cluster.count), left + 19, middle + 0.5)
}

/** The box a marker answers clicks in, in CSS pixels: from its site's ring to its head or badge. */
export function hitBox(marker: Pick<MarkerCluster, 'x' | 'y' | 'count'>): Box {
  if (marker.count > 1) {
    const top = marker.y + BADGE_OFFSET.y - BADGE_HEIGHT / 2
    return [marker.x - 5, top, marker.x + BADGE_OFFSET.x + badgeWidth(marker.count), marker.y + 5]
  }
  const headX = marker.x + HEAD_OFFSET.x
  const headY = marker.y + HEAD_OFFSET.y
  return [marker.x - RING_RADIUS - 3, headY - HEAD_RADIUS - 3, headX + HEAD_RADIUS + 3, marker.y + RING_RADIUS + 3]
}

export function drawMarkers(ctx: CanvasRenderingContext2D, frame: MarkerFrame): void {
  const { view, dpr, clusters, sites, selected, geometry, hoverRow } = frame
  ctx.setTransform(1, 0, 0, 1, 0, 0)
  ctx.clearRect(0, 0, ctx.canvas.width, ctx.canvas.height)
  if (selected && geometry) {
    const scale = view.scale * dpr
    ctx.beginPath()
    for (const contour of selected.contours) {
      if (contour < 0 || contour >= geometry.count) continue
      const first = geometry.start[contour]!
      const last = geometry.start[contour + 1]!
      for (let p = first; p < last; p++) {
        const x = (geometry.xy[2 * p]! - view.originX) * scale
        const y = (geometry.xy[2 * p + 1]! - view.originY) * scale
        if (p === first) ctx.moveTo(x, y)
        else ctx.lineTo(x, y)
      }
    }
    ctx.lineJoin = 'round'
    ctx.lineCap = 'round'
    ctx.globalAlpha = 0.85
    ctx.lineWidth = 4 * dpr
    ctx.strokeStyle = PREVIEW_COLOURS.highlight
    ctx.stroke()
    ctx.globalAlpha = 1
  }
  ctx.setTransform(dpr, 0, 0, dpr, 0, 0)
  ctx.font = '700 11px Manrope, system-ui, sans-serif'
  ctx.textBaseline = 'middle'
  ctx.lineCap = 'round'
  // With a site selected the other markers step back, so the selected one is found at a glance.
  for (const cluster of clusters) {
    ctx.globalAlpha = selected && cluster.row !== hoverRow ? 0.55 : 1
    if (cluster.count > 1) drawCluster(ctx, cluster, cluster.row === hoverRow)
    else drawSingle(ctx, cluster.x, cluster.y, SEVERITY_BY_RANK[cluster.rank]!, cluster.row === hoverRow ? 'hover' : 'plain')
  }
  ctx.globalAlpha = 1
  if (selected) {
    const x = (sites.xy[2 * selected.row]! - view.originX) * view.scale
    const y = (sites.xy[2 * selected.row + 1]! - view.originY) * view.scale
    drawSingle(ctx, x, y, selected.severity, 'selected')
  }
}
