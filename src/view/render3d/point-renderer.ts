import type { PerspectiveCamera } from 'three';
import type { PointCloud } from '../../../shaders-free-render';

/**
 * One interface, two implementations: three.js WebGL with built-in materials
 * (`webgl`) and the shader-free CPU splatter (`cpu`). The view owns the camera
 * and the point cloud; a renderer only draws them into its canvas.
 */
export type RendererKind = 'cpu' | 'webgl';

export interface PointRenderer {
  readonly kind: RendererKind;
  readonly canvas: HTMLCanvasElement;
  /** Replace the points (after loading or when marks or colours change). */
  setCloud(cloud: PointCloud): void;
  /** Global stamp scale (1 = radii as stored in the cloud). */
  setRadiusScale(s: number): void;
  resize(cssWidth: number, cssHeight: number): void;
  render(camera: PerspectiveCamera): void;
  /** Waits until the frame is really drawn (benchmarks); CPU frames are done when render returns. */
  finish?(): void;
  /** Frees GPU memory, buffers and listeners. */
  dispose(): void;
}

/**
 * Makes the renderer of the given kind. The WebGL one (three.js's renderer,
 * the bulk of the bundle) is loaded only when it is chosen.
 */
export async function createPointRenderer(kind: RendererKind): Promise<PointRenderer> {
  if (kind === 'webgl') {
    const { WebGlPointRenderer } = await import('./webgl-renderer');
    return new WebGlPointRenderer();
  }
  const { CpuPointRenderer } = await import('./cpu-renderer');
  return new CpuPointRenderer();
}
