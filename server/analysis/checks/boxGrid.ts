/**
 * Boxes bucketed into the square cells of a grid over their extent, each box
 * in every cell it covers (cells in rows, a cell's boxes in ascending order).
 * For the neighbour lists of many small boxes this is much cheaper than a
 * tree search per box; `BoxGrid.of` gives null when the boxes are too spread
 * out or too long for a grid to pay, and the caller searches its tree instead.
 */
export class BoxGrid {
  private readonly boxes: Float64Array
  private readonly originX: number
  private readonly originY: number
  private readonly cellMm: number
  private readonly columns: number
  private readonly rows: number
  /** Cell k holds boxes entries[cellStart[k]] … entries[cellStart[k + 1] − 1]. */
  private readonly cellStart: Uint32Array
  private entries = new Uint32Array(0)
  /** Per box: the last query that met it, so a box in several cells is reported once. */
  private readonly lastQuery: Int32Array
  private queries = 0

  /** A grid over boxes [minX, minY, maxX, maxY] × count, with cells of at least `cellMm`; null when it would not pay. */
  static of(boxes: Float64Array, count: number, cellMm: number): BoxGrid | null {
    if (count === 0) return null
    let minX = Infinity
    let minY = Infinity
    let maxX = -Infinity
    let maxY = -Infinity
    for (let box = 0; box < count; box++) {
      minX = Math.min(minX, boxes[4 * box]!)
      minY = Math.min(minY, boxes[4 * box + 1]!)
      maxX = Math.max(maxX, boxes[4 * box + 2]!)
      maxY = Math.max(maxY, boxes[4 * box + 3]!)
    }
    if (!Number.isFinite(maxX - minX) || !Number.isFinite(maxY - minY)) return null
    // A sparse drawing gets larger cells, so there are never many more cells than boxes.
    const side = Math.max(cellMm, Math.sqrt(((maxX - minX) * (maxY - minY)) / (CELLS_PER_BOX * count)))
    const columns = Math.floor((maxX - minX) / side) + 1
    const rows = Math.floor((maxY - minY) / side) + 1
    const grid = new BoxGrid(boxes, count, minX, minY, side, columns, rows)
    return grid.fill() ? grid : null
  }

  private constructor(boxes: Float64Array, count: number, originX: number, originY: number, cellMm: number, columns: number, rows: number) {
    this.boxes = boxes
    this.originX = originX
    this.originY = originY
    this.cellMm = cellMm
    this.columns = columns
    this.rows = rows
    this.cellStart = new Uint32Array(columns * rows + 1)
    this.lastQuery = new Int32Array(count).fill(-1)
  }

  /**
   * Calls `visit` once for every box that meets [minX, minY, maxX, maxY]
   * (touching counts), in no particular order.
   */
  forEachMeeting(minX: number, minY: number, maxX: number, maxY: number, visit: (box: number) => void): void {
    const { boxes, cellStart, entries, lastQuery } = this
    const query = this.queries++
    const firstColumn = this.column(minX)
    const lastColumn = this.column(maxX)
    const lastRow = this.row(maxY)
    for (let row = this.row(minY); row <= lastRow; row++) {
      for (let column = firstColumn; column <= lastColumn; column++) {
        const cell = row * this.columns + column
        for (let entry = cellStart[cell]!; entry < cellStart[cell + 1]!; entry++) {
          const box = entries[entry]!
          if (lastQuery[box] === query) continue
          lastQuery[box] = query
          const b = 4 * box
          if (boxes[b]! <= maxX && boxes[b + 1]! <= maxY && boxes[b + 2]! >= minX && boxes[b + 3]! >= minY) visit(box)
        }
      }
    }
  }

  /** Lists the cells of every box, then sorts the boxes into cells by counting; false (and no entries) when they would cover too many cells. */
  private fill(): boolean {
    const { boxes, cellStart, columns } = this
    const count = this.lastQuery.length
    // Per box: first column, first row, last column, last row.
    const span = new Int32Array(4 * count)
    let total = 0
    for (let box = 0; box < count; box++) {
      span[4 * box] = this.column(boxes[4 * box]!)
      span[4 * box + 1] = this.row(boxes[4 * box + 1]!)
      span[4 * box + 2] = this.column(boxes[4 * box + 2]!)
      span[4 * box + 3] = this.row(boxes[4 * box + 3]!)
      total += (span[4 * box + 2]! - span[4 * box]! + 1) * (span[4 * box + 3]! - span[4 * box + 1]! + 1)
    }
    if (total > ENTRIES_PER_BOX * count) return false
    const cellOfEntry = new Uint32Array(total)
    const boxOfEntry = new Uint32Array(total)
    let entry = 0
    for (let box = 0; box < count; box++) {
      for (let row = span[4 * box + 1]!; row <= span[4 * box + 3]!; row++) {
        for (let column = span[4 * box]!; column <= span[4 * box + 2]!; column++, entry++) {
          cellOfEntry[entry] = row * columns + column
          boxOfEntry[entry] = box
        }
      }
    }
    for (entry = 0; entry < total; entry++) cellStart[cellOfEntry[entry]! + 1]!++
    for (let cell = 0; cell < columns * this.rows; cell++) cellStart[cell + 1]! += cellStart[cell]!
    const filled = cellStart.slice(0, -1)
    this.entries = new Uint32Array(total)
    for (entry = 0; entry < total; entry++) this.entries[filled[cellOfEntry[entry]!]!++] = boxOfEntry[entry]!
    return true
  }

  // Rounding is monotone, so a box that meets a query lies in a cell of the query's range.
  private column(x: number): number {
    return Math.min(this.columns - 1, Math.max(0, Math.floor((x - this.originX) / this.cellMm)))
  }

  private row(y: number): number {
    return Math.min(this.rows - 1, Math.max(0, Math.floor((y - this.originY) / this.cellMm)))
  }
}

// At most about this many cells per box, however sparse the drawing.
const CELLS_PER_BOX = 4
// Past this many cell entries per box (long diagonal cuts) the grid costs more than it saves.
const ENTRIES_PER_BOX = 16
