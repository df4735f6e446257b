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
  /** Frees GPU memory, buffers and listeners. */
  dispose(): void;
}
