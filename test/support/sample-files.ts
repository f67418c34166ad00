/**
 * Small files for upload tests, built here byte by byte: a real PNG (signature, IHDR, IDAT,
 * IEND with CRC-32, per the PNG specification, ISO/IEC 15948), a minimal PDF header, CSV text,
 * and files that only pretend to be one of those.
 */
import { crc32, deflateSync } from 'node:zlib';

function chunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

/** A `size` × `size` grey PNG. */
export function pngBytes(size = 4): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(size, 0);
  header.writeUInt32BE(size, 4);
  header[8] = 8; // bit depth
  header[9] = 0; // greyscale
  const rows = Buffer.concat(Array.from({ length: size }, () => Buffer.concat([Buffer.from([0]), Buffer.alloc(size, 0x80)])));
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header),
    chunk('IDAT', deflateSync(rows)),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

export function pdfBytes(): Buffer {
  return Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n', 'latin1');
}

export function csvBytes(): Buffer {
  return Buffer.from('time_s,current_x_A\n0.0,4.00\n0.1,4.02\n', 'utf8');
}

/** HTML with a script, the kind of file that must never reach a browser as a page. */
export function htmlBytes(): Buffer {
  return Buffer.from('<!DOCTYPE html><html><body><script>alert(1)</script></body></html>', 'utf8');
}

export function svgBytes(): Buffer {
  return Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>', 'utf8');
}
