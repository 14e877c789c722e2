// What a file really is, from its first bytes: a declared Content-Type or a ".jpg" name proves
// nothing, so uploads are checked against the formats' signatures before anything is stored.

export type SniffedType = 'image/jpeg' | 'image/png' | 'image/webp' | 'application/pdf';

const startsWith = (bytes: Uint8Array, signature: readonly number[], offset = 0) =>
  bytes.length >= offset + signature.length && signature.every((b, i) => bytes[offset + i] === b);

const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));

/**
 * The type the bytes' signature shows, or null when it is none of the accepted ones:
 * JPEG starts FF D8 FF (ISO/IEC 10918-1 SOI marker, then the next marker's FF);
 * PNG with its 8-byte signature 89 50 4E 47 0D 0A 1A 0A (PNG spec §5.2);
 * WebP is a RIFF container "RIFF" <size> "WEBP" (RFC 9649 §2);
 * PDF starts "%PDF-" (ISO 32000-1 §7.5.2).
 */
export function sniffFileType(bytes: Uint8Array): SniffedType | null {
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'image/jpeg';
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
  if (startsWith(bytes, ascii('RIFF')) && startsWith(bytes, ascii('WEBP'), 8)) return 'image/webp';
  if (startsWith(bytes, ascii('%PDF-'))) return 'application/pdf';
  return null;
}

/** The media type of a Content-Type header, without parameters, lower-cased ('' when missing). */
export function mediaTypeOf(header: string | undefined): string {
  return (header ?? '').split(';')[0].trim().toLowerCase();
}
