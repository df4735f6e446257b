import type { RendererKind } from './point-renderer';

/** Renderer names that mean WebGL runs on the CPU (then our splatter is far faster). */
export const SOFTWARE_GL = /swiftshader|llvmpipe|softpipe|software rasterizer|microsoft basic render/i;

export interface RendererChoice {
  kind: RendererKind;
  /** Why: shown in the status bar. */
  reason: string;
  glName?: string;
}

/** The WebGL renderer string, or undefined when WebGL is not available. */
export function probeWebGl(): string | undefined {
  try {
    const c = document.createElement('canvas');
    const gl = (c.getContext('webgl2') ?? c.getContext('webgl')) as WebGLRenderingContext | null;
    if (!gl) return undefined;
    const ext = gl.getExtension('WEBGL_debug_renderer_info');
    const name = String(ext ? gl.getParameter(ext.UNMASKED_RENDERER_WEBGL) : gl.getParameter(gl.RENDERER));
    gl.getExtension('WEBGL_lose_context')?.loseContext();
    return name;
  } catch {
    return undefined;
  }
}

/** `?renderer=cpu|webgl|auto`: auto picks WebGL only on a hardware GPU. */
export function chooseRenderer(param: string | null): RendererChoice {
  const want = (param ?? 'auto').toLowerCase();
  const glName = want === 'cpu' ? undefined : probeWebGl();
  if (want === 'cpu') return { kind: 'cpu', reason: 'chosen in the address (?renderer=cpu)' };
  if (want === 'webgl') {
    return glName === undefined
      ? { kind: 'cpu', reason: 'WebGL was asked for but this browser offers none' }
      : { kind: 'webgl', reason: 'chosen in the address (?renderer=webgl)', glName };
  }
  if (glName === undefined) return { kind: 'cpu', reason: 'no WebGL in this browser' };
  if (SOFTWARE_GL.test(glName)) return { kind: 'cpu', reason: `WebGL runs in software here (${glName})`, glName };
  return { kind: 'webgl', reason: `graphics processor: ${glName}`, glName };
}
