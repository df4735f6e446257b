import type { PerspectiveCamera } from 'three';
import { clearFrame, createDepthFrame, multiplyMat4, splatPoints, MARK, type DepthFrame, type PointCloud } from '../../../shaders-free-render';
import type { PointRenderer } from './point-renderer';

/**
 * The CPU renderer in the page: shaders-free-render splats into an RGBA buffer,
 * canvas 2D putImageData shows it. Drawn at CSS-pixel resolution (not device
 * pixels): the cost grows with the pixel count and spots stay crisp anyway.
 */
export class CpuPointRenderer implements PointRenderer {
  readonly kind = 'cpu' as const;
  readonly canvas: HTMLCanvasElement;
  private ctx: CanvasRenderingContext2D;
  private frame: DepthFrame;
  private imageData: ImageData;
  private cloud: PointCloud | undefined;
  private radiusScale = 1;
  private readonly viewProj = new Float64Array(16);
  /** Points that landed in the last frame (tests and diagnostics). */
  lastDrawn = 0;

  constructor(canvas?: HTMLCanvasElement) {
    this.canvas = canvas ?? document.createElement('canvas');
    const ctx = this.canvas.getContext('2d', { alpha: false });
    if (!ctx) throw new Error('canvas 2D is not available in this browser');
    this.ctx = ctx;
    this.frame = createDepthFrame(1, 1);
    this.imageData = new ImageData(new Uint8ClampedArray(this.frame.image.data.buffer as ArrayBuffer), 1, 1);
  }

  setCloud(cloud: PointCloud): void {
    this.cloud = cloud;
  }

  setRadiusScale(s: number): void {
    this.radiusScale = s;
  }

  resize(w: number, h: number): void {
    const W = Math.max(1, Math.round(w)), H = Math.max(1, Math.round(h));
    if (W === this.frame.image.width && H === this.frame.image.height) return;
    this.canvas.width = W;
    this.canvas.height = H;
    this.frame = createDepthFrame(W, H);
    this.imageData = new ImageData(new Uint8ClampedArray(this.frame.image.data.buffer as ArrayBuffer), W, H);
  }

  render(camera: PerspectiveCamera): void {
    camera.updateMatrixWorld();
    multiplyMat4(this.viewProj, camera.projectionMatrix.elements, camera.matrixWorldInverse.elements);
    clearFrame(this.frame, MARK.background);
    this.lastDrawn = this.cloud ? splatPoints(this.frame, this.cloud, this.viewProj, this.radiusScale) : 0;
    this.ctx.putImageData(this.imageData, 0, 0);
  }

  dispose(): void {
    this.cloud = undefined;
    this.frame = createDepthFrame(1, 1);
    this.canvas.width = 1;
    this.canvas.height = 1;
  }
}
