/**
 * shaders-free-render: Lacuna's CPU renderer, plain TypeScript with no DOM,
 * WebGL or Node imports, so the page (canvas putImageData) and the command
 * line (`lacuna layer`, PNG files) draw with the same code.
 */
export { multiplyMat4, projectPoint, ndcToPixel } from './project';
export {
  createImage, rgba, hexColor, cssColor, fillImage, blendPixel, fillRect, strokeRect, drawLine, clipLine,
  fillCircle, fillHalfCircle, strokeCircle, drawDiamond, type RgbaImage,
} from './image';
export { drawText, measureText, textHeight, hasGlyphs, GLYPH_WIDTH, GLYPH_HEIGHT, GLYPH_ADVANCE } from './font';
export { encodePng, decodePng, crc32, type Deflate, type Inflate } from './png';
export { INTENSITY_LUT, MARK, paletteColor, paletteLightness } from './palette';
export {
  createDepthFrame, clearFrame, splatPoints, pickPoint, MAX_RADIUS,
  SHAPE_DISC, SHAPE_DIAMOND_HOLLOW, SHAPE_DIAMOND, SHAPE_RING, SHAPE_COUNT,
  type PointCloud, type DepthFrame,
} from './splat';
export { makeLayerPlane, parseLayerPlane, onLayer, layerCoords, LAYER_PRESETS, type LayerPlane, type Hkl } from './layer-plane';
export {
  drawLayerMap, fitLayerView, layerPosition, saturationLevel, STRONG_I_OVER_SIGMA,
  type LayerMapOptions, type LayerMapResult, type LayerView, type LayerColumns,
} from './layer-map';
