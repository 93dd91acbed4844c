// A real 2 × 2 RGBA PNG (encoded by sharp): signature plus IHDR/pHYs/IDAT/IEND (PNG specification,
// ISO/IEC 15948). It decodes, so it survives the re-encoding every upload goes through.
export const TINY_PNG: Uint8Array<ArrayBuffer> = new Uint8Array(
  Buffer.from(
    "89504e470d0a1a0a0000000d494844520000000200000002080600000072b60d240000000970485973000003e8000003e801b57b526b" +
      "0000001149444154089963385161f31f8419600c00588c09edd7703b820000000049454e44ae426082",
    "hex",
  ),
);

// A real 8 × 8 baseline JPEG (encoded by sharp/mozjpeg at quality 50): SOI FF D8 … EOI FF D9 (ITU-T T.81).
export const TINY_JPEG: Uint8Array<ArrayBuffer> = new Uint8Array(
  Buffer.from(
    "ffd8ffdb004300100b0c0e0c0a100e0d0e1211101318281a181616183123251d283a333d3c3933383740485c4e404457453738506d51575f626768673e4d71797064785c656763" +
      "ffdb0043011112121815182f1a1a2f634238426363636363636363636363636363636363636363636363636363636363636363636363636363636363636363636363636363" +
      "ffc00011080008000803012200021101031101ffc4001500010100000000000000000000000000000005ffc40014100100000000000000000000000000000000ffc400140101" +
      "00000000000000000000000000000004ffc40014110100000000000000000000000000000000ffda000c03010002110311003f009e00a4bfffd9",
    "hex",
  ),
);

// Only the JPEG markers, with nothing a decoder can draw: passes a magic-bytes check, fails decoding.
export const FAKE_JPEG: Uint8Array<ArrayBuffer> = new Uint8Array([
  0xff,
  0xd8,
  0xff,
  0xe0,
  0x00,
  0x10,
  0x4a,
  0x46,
  0x49,
  0x46,
  0x00,
  0x01,
  ...new Array(64).fill(0),
  0xff,
  0xd9,
]);
