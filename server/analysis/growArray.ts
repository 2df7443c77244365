type GrowableArray = Uint8Array | Int32Array | Uint32Array | Float64Array

/**
 * A typed array of `capacity` items that starts with a copy of `array` (the
 * rest zero): the one way the engine's flat arrays grow. Callers double the
 * capacity, so appending stays amortised O(1).
 */
export function grownArray<T extends GrowableArray>(array: T, capacity: number): T {
  const grown = new (array.constructor as new (length: number) => T)(capacity)
  grown.set(array.subarray(0, Math.min(array.length, capacity)) as ArrayLike<number> as T)
  return grown
}
