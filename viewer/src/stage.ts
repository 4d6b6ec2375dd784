// The 3D stage: renderer, camera, orbit controls, lights and the ground grid.
import { AmbientLight, Color, DirectionalLight, HemisphereLight, PerspectiveCamera, Scene, Vector3, WebGLRenderer } from 'three';
import { OrbitControls } from 'three/addons/controls/OrbitControls.js';
import { LineMaterial } from 'three/addons/lines/LineMaterial.js';
import { LineSegments2 } from 'three/addons/lines/LineSegments2.js';
import { LineSegmentsGeometry } from 'three/addons/lines/LineSegmentsGeometry.js';

export interface Stage {
  renderer: WebGLRenderer;
  scene: Scene;
  camera: PerspectiveCamera;
  controls: OrbitControls;
  background: Color;
}

/** Returns true when WebGL runs on a software rasteriser (SwiftShader, llvmpipe), where MSAA costs a third of the frame rate. */
export function softwareWebGL(): boolean {
  const gl = document.createElement('canvas').getContext('webgl2');
  if (!gl) return false;
  const info = gl.getExtension('WEBGL_debug_renderer_info');
  const name = String(gl.getParameter(info ? info.UNMASKED_RENDERER_WEBGL : gl.RENDERER));
  gl.getExtension('WEBGL_lose_context')?.loseContext();
  return /swiftshader|llvmpipe|softpipe|software/i.test(name);
}

/** Returns a stage drawn into a new canvas appended to `host` (multisampled unless WebGL is software). */
export function createStage(host: HTMLElement): Stage {
  const renderer = new WebGLRenderer({ antialias: !softwareWebGL() });
  renderer.setPixelRatio(Math.min(window.devicePixelRatio || 1, 2));
  host.prepend(renderer.domElement);
  const scene = new Scene();
  const background = new Color(0xeef1f3);
  scene.background = background;
  scene.add(new HemisphereLight(0xffffff, 0xb8c0c8, 1.6));
  scene.add(new AmbientLight(0xffffff, 0.4));
  const sun = new DirectionalLight(0xffffff, 1.4);
  sun.position.set(3, 6, 4);
  scene.add(sun);
  const camera = new PerspectiveCamera(40, 1, 0.05, 400);
  const controls = new OrbitControls(camera, renderer.domElement);
  controls.enableDamping = true;
  controls.dampingFactor = 0.12;
  controls.screenSpacePanning = true;
  return { renderer, scene, camera, controls, background };
}

/** Adds a 24 m floor grid of 0.5 m squares (every second line darker) at height y and returns it; move it
 * in whole metres (`snapGrid`) to keep it under the subject without the lines appearing to slide. The grid
 * is made of screen-space line quads rather than GL lines: those are clipped at the near plane in the
 * shader, so lines passing behind the camera still draw on software renderers. Its size is fixed, so a
 * long walkway costs no more to draw than a short one. */
export function addGrid(stage: Stage, y: number): LineSegments2 {
  const half = GRID_HALF_M;
  const n = half * 4 + 1;
  const pos = new Float32Array(n * 12);
  const col = new Float32Array(n * 12);
  const major = new Color(0x9aa4ad), minor = new Color(0xc3cad0);
  for (let i = 0; i < n; i++) {
    const k = -half + i * 0.5;
    const c = i % 2 === 0 ? major : minor;
    pos.set([-half, 0, k, half, 0, k, k, 0, -half, k, 0, half], i * 12);
    for (let v = 0; v < 4; v++) col.set([c.r, c.g, c.b], i * 12 + v * 3);
  }
  const geometry = new LineSegmentsGeometry();
  geometry.setPositions(pos);
  geometry.setColors(col);
  const grid = new LineSegments2(geometry, new LineMaterial({ vertexColors: true, linewidth: 1, worldUnits: false }));
  grid.frustumCulled = false;
  grid.position.y = y;
  stage.scene.add(grid);
  return grid;
}

/** Half the grid's width, metres. */
export const GRID_HALF_M = 12;

/** Centres the grid on the whole metre nearest (x, z). */
export function snapGrid(grid: LineSegments2, x: number, z: number): void {
  grid.position.x = Math.round(x);
  grid.position.z = Math.round(z);
}

/** Places the camera beside the walking line (dir, horizontal unit) looking at target. */
export function placeCamera(stage: Stage, target: Vector3, dir: Vector3): void {
  // The walker's left in a right-handed Y-up frame is up x forward = (dir.z, 0, -dir.x); view from there.
  const side = new Vector3(dir.z, 0, -dir.x);
  stage.controls.target.copy(target);
  stage.camera.position.copy(target).addScaledVector(side, 3.6).addScaledVector(dir, 2.3);
  stage.camera.position.y = target.y + 0.8;
  stage.controls.update();
}
