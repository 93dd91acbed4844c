// The smallest valid PNG: signature plus IHDR/IDAT/IEND (PNG specification, ISO/IEC 15948).
export const TINY_PNG: Uint8Array<ArrayBuffer> = new Uint8Array(
  Buffer.from(
    "89504e470d0a1a0a0000000d4948445200000001000000010806000000" +
      "1f15c4890000000d49444154789c6360000002000001e221bc330000000049454e44ae426082",
    "hex",
  ),
);

// A JPEG starts with the SOI marker FF D8 FF and ends with EOI FF D9 (ITU-T T.81).
export const TINY_JPEG: Uint8Array<ArrayBuffer> = new Uint8Array([
  0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, ...new Array(64).fill(0), 0xff, 0xd9,
]);
