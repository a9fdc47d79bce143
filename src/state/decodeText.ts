/**
 * Bytes of a dropped file to text, the way the command line reads files: a UTF-16 byte-order mark
 * selects UTF-16, otherwise UTF-8 when the bytes are valid UTF-8, otherwise Latin-1 (what older
 * instrument software writes). The byte-order mark is kept in the text so the importer can report it.
 */

/** Text encodings the dashboard recognises. */
export type DecodedEncoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'latin1';

/**
 * The encoding of a file from its first bytes (BOM, else a strict UTF-8 trial of up to 64 KiB).
 * @example sniffTextEncoding(new Uint8Array([0xff, 0xfe, 0x41, 0x00])) // 'utf-16le'
 */
export function sniffTextEncoding(bytes: Uint8Array): DecodedEncoding {
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return 'utf-16le';
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) return 'utf-16be';
  try {
    // stream: true lets a multi-byte character cut at the 64 KiB boundary pass.
    new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, 64 * 1024), { stream: true });
    return 'utf-8';
  } catch {
    return 'latin1';
  }
}

/**
 * Decode a whole file.
 * @example decodeText(new TextEncoder().encode('z,I\n')).text // 'z,I\n'
 */
export function decodeText(bytes: Uint8Array): { text: string; encoding: DecodedEncoding } {
  const encoding = sniffTextEncoding(bytes);
  try {
    return { text: new TextDecoder(encoding, { ignoreBOM: true, fatal: encoding === 'utf-8' }).decode(bytes), encoding };
  } catch {
    // Valid UTF-8 at the start but not later on: read it all as Latin-1.
    return { text: new TextDecoder('latin1').decode(bytes), encoding: 'latin1' };
  }
}
