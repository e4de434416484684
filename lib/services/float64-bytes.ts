// How the database stores arrays of numbers (spectrum points, a run's continuum): little-endian float64
// bytes, whatever the machine's byte order, and back.

/** Points as little-endian float64 bytes, whatever the machine's byte order. */
export function float64ToBytes(values: Float64Array): Buffer {
  const buffer = Buffer.allocUnsafe(values.length * 8);
  for (let i = 0; i < values.length; i++) buffer.writeDoubleLE(values[i], i * 8);
  return buffer;
}

/** The numbers of little-endian float64 bytes (a whole number of eight-byte values). */
export function bytesToFloat64(bytes: Buffer): Float64Array {
  const values = new Float64Array(bytes.length / 8);
  for (let i = 0; i < values.length; i++) values[i] = bytes.readDoubleLE(i * 8);
  return values;
}
