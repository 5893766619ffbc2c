/**
 * gzip (RFC 1952) around node:zlib's raw deflate, with a header we write ourselves so that nothing
 * in it depends on the clock or the machine: MTIME 0 ("no time stamp"), no file name, OS 255
 * ("unknown"). Same bytes in, same bytes out, on any platform with the same zlib.
 */
import { deflateRawSync, gunzipSync } from 'node:zlib';
import { ArchiveFormatError } from './tar.js';

const HEADER = Buffer.from([0x1f, 0x8b, 0x08, 0x00, 0, 0, 0, 0, 0x02, 0xff]);

export function gzipDeterministic(data: Buffer): Buffer {
  const body = deflateRawSync(data, { level: 9, memLevel: 9, strategy: 0 });
  const trailer = Buffer.alloc(8);
  trailer.writeUInt32LE(crc32(data), 0);
  trailer.writeUInt32LE(data.length >>> 0, 4);
  return Buffer.concat([HEADER, body, trailer]);
}

/** Unzip, refusing a file that is not gzip or that would unpack to more than `maxBytes`. */
export function gunzipChecked(data: Buffer, maxBytes: number): Buffer {
  if (data.length < 18 || data[0] !== 0x1f || data[1] !== 0x8b) throw new ArchiveFormatError('not a gzip file (it does not start with the gzip signature)');
  try {
    return gunzipSync(data, { maxOutputLength: maxBytes });
  } catch (err) {
    const code = (err as NodeJS.ErrnoException)?.code;
    if (code === 'ERR_BUFFER_TOO_LARGE' || err instanceof RangeError) {
      throw new ArchiveFormatError(`the gzip data expands to more than the limit of ${maxBytes} bytes`);
    }
    const message = err instanceof Error ? err.message : String(err);
    throw new ArchiveFormatError(`the gzip data cannot be read (corrupt or truncated): ${message}`);
  }
}

let table: Uint32Array | undefined;

/** CRC-32 (ISO-HDLC, reflected polynomial 0xEDB88320) as gzip uses it. */
export function crc32(data: Uint8Array): number {
  if (!table) {
    table = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      table[n] = c >>> 0;
    }
  }
  let crc = 0xffffffff;
  for (let i = 0; i < data.length; i++) crc = table[(crc ^ data[i]!) & 0xff]! ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}
