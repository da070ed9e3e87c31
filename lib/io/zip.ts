// Just enough of the ZIP format (PKWARE APPNOTE.TXT 6.3, §4.3) to refuse an archive or an
// .xlsx workbook (which is a ZIP) whose uncompressed size is too large BEFORE inflating it,
// and to unpack a plain upload archive with a hard cap on the inflated bytes.
//
// The sizes come from the central directory, which a hostile file can falsify; unzipEntries
// therefore also caps each inflation (zlib maxOutputLength), so a lying archive fails there.

import { inflateRawSync } from "node:zlib";

export interface ZipEntry {
  name: string;
  /** Compression method: 0 stored, 8 deflated. */
  method: number;
  compressedSize: number;
  uncompressedSize: number;
  /** Offset of the entry's local file header. */
  localHeaderOffset: number;
}

const EOCD_SIGNATURE = 0x06054b50;
const CENTRAL_SIGNATURE = 0x02014b50;
const LOCAL_SIGNATURE = 0x04034b50;
const ZIP64_EXTRA = 0x0001;
const U32_MAX = 0xffffffff;

/** Thrown for an archive that cannot be read; the message says why. */
export class ZipError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ZipError";
  }
}

/** True when the bytes start like a ZIP archive ("PK\x03\x04", or an empty one "PK\x05\x06"). */
export function looksLikeZip(bytes: Uint8Array): boolean {
  return bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && (bytes[2] === 3 || bytes[2] === 5);
}

/** Reads the central directory (APPNOTE §4.3.12, §4.3.16); nothing is inflated. */
export function readZipDirectory(bytes: Uint8Array): ZipEntry[] {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  // The end-of-central-directory record is 22 bytes plus a comment of up to 65 535 bytes.
  let eocd = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 22 - 0xffff); i--) {
    if (view.getUint32(i, true) === EOCD_SIGNATURE) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw new ZipError("not a ZIP archive (no end-of-central-directory record)");
  const count = view.getUint16(eocd + 10, true);
  const directoryOffset = view.getUint32(eocd + 16, true);
  if (count === 0xffff || directoryOffset === U32_MAX) throw new ZipError("ZIP64 archives are not supported");
  const entries: ZipEntry[] = [];
  let p = directoryOffset;
  for (let k = 0; k < count; k++) {
    if (p + 46 > bytes.length || view.getUint32(p, true) !== CENTRAL_SIGNATURE) {
      throw new ZipError(`damaged ZIP central directory at entry ${k + 1}`);
    }
    const method = view.getUint16(p + 10, true);
    let compressedSize = view.getUint32(p + 20, true);
    let uncompressedSize = view.getUint32(p + 24, true);
    const nameLength = view.getUint16(p + 28, true);
    const extraLength = view.getUint16(p + 30, true);
    const commentLength = view.getUint16(p + 32, true);
    let localHeaderOffset = view.getUint32(p + 42, true);
    const name = new TextDecoder().decode(bytes.subarray(p + 46, p + 46 + nameLength));
    // ZIP64 extended information (APPNOTE §4.5.3): 8-byte values for the fields set to 0xFFFFFFFF, in this order.
    let e = p + 46 + nameLength;
    const extraEnd = e + extraLength;
    while (e + 4 <= extraEnd) {
      const id = view.getUint16(e, true);
      const size = view.getUint16(e + 2, true);
      if (id === ZIP64_EXTRA) {
        let q = e + 4;
        const next = (): number => {
          const v = Number(view.getBigUint64(q, true));
          q += 8;
          return v;
        };
        if (uncompressedSize === U32_MAX) uncompressedSize = next();
        if (compressedSize === U32_MAX) compressedSize = next();
        if (localHeaderOffset === U32_MAX) localHeaderOffset = next();
      }
      e += 4 + size;
    }
    entries.push({ name, method, compressedSize, uncompressedSize, localHeaderOffset });
    p = extraEnd + commentLength;
  }
  return entries;
}

/** Sum of the declared uncompressed sizes. */
export function declaredUncompressedSize(entries: readonly ZipEntry[]): number {
  let total = 0;
  for (const e of entries) total += e.uncompressedSize;
  return total;
}

/**
 * Inflates every file entry (directories skipped). Throws ZipError when the inflated total
 * would pass maxBytes, whatever the directory claims.
 */
export function unzipEntries(bytes: Uint8Array, maxBytes: number): { name: string; bytes: Uint8Array }[] {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const out: { name: string; bytes: Uint8Array }[] = [];
  let budget = maxBytes;
  for (const entry of readZipDirectory(bytes)) {
    if (entry.name.endsWith("/")) continue;
    const p = entry.localHeaderOffset;
    if (p + 30 > bytes.length || view.getUint32(p, true) !== LOCAL_SIGNATURE) throw new ZipError(`damaged ZIP entry ${entry.name}`);
    const start = p + 30 + view.getUint16(p + 26, true) + view.getUint16(p + 28, true);
    const raw = bytes.subarray(start, start + entry.compressedSize);
    let data: Uint8Array;
    if (entry.method === 0) {
      data = raw;
    } else if (entry.method === 8) {
      try {
        data = inflateRawSync(raw, { maxOutputLength: Math.max(1, budget) });
      } catch (e) {
        const code = (e as NodeJS.ErrnoException).code;
        if (code === "ERR_BUFFER_TOO_LARGE") throw new ZipError(`archive inflates to more than ${maxBytes} bytes`);
        throw new ZipError(`cannot inflate ${entry.name}: ${(e as Error).message}`);
      }
    } else {
      throw new ZipError(`${entry.name}: compression method ${entry.method} is not supported (use deflate)`);
    }
    budget -= data.length;
    if (budget < 0) throw new ZipError(`archive inflates to more than ${maxBytes} bytes`);
    out.push({ name: entry.name, bytes: data });
  }
  return out;
}
