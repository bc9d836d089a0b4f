/**
 * The GPU layer: uploads the cell triangles once and colours them through small textures.
 * A field or colour-range change re-uploads the value texture or sets uniforms only.
 */
import * as THREE from 'three';
import { PALETTE_SIZE, SPECIAL, cssToRgb01, type Range } from '../colour.js';
import type { ScaleKind } from '../fields.js';
import { CELL_FRAGMENT, CELL_VERTEX, EDGE_FRAGMENT, EDGE_VERTEX, LINE_FRAGMENT, LINE_VERTEX, RING_FRAGMENT, RING_VERTEX } from './shaders.js';
import { Viewport } from './viewport.js';

const EDGE_MIN_PX = 5;
const MARK_PX = 11;
/** Marked cells thicker than this on screen show their stripes instead of a ring. */
const RING_MAX_CELL_PX = 4;
const SELECTED_PX = 19;

function vec3(css: string): THREE.Vector3 {
  return new THREE.Vector3(...cssToRgb01(css));
}

function floatTexture(width: number, height: number): THREE.DataTexture {
  const t = new THREE.DataTexture(new Float32Array(width * height), width, height, THREE.RedFormat, THREE.FloatType);
  t.minFilter = THREE.NearestFilter;
  t.magFilter = THREE.NearestFilter;
  t.generateMipmaps = false;
  t.needsUpdate = true;
  return t;
}

function byteTexture(bytes: Uint8Array, width: number, filter: THREE.MagnificationTextureFilter): THREE.DataTexture {
  const t = new THREE.DataTexture(bytes, width, 1, THREE.RGBAFormat, THREE.UnsignedByteType);
  t.minFilter = filter;
  t.magFilter = filter;
  t.wrapS = THREE.ClampToEdgeWrapping;
  t.generateMipmaps = false;
  t.needsUpdate = true;
  return t;
}

function raw(vertexShader: string, fragmentShader: string, uniforms: Record<string, THREE.IUniform>, transparent = false): THREE.RawShaderMaterial {
  return new THREE.RawShaderMaterial({
    vertexShader, fragmentShader, uniforms, glslVersion: THREE.GLSL3,
    depthTest: false, depthWrite: false, transparent,
  });
}

function geometry2d(positions: Float32Array, extra?: { name: string; values: Float32Array }): THREE.BufferGeometry {
  const g = new THREE.BufferGeometry();
  g.setAttribute('position', new THREE.BufferAttribute(positions, 2));
  if (extra) g.setAttribute(extra.name, new THREE.BufferAttribute(extra.values, 1));
  // the 2-D positions would confuse three's bounding-sphere code; nothing is culled anyway
  g.boundingSphere = new THREE.Sphere(new THREE.Vector3(), Infinity);
  return g;
}

export class MeshScene {
  readonly renderer: THREE.WebGLRenderer;
  readonly viewport = new Viewport();
  /** Called after each frame is drawn. */
  onFrame: (() => void) | null = null;
  private readonly scene = new THREE.Scene();
  private readonly camera = new THREE.OrthographicCamera(-1, 1, 1, -1, -10, 10);
  private readonly cellMaterial: THREE.RawShaderMaterial;
  private readonly edgeMaterial: THREE.RawShaderMaterial;
  private readonly markMaterial: THREE.RawShaderMaterial;
  private readonly selectedMaterial: THREE.RawShaderMaterial;
  private readonly outlineMaterial: THREE.RawShaderMaterial;
  private cells: THREE.Mesh | null = null;
  private edges: THREE.LineSegments | null = null;
  private marks: THREE.Points | null = null;
  private selected: THREE.Group | null = null;
  private valueTex: THREE.DataTexture;
  private dtTex: THREE.DataTexture;
  private readonly paletteTex: THREE.DataTexture;
  private readonly categoryTex: THREE.DataTexture;
  private texWidth = 1;
  private nCells = 0;
  private pending = 0;

  constructor(readonly canvas: HTMLCanvasElement) {
    this.renderer = new THREE.WebGLRenderer({ canvas, antialias: false, preserveDrawingBuffer: true, alpha: false, powerPreference: 'high-performance' });
    this.renderer.setClearColor(new THREE.Color(SPECIAL.background), 1);
    this.valueTex = floatTexture(1, 1);
    this.dtTex = floatTexture(1, 1);
    this.paletteTex = byteTexture(new Uint8Array(PALETTE_SIZE * 4), PALETTE_SIZE, THREE.LinearFilter);
    this.categoryTex = byteTexture(new Uint8Array(16 * 4), 16, THREE.NearestFilter);
    this.cellMaterial = raw(CELL_VERTEX, CELL_FRAGMENT, {
      uValues: { value: this.valueTex }, uDt: { value: this.dtTex }, uPalette: { value: this.paletteTex },
      uCategories: { value: this.categoryTex }, uWidth: { value: 1 }, uScale: { value: 1 },
      uLo: { value: 0 }, uHi: { value: 1 }, uThresholdOn: { value: false }, uThreshold: { value: 0 },
      uSelected: { value: -1 }, uNoLimit: { value: vec3(SPECIAL.noLimit) }, uUndefined: { value: vec3(SPECIAL.undefined) },
      uZero: { value: vec3(SPECIAL.zero) }, uGrey: { value: vec3(SPECIAL.greyed) }, uSelectedColour: { value: vec3(SPECIAL.selected) },
      uMarkOn: { value: false }, uMarkBound: { value: 0 }, uMarkColour: { value: vec3(SPECIAL.marker) },
    });
    this.edgeMaterial = raw(EDGE_VERTEX, EDGE_FRAGMENT, {
      uPxPerUnit: { value: 1 }, uMinPx: { value: EDGE_MIN_PX }, uColour: { value: new THREE.Vector3(0.02, 0.02, 0.03) }, uOpacity: { value: 0.55 },
    }, true);
    this.markMaterial = raw(RING_VERTEX, RING_FRAGMENT, {
      uSize: { value: MARK_PX }, uPxPerUnit: { value: 1 }, uMaxPx: { value: RING_MAX_CELL_PX },
      uColour: { value: vec3(SPECIAL.marker) }, uBorder: { value: new THREE.Vector3(0, 0, 0) },
    });
    this.selectedMaterial = raw(RING_VERTEX, RING_FRAGMENT, {
      uSize: { value: SELECTED_PX }, uPxPerUnit: { value: 1 }, uMaxPx: { value: 0 },
      uColour: { value: vec3(SPECIAL.selected) }, uBorder: { value: new THREE.Vector3(0, 0, 0) },
    });
    this.outlineMaterial = raw(LINE_VERTEX, LINE_FRAGMENT, { uColour: { value: vec3(SPECIAL.selected) } });
    this.warmUp();
  }

  /**
   * Draw one tiny object per material so the shaders compile now, while the worker is still
   * reading the first mesh (software GL takes a good second to compile them).
   */
  private warmUp(): void {
    const tri = new Float32Array([0, 0, 1, 0, 0, 1]);
    const one = new Float32Array(3);
    const objects: THREE.Object3D[] = [
      new THREE.Mesh(geometry2d(tri, { name: 'cellId', values: one }), this.cellMaterial),
      new THREE.LineSegments(geometry2d(tri.subarray(0, 4), { name: 'len', values: one.subarray(0, 2) }), this.edgeMaterial),
      new THREE.Points(geometry2d(tri.subarray(0, 2), { name: 'size', values: one.subarray(0, 1) }), this.markMaterial),
      new THREE.Points(geometry2d(tri.subarray(0, 2), { name: 'size', values: one.subarray(0, 1) }), this.selectedMaterial),
      new THREE.LineLoop(geometry2d(tri), this.outlineMaterial),
    ];
    for (const o of objects) { o.frustumCulled = false; this.scene.add(o); }
    this.renderer.setSize(1, 1, false);
    this.renderer.render(this.scene, this.camera);
    for (const o of objects) this.clearObject(o);
  }

  get maxTextureSize(): number {
    return this.renderer.capabilities.maxTextureSize;
  }

  /** Replace the drawn mesh. Positions are centred; every three vertices form one triangle. */
  setMesh(positions: Float32Array, cellIds: Float32Array, nCells: number): void {
    this.clearObject(this.cells);
    this.clearObject(this.edges);
    this.clearObject(this.marks);
    this.clearObject(this.selected);
    this.edges = this.marks = this.selected = null;
    this.nCells = nCells;
    this.texWidth = Math.min(4096, this.maxTextureSize);
    const height = Math.max(1, Math.ceil(nCells / this.texWidth));
    if (height > this.maxTextureSize) throw new Error(`${nCells} cells exceed what this GPU's textures can hold`);
    this.valueTex.dispose();
    this.dtTex.dispose();
    this.valueTex = floatTexture(this.texWidth, height);
    this.dtTex = floatTexture(this.texWidth, height);
    const u = this.cellMaterial.uniforms;
    u.uValues!.value = this.valueTex;
    u.uDt!.value = this.dtTex;
    u.uWidth!.value = this.texWidth;
    u.uSelected!.value = -1;
    this.cells = new THREE.Mesh(geometry2d(positions, { name: 'cellId', values: cellIds }), this.cellMaterial);
    this.cells.frustumCulled = false;
    this.scene.add(this.cells);
    this.requestRender();
  }

  /** Per-cell values of the shown field (float32 with the sentinels of fields.ts). */
  setValues(values: Float32Array): void {
    (this.valueTex.image.data as Float32Array).set(values.subarray(0, this.nCells));
    this.valueTex.needsUpdate = true;
    this.requestRender();
  }

  /** Per-cell allowed step, for the threshold (infinite steps stored as the largest float32). */
  setDt(dt: Float64Array): void {
    const d = this.dtTex.image.data as Float32Array;
    const n = Math.min(dt.length, this.nCells);
    for (let i = 0; i < n; i++) { const v = dt[i]!; d[i] = v < 3e38 ? v : 3e38; }
    this.dtTex.needsUpdate = true;
    this.requestRender();
  }

  setScale(kind: ScaleKind, range: Range): void {
    const u = this.cellMaterial.uniforms;
    u.uScale!.value = kind === 'linear' ? 0 : kind === 'log' ? 1 : 2;
    u.uLo!.value = kind === 'log' ? Math.log(range.lo) : range.lo;
    u.uHi!.value = kind === 'log' ? Math.log(range.hi) : range.hi;
    this.requestRender();
  }

  setPalette(bytes: Uint8Array): void {
    (this.paletteTex.image.data as Uint8Array).set(bytes);
    this.paletteTex.needsUpdate = true;
    this.requestRender();
  }

  setCategories(bytes: Uint8Array): void {
    const data = this.categoryTex.image.data as Uint8Array;
    data.fill(0);
    data.set(bytes.subarray(0, data.length));
    this.categoryTex.needsUpdate = true;
    this.requestRender();
  }

  /** Grey out cells whose step is above `t` seconds; null shows every cell. */
  setThreshold(t: number | null): void {
    const u = this.cellMaterial.uniforms;
    u.uThresholdOn!.value = t !== null;
    u.uThreshold!.value = t ?? 0;
    this.requestRender();
  }

  setEdges(positions: Float32Array, lengths: Float32Array): void {
    this.clearObject(this.edges);
    this.edges = new THREE.LineSegments(geometry2d(positions, { name: 'len', values: lengths }), this.edgeMaterial);
    this.edges.frustumCulled = false;
    this.edges.renderOrder = 1;
    this.scene.add(this.edges);
    this.requestRender();
  }

  get hasEdges(): boolean {
    return this.edges !== null;
  }

  /**
   * Mark the cells whose step is at most `bound` (null: none): stripes on the cells, and rings
   * at the given centred points for those too thin to see (`sizes`: their thickness).
   */
  setMarks(bound: number | null, points: Float32Array, sizes: Float32Array): void {
    const u = this.cellMaterial.uniforms;
    u.uMarkOn!.value = bound !== null;
    u.uMarkBound!.value = bound ?? 0;
    this.clearObject(this.marks);
    this.marks = null;
    if (points.length > 0) {
      this.marks = new THREE.Points(geometry2d(points, { name: 'size', values: sizes }), this.markMaterial);
      this.marks.frustumCulled = false;
      this.marks.renderOrder = 2;
      this.scene.add(this.marks);
    }
    this.requestRender();
  }

  /** Highlight one cell: tint, outline (closed loop of centred corners) and a ring at its centre. */
  setSelected(cell: number, outline: Float32Array | null, cx: number, cy: number): void {
    this.clearObject(this.selected);
    this.selected = null;
    this.cellMaterial.uniforms.uSelected!.value = cell;
    if (cell >= 0 && outline) {
      const group = new THREE.Group();
      const loop = new THREE.LineLoop(geometry2d(outline), this.outlineMaterial);
      const ring = new THREE.Points(geometry2d(new Float32Array([cx, cy]), { name: 'size', values: new Float32Array(1) }), this.selectedMaterial);
      for (const o of [loop, ring]) { o.frustumCulled = false; o.renderOrder = 3; group.add(o); }
      this.selected = group;
      this.scene.add(group);
    }
    this.requestRender();
  }

  resize(width: number, height: number): void {
    const dpr = Math.min(window.devicePixelRatio || 1, 2);
    this.renderer.setPixelRatio(dpr);
    this.renderer.setSize(width, height, false);
    this.viewport.setSize(width, height);
    this.requestRender();
  }

  requestRender(): void {
    if (this.pending) return;
    this.pending = requestAnimationFrame(() => {
      this.pending = 0;
      this.render();
    });
  }

  render(): void {
    const v = this.viewport;
    const b = v.bounds();
    const cam = this.camera;
    cam.left = b.left - v.cx;
    cam.right = b.right - v.cx;
    cam.top = b.top - v.cy;
    cam.bottom = b.bottom - v.cy;
    cam.position.set(v.cx, v.cy, 5);
    cam.updateProjectionMatrix();
    cam.updateMatrixWorld();
    const dpr = this.renderer.getPixelRatio();
    this.edgeMaterial.uniforms.uPxPerUnit!.value = 1 / v.scale;
    this.markMaterial.uniforms.uPxPerUnit!.value = 1 / v.scale;
    this.markMaterial.uniforms.uSize!.value = MARK_PX * dpr;
    this.selectedMaterial.uniforms.uSize!.value = SELECTED_PX * dpr;
    this.renderer.render(this.scene, cam);
    this.onFrame?.();
  }

  private clearObject(o: THREE.Object3D | null): void {
    if (!o) return;
    this.scene.remove(o);
    o.traverse((c) => {
      if (c instanceof THREE.Mesh || c instanceof THREE.Line || c instanceof THREE.Points) c.geometry.dispose();
    });
  }
}
