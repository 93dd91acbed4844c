/**
 * The 3D pit preview (client only, loaded lazily by components/pit-preview.tsx).
 *
 * One scene unit is one inch (see app/domain/pit-layout.ts). Every repeated part is one instanced mesh, so a pit
 * with closures, caps, a liner and a patio costs at most 9 draw calls: ground, gravel, patio field
 * (or the base pad without a patio), border units and the border's cut piece, whole wall units, closure units, caps,
 * and
 * firebrick or the steel ring.
 * Frames are drawn on demand only: after a change of input, of camera, or of canvas size.
 */
import { OrbitControls } from "@react-three/drei";
import { Canvas, useFrame, useThree } from "@react-three/fiber";
import { useEffect, useEffectEvent, useLayoutEffect, useMemo, useRef, useState, type ComponentRef } from "react";
import {
  CanvasTexture,
  CircleGeometry,
  Color,
  CylinderGeometry,
  DoubleSide,
  ExtrudeGeometry,
  Matrix4,
  Quaternion,
  RepeatWrapping,
  RingGeometry,
  SRGBColorSpace,
  Shape,
  Vector2,
  Vector3,
  type BufferGeometry,
  type InstancedMesh,
  PerspectiveCamera,
} from "three";
import {
  FALLBACK_COLOURS,
  FIREBRICK_COLOUR,
  GRAVEL_COLOUR,
  STEEL_RING_COLOUR,
  frameCamera,
  measurePit,
  outlineBorderClosure,
  outlineBorderUnit,
  outlineCap,
  outlineClosureUnit,
  outlineFirebrick,
  outlineWallUnit,
  pickColour,
  placeBorderUnits,
  placeCaps,
  placeFirebrick,
  placeWallUnits,
  shadeInstance,
  type PartPlacement,
  type PitSceneInput,
  type PlanPolygon,
} from "~/domain/pit-layout";

export type PitSceneStats = { drawCalls: number; triangles: number };

export type PitSceneProps = {
  input: PitSceneInput;
  /** Called after the first frame, and again whenever the draw-call or triangle count changes. */
  onReady?: (stats: PitSceneStats) => void;
  /** Change this number (e.g. increment it) to put the camera back where it started. */
  resetSignal?: number;
  className?: string;
  /** The design in words: the canvas's text alternative (WCAG 2.1 SC 1.1.1). */
  description?: string;
};

declare global {
  interface Window {
    /** Figures of the last frame the pit preview drew, read by the e2e tests and the bench. */
    __emberwrightScene?: PitSceneStats & { renders: number };
  }
}

const FOV_DEG = 35;
const BACKGROUND = "#f4eee5";
const PAD_COLOUR = "#d9cfbf";
// A border course of 60 mm (2 3/8 in) pavers, a common paver thickness [practice]; only its look matters here.
const BORDER_THICKNESS_IN = 2.375;
// Flat layers sit a hair apart so the depth buffer never has to choose between them.
const FIELD_Y_IN = 0.02;
const LAYER_Y_IN = 0.05;
// One tile of the procedural paver texture covers 24 × 24 in; one of the gravel texture 12 × 12 in.
const PAVER_TILE_IN = 24;
const GRAVEL_TILE_IN = 12;

/** Extrudes a local plan outline (u radial, v along the ring) `heightIn` upward: scene (u, h, −v). */
function extrudeOutline(outline: PlanPolygon, heightIn: number): BufferGeometry {
  const shape = new Shape(outline.map(([u, v]) => new Vector2(u, v)));
  const geometry = new ExtrudeGeometry(shape, { depth: heightIn, bevelEnabled: false, curveSegments: 1 });
  // Extrusion runs along +z; turning −90° about x sends it up (+y) and the plan's v to scene −z.
  geometry.rotateX(-Math.PI / 2);
  return geometry;
}

/** A tile of running-bond pavers in the field colour, each paver a shade apart, with darker joints. */
function paintPaverTexture(fieldHex: string): CanvasTexture {
  const size = 256;
  const canvas = document.createElement("canvas");
  canvas.width = size;
  canvas.height = size;
  const ctx = canvas.getContext("2d");
  if (ctx) {
    // 24 in tile: six rows of 4 × 8 in pavers, every other row shifted half a paver.
    const rowPx = size / 6;
    const paverPx = size / 3;
    const base = new Color(fieldHex);
    ctx.fillStyle = "#5e564e";
    ctx.fillRect(0, 0, size, size);
    for (let row = 0; row < 6; row++) {
      const shift = row % 2 === 1 ? paverPx / 2 : 0;
      for (let col = -1; col < 3; col++) {
        const shade = base.clone().multiplyScalar(shadeInstance(row * 7 + col + 11, 5));
        ctx.fillStyle = `#${shade.getHexString()}`;
        ctx.fillRect(col * paverPx + shift + 1.5, row * rowPx + 1.5, paverPx - 3, rowPx - 3);
      }
    }
  }
  const texture = new CanvasTexture(canvas);
  texture.colorSpace = SRGBColorSpace;
  texture.wrapS = RepeatWrapping;
  texture.wrapT = RepeatWrapping;
  texture.anisotropy = 4;
  return texture;
}

/** A tile of grey speckles for the gravel floor. */
function paintGravelTexture(): CanvasTexture {
  const size = 128;
  const canvas = document.createElement("canvas");
  canvas.width = size;
  canvas.height = size;
  const ctx = canvas.getContext("2d");
  if (ctx) {
    ctx.fillStyle = GRAVEL_COLOUR;
    ctx.fillRect(0, 0, size, size);
    for (let i = 0; i < 900; i++) {
      const x = shadeInstance(i, 1) * 1000;
      const y = shadeInstance(i, 2) * 1000;
      const light = Math.round(70 + (shadeInstance(i, 3) - 0.92) * 900);
      ctx.fillStyle = `rgb(${light},${light - 4},${light - 9})`;
      ctx.beginPath();
      ctx.arc(x % size, y % size, 1 + (i % 3), 0, Math.PI * 2);
      ctx.fill();
    }
  }
  const texture = new CanvasTexture(canvas);
  texture.colorSpace = SRGBColorSpace;
  texture.wrapS = RepeatWrapping;
  texture.wrapT = RepeatWrapping;
  return texture;
}

/** Disposes a three.js resource when it is replaced or the scene unmounts. */
function useDisposable<T extends { dispose: () => void }>(resource: T): T {
  useEffect(() => () => resource.dispose(), [resource]);
  return resource;
}

/** One instanced mesh for every copy of one part: one draw call however many copies. */
function InstancedPart({
  outline,
  heightIn,
  placements,
  colourHex,
  salt,
}: {
  outline: PlanPolygon;
  heightIn: number;
  placements: PartPlacement[];
  colourHex: string;
  salt: number;
}) {
  const outlineKey = JSON.stringify(outline);
  const geometry = useDisposable(
    useMemo(() => extrudeOutline(JSON.parse(outlineKey) as PlanPolygon, heightIn), [outlineKey, heightIn]),
  );
  const meshRef = useRef<InstancedMesh>(null);
  const invalidate = useThree((state) => state.invalidate);
  const count = placements.length;

  useLayoutEffect(() => {
    const mesh = meshRef.current;
    if (!mesh) return;
    const matrix = new Matrix4();
    const turn = new Quaternion();
    const position = new Vector3();
    const unitScale = new Vector3(1, 1, 1);
    const up = new Vector3(0, 1, 0);
    const base = new Color(colourHex);
    const shade = new Color();
    placements.forEach((p, i) => {
      turn.setFromAxisAngle(up, p.rotationY);
      mesh.setMatrixAt(i, matrix.compose(position.set(p.x, p.y, p.z), turn, unitScale));
      // Each unit a shade apart, as units from one pallet are: joints read even where faces line up.
      mesh.setColorAt(i, shade.copy(base).multiplyScalar(shadeInstance(i, salt)));
    });
    mesh.instanceMatrix.needsUpdate = true;
    if (mesh.instanceColor) mesh.instanceColor.needsUpdate = true;
    mesh.computeBoundingSphere();
    invalidate();
  }, [placements, colourHex, salt, geometry, invalidate]);

  if (count === 0) return null;
  return (
    // A new mesh only when the geometry or the number of copies changes (three.js fixes both at construction).
    <instancedMesh ref={meshRef} args={[geometry, undefined, count]}>
      <meshStandardMaterial color="#ffffff" roughness={0.92} metalness={0} />
    </instancedMesh>
  );
}

function PitParts({ input }: { input: PitSceneInput }) {
  const m = useMemo(() => measurePit(input), [input]);
  const walls = useMemo(() => placeWallUnits(input), [input]);
  const caps = useMemo(() => placeCaps(input), [input]);
  const bricks = useMemo(() => placeFirebrick(input), [input]);
  const border = useMemo(() => placeBorderUnits(input), [input]);

  const wallOutline = outlineWallUnit(input);
  const closureOutline = outlineClosureUnit(input);
  const capOutline = outlineCap(input);
  const brickOutline = outlineFirebrick(input);
  const borderOutline = outlineBorderUnit(input);
  const borderClosureOutline = outlineBorderClosure(input);
  const wallColour = pickColour(input.wallUnit.colourHex, FALLBACK_COLOURS.wall);
  const patio = input.patio;
  const fieldHex = pickColour(patio?.fieldColourHex, FALLBACK_COLOURS.field);

  const outsideEdgeIn = input.ring.edgeDistanceIn + input.wallUnit.depthIn;
  const fieldRadiusIn = m.fieldRadiusIn ?? 0;
  const hasField = patio !== null && fieldRadiusIn > outsideEdgeIn;

  // The ground is unlit and the colour of the background, so it has no visible edge; it hides
  // whatever lies below grade (the border's bedding depth).
  const groundRadiusIn = m.extentRadiusIn * 12;
  const ground = useDisposable(
    useMemo(() => new CircleGeometry(groundRadiusIn, 64).rotateX(-Math.PI / 2), [groundRadiusIn]),
  );
  const padRadiusIn = m.basePadRadiusIn;
  const pad = useDisposable(useMemo(() => new CircleGeometry(padRadiusIn, 96).rotateX(-Math.PI / 2), [padRadiusIn]));
  const gravel = useDisposable(
    useMemo(() => new CircleGeometry(m.gravelRadiusIn, 96).rotateX(-Math.PI / 2), [m.gravelRadiusIn]),
  );
  const gravelTexture = useDisposable(useMemo(() => paintGravelTexture(), []));
  gravelTexture.repeat.setScalar((2 * m.gravelRadiusIn) / GRAVEL_TILE_IN);
  // The field: the circle inside the border less the pit's footprint (the circle through the middles
  // of the wall's faces, which the wall covers entirely), one flat ring, not one mesh per paver.
  const field = useDisposable(
    useMemo(
      () =>
        new RingGeometry(Math.min(outsideEdgeIn, fieldRadiusIn), Math.max(fieldRadiusIn, 1), 160, 1).rotateX(
          -Math.PI / 2,
        ),
      [outsideEdgeIn, fieldRadiusIn],
    ),
  );
  const paverTexture = useDisposable(useMemo(() => paintPaverTexture(fieldHex), [fieldHex]));
  // RingGeometry maps its outer diameter onto one texture width.
  paverTexture.repeat.setScalar((2 * Math.max(fieldRadiusIn, 1)) / PAVER_TILE_IN);

  const steel = input.liner.kind === "steel-ring" ? input.liner : null;
  const steelRadiusIn = steel ? steel.outsideDiameterIn / 2 : 1;
  const steelHeightIn = steel ? steel.heightIn : 1;
  const steelGeometry = useDisposable(
    useMemo(
      () => new CylinderGeometry(steelRadiusIn, steelRadiusIn, steelHeightIn, 96, 1, true),
      [steelRadiusIn, steelHeightIn],
    ),
  );

  return (
    <group>
      <mesh geometry={ground}>
        <meshBasicMaterial
          color={BACKGROUND}
          toneMapped={false}
          polygonOffset
          polygonOffsetFactor={2}
          polygonOffsetUnits={2}
        />
      </mesh>
      {!hasField && (
        <mesh geometry={pad} position={[0, FIELD_Y_IN, 0]}>
          <meshStandardMaterial color={PAD_COLOUR} roughness={1} />
        </mesh>
      )}
      <mesh geometry={gravel} position={[0, LAYER_Y_IN, 0]}>
        <meshStandardMaterial map={gravelTexture} roughness={1} />
      </mesh>
      {hasField && (
        <mesh geometry={field} position={[0, FIELD_Y_IN, 0]}>
          <meshStandardMaterial map={paverTexture} roughness={0.95} />
        </mesh>
      )}
      {borderOutline && patio && (
        <group position={[0, LAYER_Y_IN - BORDER_THICKNESS_IN, 0]}>
          <InstancedPart
            outline={borderOutline}
            heightIn={BORDER_THICKNESS_IN}
            placements={border.whole}
            colourHex={pickColour(patio.borderColourHex, FALLBACK_COLOURS.border)}
            salt={4}
          />
          {borderClosureOutline && (
            <InstancedPart
              outline={borderClosureOutline}
              heightIn={BORDER_THICKNESS_IN}
              placements={border.closure}
              colourHex={pickColour(patio.borderColourHex, FALLBACK_COLOURS.border)}
              salt={6}
            />
          )}
        </group>
      )}
      <InstancedPart
        outline={wallOutline}
        heightIn={input.wallUnit.heightIn}
        placements={walls.whole}
        colourHex={wallColour}
        salt={1}
      />
      {closureOutline && (
        <InstancedPart
          outline={closureOutline}
          heightIn={input.wallUnit.heightIn}
          placements={walls.closures}
          colourHex={wallColour}
          salt={2}
        />
      )}
      {capOutline && input.caps && (
        <InstancedPart
          outline={capOutline}
          heightIn={input.caps.thicknessIn}
          placements={caps}
          colourHex={pickColour(input.caps.colourHex, FALLBACK_COLOURS.cap)}
          salt={3}
        />
      )}
      {brickOutline && input.liner.kind === "firebrick" && (
        <InstancedPart
          outline={brickOutline}
          heightIn={input.liner.widthIn}
          placements={bricks}
          colourHex={FIREBRICK_COLOUR}
          salt={5}
        />
      )}
      {steel && (
        <mesh geometry={steelGeometry} position={[0, LAYER_Y_IN + steel.heightIn / 2, 0]}>
          {/* No environment map to reflect, so a plain dull finish: real metalness would render black. */}
          <meshStandardMaterial color={STEEL_RING_COLOUR} roughness={0.6} metalness={0} side={DoubleSide} />
        </mesh>
      )}
    </group>
  );
}

/** Puts the camera where `frameCamera` says: on mount, on reset, and when the pit grows or shrinks a lot. */
function CameraRig({ input, resetSignal }: { input: PitSceneInput; resetSignal: number }) {
  const controlsRef = useRef<ComponentRef<typeof OrbitControls>>(null);
  // The camera is three.js's own object, moved in place; it is read from the store when framing
  // (in effects), never during render.
  const getThree = useThree((state) => state.get);
  const framedExtent = useRef(0);
  const extent = measurePit(input).extentRadiusIn;

  const frame = useEffectEvent(() => {
    const { camera, size, invalidate } = getThree();
    // The Canvas makes a perspective camera (it is given a field of view).
    if (!(camera instanceof PerspectiveCamera)) return;
    const framing = frameCamera(input, size.width / Math.max(size.height, 1), camera.fov);
    camera.position.set(...framing.position);
    camera.near = framing.near;
    camera.far = framing.far;
    camera.updateProjectionMatrix();
    const controls = controlsRef.current;
    if (controls) {
      controls.target.set(...framing.target);
      controls.minDistance = extent * 0.4;
      controls.maxDistance = Math.hypot(...framing.position) * 3;
      controls.update();
    } else {
      camera.lookAt(...framing.target);
    }
    framedExtent.current = extent;
    invalidate();
  });

  useEffect(() => frame(), [resetSignal]);
  useEffect(() => {
    // Small edits (a unit more or less) keep the viewer's angle; adding a patio reframes.
    const ratio = extent / (framedExtent.current || extent);
    if (ratio > 1.25 || ratio < 0.8) frame();
  }, [extent]);

  return (
    <OrbitControls
      ref={controlsRef}
      makeDefault
      enableDamping
      dampingFactor={0.12}
      // Stay above the ground: the pit is seen from where a person can stand.
      maxPolarAngle={Math.PI / 2 - 0.06}
    />
  );
}

/** Draws each demanded frame itself so it can read the renderer's counters right after drawing. */
function RenderAndReport({ onReady }: { onReady?: (stats: PitSceneStats) => void }) {
  const renders = useRef(0);
  const last = useRef<PitSceneStats | null>(null);
  // A positive priority hands rendering to this callback (R3F stops drawing by itself).
  useFrame(({ gl, scene, camera }) => {
    gl.render(scene, camera);
    renders.current += 1;
    const stats = { drawCalls: gl.info.render.calls, triangles: gl.info.render.triangles };
    window.__emberwrightScene = { ...stats, renders: renders.current };
    if (!last.current || last.current.drawCalls !== stats.drawCalls || last.current.triangles !== stats.triangles) {
      last.current = stats;
      onReady?.(stats);
    }
  }, 1);
  return null;
}

/** The 3D preview of one pit. Needs WebGL: mount it behind a check and an error boundary. */
export default function PitScene({ input, onReady, resetSignal = 0, className, description }: PitSceneProps) {
  // Parents often rebuild the input object on every render; only a real change should redraw.
  const inputKey = JSON.stringify(input);
  const [stable, setStable] = useState({ key: inputKey, input });
  if (stable.key !== inputKey) setStable({ key: inputKey, input });
  const stableInput = stable.input;
  // The Canvas reads its camera settings once, when it is created; CameraRig moves the camera after.
  const [initial] = useState(() => frameCamera(stableInput, 4 / 3, FOV_DEG));

  return (
    <div className={className ?? "h-full w-full"}>
      <Canvas
        frameloop="demand"
        // No tone mapping: the units should look like the colour the contractor picked, and the
        // unlit ground must match the background exactly.
        flat
        dpr={[1, 2]}
        camera={{ fov: FOV_DEG, near: initial.near, far: initial.far, position: initial.position }}
        gl={{ antialias: true, powerPreference: "low-power" }}
        onCreated={({ gl, invalidate }) => {
          // Counters are read after each frame; nothing has been drawn yet at this point.
          gl.info.autoReset = true;
          invalidate();
        }}
        aria-label={`3D view of the fire pit${description ? `: ${description}` : ""}. Drag to turn, scroll or pinch to zoom.`}
        role="img"
        tabIndex={0}
      >
        <color attach="background" args={[BACKGROUND]} />
        <hemisphereLight args={["#fff8ee", "#8a7f72", 1.7]} />
        {/* Key light from the south-south-west: it catches each unit's face at a different angle, so joints show. */}
        <directionalLight position={[-40, 110, 110]} intensity={1.9} />
        <directionalLight position={[90, 60, -60]} intensity={0.4} />
        <PitParts input={stableInput} />
        <CameraRig input={stableInput} resetSignal={resetSignal} />
        <RenderAndReport onReady={onReady} />
      </Canvas>
    </div>
  );
}
