/**
 * gzip files start with the bytes 1f 8b (RFC 1952, section 2.3.1). Decompression
 * happens at the edges: node:zlib in the CLI, DecompressionStream('gzip') in the browser.
 */
export function isGzip(bytes: Uint8Array): boolean {
  return bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;
}
