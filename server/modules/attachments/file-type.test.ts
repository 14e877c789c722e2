import { describe, expect, it } from 'vitest';
import { mediaTypeOf, sniffFileType } from './file-type.js';

const bytes = (...b: number[]) => Uint8Array.from(b);
const text = (s: string) => new TextEncoder().encode(s);

describe('sniffFileType', () => {
  it('knows a JPEG by its SOI marker FF D8 followed by a marker FF (ISO/IEC 10918-1, Annex B)', () => {
    expect(sniffFileType(bytes(0xff, 0xd8, 0xff, 0xe0, 0, 16))).toBe('image/jpeg');
  });
  it('knows a PNG by its eight-byte signature (PNG specification, §5.2)', () => {
    expect(sniffFileType(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0))).toBe('image/png');
  });
  it('knows a WebP by "RIFF", a size, then "WEBP" (RFC 9649, §2)', () => {
    expect(sniffFileType(text('RIFF\u0024\u0000\u0000\u0000WEBPVP8 '))).toBe('image/webp');
    expect(sniffFileType(text('RIFF\u0024\u0000\u0000\u0000WAVEfmt '))).toBeNull(); // a RIFF that is audio, not WebP
  });
  it('knows a PDF by its "%PDF-" header (ISO 32000-1, §7.5.2)', () => {
    expect(sniffFileType(text('%PDF-1.7\n'))).toBe('application/pdf');
  });
  it('refuses text, truncated signatures and empty files', () => {
    expect(sniffFileType(text('just some notes, saved as photo.jpg'))).toBeNull();
    expect(sniffFileType(bytes(0xff, 0xd8))).toBeNull();
    expect(sniffFileType(bytes(0x89, 0x50, 0x4e, 0x47))).toBeNull();
    expect(sniffFileType(new Uint8Array(0))).toBeNull();
  });
});

describe('mediaTypeOf', () => {
  it('drops parameters and case', () => {
    expect(mediaTypeOf('Image/JPEG; charset=binary')).toBe('image/jpeg');
    expect(mediaTypeOf(undefined)).toBe('');
  });
});
