// three.js on its own, so the preview can parse it in one task and the scene in the next
// (app/components/pit-preview.tsx loads this first, then pit-scene).
export * from "three";
