// Typed arrays to database bytes and back. Little-endian, as every platform Node runs
// Beamgate on; the copy on the way out detaches the array from the driver's buffer.

export function float32ToBytes(values: Float32Array): Uint8Array<ArrayBuffer> {
  return new Uint8Array(values.buffer.slice(values.byteOffset, values.byteOffset + values.byteLength) as ArrayBuffer);
}

export function bytesToFloat32(bytes: Uint8Array, expectedLength?: number): Float32Array {
  if (bytes.byteLength % 4 !== 0) throw new RangeError(`raster bytes: length ${bytes.byteLength} is not a multiple of 4`);
  const values = new Float32Array(bytes.byteLength / 4);
  new Uint8Array(values.buffer).set(bytes);
  if (expectedLength !== undefined && values.length !== expectedLength) {
    throw new RangeError(`raster bytes: ${values.length} values, expected ${expectedLength}`);
  }
  return values;
}

export function int16ToBytes(values: Int16Array): Uint8Array<ArrayBuffer> {
  return new Uint8Array(values.buffer.slice(values.byteOffset, values.byteOffset + values.byteLength) as ArrayBuffer);
}

export function bytesToInt16(bytes: Uint8Array): Int16Array {
  if (bytes.byteLength % 2 !== 0) throw new RangeError(`raster bytes: length ${bytes.byteLength} is not a multiple of 2`);
  const values = new Int16Array(bytes.byteLength / 2);
  new Uint8Array(values.buffer).set(bytes);
  return values;
}
