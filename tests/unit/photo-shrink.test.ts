import { expect, test } from "vitest";
import { SHRUNK_LONG_EDGE_PX, shrunkName, shrunkSize } from "~/lib/format/photo-shrink";

test("a 12-megapixel phone photo (4032 × 3024) is drawn at 2560 × 1920, keeping its 4:3 shape", () => {
  // 4032 × 3024 is a common phone camera size (from memory); 2560 / 4032 × 3024 = 1920 exactly.
  expect(SHRUNK_LONG_EDGE_PX).toBe(2560);
  expect(shrunkSize(4032, 3024)).toEqual({ width: 2560, height: 1920 });
  expect(shrunkSize(3024, 4032)).toEqual({ width: 1920, height: 2560 });
});

test("a photo already smaller than the long edge is never scaled up", () => {
  expect(shrunkSize(1600, 1200)).toEqual({ width: 1600, height: 1200 });
  expect(shrunkSize(2560, 100)).toEqual({ width: 2560, height: 100 });
});

test("a very long panorama keeps at least one pixel on its short side", () => {
  expect(shrunkSize(100_000, 10)).toEqual({ width: 2560, height: 1 });
});

test("the shrunk photo is named as the JPEG it now is", () => {
  expect(shrunkName("IMG_2041.PNG")).toBe("IMG_2041.jpg");
  expect(shrunkName("back yard.webp")).toBe("back yard.jpg");
  expect(shrunkName("no-extension")).toBe("no-extension.jpg");
  expect(shrunkName(".jpeg")).toBe("photo.jpg");
});
