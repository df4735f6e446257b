import { describe, expect, it } from 'vitest';
import { Matrix4, OrthographicCamera, PerspectiveCamera, Vector3 } from 'three';
import { createDepthFrame, clearFrame, multiplyMat4, pickPoint, projectPoint, splatPoints, SHAPE_DISC, rgba } from '../../shaders-free-render';

/** The CPU renderer must put a point where three.js's own Vector3.project puts it (independent reference: three.js). */
function viewProjOf(camera: PerspectiveCamera | OrthographicCamera): Float64Array {
  camera.updateMatrixWorld(true);
  camera.updateProjectionMatrix();
  const vp = new Float64Array(16);
  multiplyMat4(vp, camera.projectionMatrix.elements, camera.matrixWorldInverse.elements);
  return vp;
}

describe('CPU projection against three.js Vector3.project', () => {
  const cameras = [
    (() => { const c = new PerspectiveCamera(40, 1.6, 0.01, 50); c.position.set(1.2, -0.7, 2.5); c.up.set(0, 0, 1); c.lookAt(0.1, 0.05, -0.2); return c; })(),
    (() => { const c = new PerspectiveCamera(70, 0.8, 0.1, 10); c.position.set(-3, 2, 1); c.lookAt(0, 0, 0); return c; })(),
    (() => { const c = new OrthographicCamera(-2, 2, 1.5, -1.5, 0.1, 20); c.position.set(0.5, 4, 3); c.lookAt(0, 0, 0); return c; })(),
  ];
  cameras.forEach((camera, ci) => {
    it(`agrees for camera ${ci} on a grid of points`, () => {
      const vp = viewProjOf(camera);
      const out = [0, 0, 0];
      const failures: string[] = [];
      for (let x = -1; x <= 1; x += 0.25) for (let y = -1; y <= 1; y += 0.5) for (let z = -1; z <= 1; z += 0.4) {
        const ref = new Vector3(x, y, z).project(camera);
        projectPoint(vp, x, y, z, out);
        const err = Math.max(Math.abs(out[0] - ref.x), Math.abs(out[1] - ref.y), Math.abs(out[2] - ref.z));
        if (!(err < 1e-9 * Math.max(1, Math.abs(ref.z)))) failures.push(`${x},${y},${z}: ${out} vs ${ref.toArray()}`);
      }
      expect(failures).toEqual([]);
    });
  });

  it('splats a point at the pixel three.js projects it to, and picks it back', () => {
    const camera = cameras[0];
    const vp = viewProjOf(camera);
    const W = 160, H = 100;
    const frame = createDepthFrame(W, H);
    clearFrame(frame, rgba(0, 0, 0));
    const pts = [[0.2, 0.1, 0.3], [-0.4, 0.2, -0.1], [0.0, -0.3, 0.2]];
    const cloud = {
      n: pts.length, xyz: Float32Array.from(pts.flat()), color: Uint32Array.from(pts, () => rgba(255, 255, 255)),
      radius: new Uint8Array(pts.length), shape: Uint8Array.from(pts, () => SHAPE_DISC),
    };
    expect(splatPoints(frame, cloud, vp)).toBe(3);
    pts.forEach(([x, y, z], j) => {
      const ref = new Vector3(Math.fround(x), Math.fround(y), Math.fround(z)).project(camera);
      const px = Math.floor((ref.x + 1) / 2 * W), py = Math.floor((1 - ref.y) / 2 * H);
      expect(frame.image.pixels[py * W + px]).toBe(rgba(255, 255, 255));
      expect(pickPoint(cloud, vp, W, H, px + 0.5, py + 0.5)).toBe(j);
    });
    const lit = frame.image.pixels.reduce((s, p) => s + (p === rgba(255, 255, 255) ? 1 : 0), 0);
    expect(lit).toBe(3);
  });

  it('keeps the nearer of two overlapping points (depth order)', () => {
    const camera = new PerspectiveCamera(50, 1, 0.1, 10);
    camera.position.set(0, 0, 3); camera.lookAt(0, 0, 0);
    const vp = viewProjOf(camera);
    const frame = createDepthFrame(64, 64);
    clearFrame(frame, 0);
    const near = rgba(255, 0, 0), far = rgba(0, 0, 255);
    // Far point last, so painter's order alone would show it.
    const cloud = { n: 2, xyz: Float32Array.of(0, 0, 1, 0, 0, -1), color: Uint32Array.of(near, far), radius: Uint8Array.of(3, 3), shape: Uint8Array.of(0, 0) };
    splatPoints(frame, cloud, vp);
    expect(frame.image.pixels[32 * 64 + 32]).toBe(near);
    expect(new Matrix4().fromArray(Array.from(vp)).determinant()).not.toBe(0);
  });
});
