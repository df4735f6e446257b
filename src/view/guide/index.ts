/**
 * The conventions guide: explains on the loaded data how h, k, l map to a*, b*, c*, what zones and layers are,
 * what each reflection condition of the selected candidate means on the layer shown, how settings of one group
 * differ, and the lab profile's house rules. `buildGuideSections` is pure; `buildGuidePanel` mounts it (textContent only).
 */
export {
  type AxisName, type GuidePart, type GuideBlock, type GuideSection, type GuideSetting, type GuideState,
  buildGuideSections, guideText, formatIndexSum, describeZone, describeConditionKind,
} from './guide-content';
export { type GuidePanel, type GuidePanelOptions, buildGuidePanel } from './guide-panel';
