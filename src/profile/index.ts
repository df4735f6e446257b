/** Lab profiles: a group's house rules (JSON), validated with messages naming the JSON path, and their defaults. */
export {
  type LabProfile, type MonoclinicSetting, type ExportDelimiter, type ExportColumns,
  DEFAULT_PROFILE, WAVELENGTHS, isObserved, describeProfile,
} from './lab-profile';
export { PROFILE_FORMAT_VERSION, parseProfile } from './parse-profile';
export { formatReflectionText } from './text-export';
